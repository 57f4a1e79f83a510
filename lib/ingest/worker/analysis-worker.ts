/**
 * Worker-thread entry: runs one job per message and answers with its result. Started through
 * boot.mjs, which loads this TypeScript file with tsx's loader.
 */
import { parentPort } from "node:worker_threads";
import { runJob } from "./jobs";
import type { JobMessage, WorkerMessage } from "./protocol";

const port = parentPort;
if (!port) throw new Error("analysis-worker.ts must run in a worker thread");

port.on("message", (message: JobMessage) => {
  runJob(message.job).then(
    (result) => port.postMessage({ type: "result", id: message.id, result } satisfies WorkerMessage),
    (error: unknown) => {
      const e = error instanceof Error ? error : new Error(String(error));
      port.postMessage({ type: "error", id: message.id, error: { name: e.name, message: e.message, stack: e.stack } } satisfies WorkerMessage);
    },
  );
});
port.postMessage({ type: "ready" } satisfies WorkerMessage);
