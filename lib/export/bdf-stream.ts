import { readLog, type ReadOptions } from "@/lib/analysis/read";
import { createBdfWriter, type BdfWriterOptions } from "./battery-data-format";

// Rows per reader batch, so one chunk of output stays well under a megabyte of text.
const rowsPerChunk = 8192;

/**
 * A log's bytes in, its BDF text out, with backpressure: the log is read on only while the
 * consumer has room, so memory holds the reader's head and about one batch whatever the file's
 * size. A read error after the header went out errors the stream (a broken download, never a
 * silently short file).
 */
export function bdfStream(
  source: ReadableStream<Uint8Array>,
  options: { read?: Omit<ReadOptions, "batchSize">; bdf?: BdfWriterOptions; onError?: (error: unknown) => void } = {},
): ReadableStream<Uint8Array> {
  const encoder = new TextEncoder();
  const writer = createBdfWriter(options.bdf);
  let controller: ReadableStreamDefaultController<Uint8Array> | null = null;
  let wake: (() => void) | null = null;
  let cancelled = false;
  const reader = source.getReader();

  const hasRoom = () => controller !== null && (controller.desiredSize ?? 0) > 0;

  async function* gated(): AsyncGenerator<Uint8Array> {
    for (;;) {
      while (!cancelled && !hasRoom()) await new Promise<void>((resolve) => (wake = resolve));
      if (cancelled) throw new Error("The download was cancelled.");
      const { done, value } = await reader.read();
      if (done) return;
      yield value;
    }
  }

  return new ReadableStream<Uint8Array>({
    start(c) {
      controller = c;
      void readLog(gated(), (batch) => c.enqueue(encoder.encode(writer.write(batch))), { ...options.read, batchSize: rowsPerChunk }).then(
        () => {
          const tail = writer.end();
          if (tail) c.enqueue(encoder.encode(tail));
          c.close();
        },
        (error: unknown) => {
          if (cancelled) return;
          options.onError?.(error);
          c.error(error);
        },
      );
    },
    pull() {
      wake?.();
      wake = null;
    },
    async cancel(reason) {
      cancelled = true;
      wake?.();
      wake = null;
      await reader.cancel(reason);
    },
  });
}
