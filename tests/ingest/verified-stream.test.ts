/** The SHA-256 re-check on downloads, on sources that arrive in one piece or many. */
import { createHash } from "node:crypto";
import { describe, expect, it } from "vitest";
import { verifiedStream } from "@/lib/ingest/verified-stream";
import { streamInPieces } from "../support/byte-stream";

const text = "time_s,voltage_V,current_A\n0,3.700,0.500\n10,3.710,0.500\n";
const bytes = new TextEncoder().encode(text);
// The reference digest comes from Node's own SHA-256 (FIPS 180-4), not from the code under test.
const sha256 = createHash("sha256").update(bytes).digest("hex");

function source(pieces: number): ReadableStream<Uint8Array> {
  return streamInPieces(bytes, Math.ceil(bytes.length / pieces));
}

describe("verifiedStream", () => {
  it.each([1, 2, 5])("passes the bytes through unchanged from a source in %i piece(s)", async (pieces) => {
    // The consumer reads one chunk at a time, so a pull that hands over nothing would hang here.
    const reader = verifiedStream(source(pieces), sha256, () => undefined).getReader();
    let out = "";
    const decoder = new TextDecoder();
    for (;;) {
      const { done, value } = await reader.read();
      if (done) break;
      out += decoder.decode(value, { stream: true });
    }
    expect(out).toBe(text);
  });

  it("errors instead of ending when the bytes do not match", async () => {
    const seen: string[] = [];
    const stream = verifiedStream(source(1), "0".repeat(64), (actual) => seen.push(actual));
    await expect(new Response(stream).text()).rejects.toThrow();
    expect(seen).toEqual([sha256]);
  });
});
