import type { Job } from "./jobs";

/** Main thread → worker. */
export interface JobMessage {
  id: number;
  job: Job;
}

/** Worker → main thread. */
export type WorkerMessage =
  | { type: "ready" }
  | { type: "result"; id: number; result: unknown }
  | { type: "error"; id: number; error: { name: string; message: string; stack?: string } };
