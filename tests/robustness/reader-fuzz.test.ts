/**
 * The reader against hostile input (issue 7, robustness): random bytes, cut-off logs, runaway
 * lines and headers, wrong encodings, odd delimiters and quotes. Whatever arrives, readLog either
 * returns a summary or throws AnalysisRejected with a message and, when a line is to blame, that
 * line; never another exception, never a hang (each case has its own timeout). The cases come
 * from a fixed seed: a failure names its case, and the same seed rebuilds it.
 */
import { describe, expect, it } from "vitest";
import { AnalysisRejected, type LocatedError } from "@/lib/analysis/types";
import { readAll } from "../support/log-forms";
import { createPrng } from "../support/sim/prng";
import { fuzzCases, type FuzzCase } from "./support/fuzz-inputs";

const seed = 20261201;
const perCaseTimeout_ms = 20_000;
const parsers = ["auto", "fast", "papaparse"] as const;

type Outcome = { kind: "summary"; rows: number } | { kind: "rejected"; detail: LocatedError };

async function outcomeOf(bytes: Uint8Array, parser: (typeof parsers)[number], chunkSize: number): Promise<Outcome> {
  try {
    const { summary } = await readAll(bytes, { parser, chunkSize, fileName: "fuzz.csv" });
    return { kind: "summary", rows: summary.rows };
  } catch (error) {
    // Anything but AnalysisRejected is a crash as far as the user is concerned: let it fail the case.
    if (!(error instanceof AnalysisRejected)) throw error;
    return { kind: "rejected", detail: error.detail };
  }
}

/** Physical lines in the bytes, counting both LF and lone CR: a named line can be no later than this. */
function physicalLines(bytes: Uint8Array): number {
  let n = 1;
  for (const b of bytes) if (b === 0x0a || b === 0x0d) n++;
  return n;
}

const cases = fuzzCases(seed);
const rng = createPrng(seed ^ 0x5eed);
// Chunk sizes and parsing paths vary per case, so chunk boundaries land everywhere.
const runs = cases.map((c, k) => ({ ...c, parser: parsers[k % parsers.length] ?? "auto", chunkSize: 1 + Math.floor(rng.next() * 8192) }));

describe(`readLog on ${cases.length} hostile inputs (seed ${seed})`, () => {
  it.each(runs)("$name ($parser path, $chunkSize-byte chunks)", async (c: FuzzCase & { parser: (typeof parsers)[number]; chunkSize: number }) => {
    const outcome = await outcomeOf(c.bytes, c.parser, c.chunkSize);
    if (outcome.kind === "rejected") {
      const { detail } = outcome;
      expect(detail.message.trim()).not.toBe("");
      expect(detail.file).toBe("fuzz.csv");
      // Every rejection but an empty file is about some line; it must be a real one.
      if (detail.code !== "empty") {
        expect(detail.line).toBeGreaterThanOrEqual(1);
        expect(detail.line).toBeLessThanOrEqual(physicalLines(c.bytes));
      }
      if (detail.column !== undefined) expect(detail.column).toBeGreaterThanOrEqual(1);
    } else {
      expect(outcome.rows).toBeGreaterThan(0);
    }
    if (c.rows !== undefined) expect(outcome).toEqual({ kind: "summary", rows: c.rows });
    if (c.rejects) expect(outcome).toMatchObject({ kind: "rejected", detail: c.rejects });
  }, perCaseTimeout_ms);

  it("covers every family with enough cases to mean something", () => {
    // Guards the generator itself: a refactor that silently dropped a family would pass everything above.
    const count = (pattern: RegExp) => cases.filter((c) => pattern.test(c.name)).length;
    expect(count(/^random bytes|^log-like noise/)).toBeGreaterThanOrEqual(50);
    expect(count(/^valid log cut/)).toBeGreaterThanOrEqual(50);
    expect(count(/MB/)).toBeGreaterThanOrEqual(3);
    expect(count(/columns/)).toBeGreaterThanOrEqual(4);
    expect(count(/UTF-16|Latin-1/)).toBeGreaterThanOrEqual(30);
    expect(count(/^delimiter/)).toBeGreaterThanOrEqual(50);
  });
});
