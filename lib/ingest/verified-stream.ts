import { createHash } from "node:crypto";

/**
 * Passes a byte stream through while hashing it, holding back the last chunk until the digest
 * is known: when the bytes do not match `expectedSha256` the stream errors instead of ending, so
 * the client sees a broken download (short of its Content-Length), never silently wrong bytes.
 */
export function verifiedStream(source: ReadableStream<Uint8Array>, expectedSha256: string, onMismatch: (actual: string) => void): ReadableStream<Uint8Array> {
  const hash = createHash("sha256");
  const reader = source.getReader();
  let held: Uint8Array | null = null;
  return new ReadableStream<Uint8Array>({
    // Reads on until it has something to hand over: a pull that enqueues nothing leaves a
    // waiting read unanswered (the stream calls pull again only after an enqueue or a new read).
    async pull(controller) {
      for (;;) {
        const { done, value } = await reader.read();
        if (done) {
          const actual = hash.digest("hex");
          if (actual !== expectedSha256) {
            onMismatch(actual);
            controller.error(new Error("The stored file does not match its recorded SHA-256"));
            return;
          }
          if (held) controller.enqueue(held);
          controller.close();
          return;
        }
        hash.update(value);
        const previous = held;
        held = value;
        if (previous) {
          controller.enqueue(previous);
          return;
        }
      }
    },
    cancel(reason) {
      return reader.cancel(reason);
    },
  });
}
