import "server-only";
import path from "node:path";
import { Worker } from "node:worker_threads";
import type { Job, JobResult } from "./worker/jobs";
import type { JobMessage, WorkerMessage } from "./worker/protocol";

/** A worker died (or was terminated) while running the job; the job itself may be fine. */
export class WorkerCrashed extends Error {
  constructor(message: string) {
    super(message);
    this.name = "WorkerCrashed";
  }
}

/** An error thrown inside the worker, carried back by name and message. */
export class WorkerJobFailed extends Error {
  constructor(name: string, message: string, stack?: string) {
    super(message);
    this.name = name;
    if (stack) this.stack = stack;
  }
}

interface Task {
  id: number;
  job: Job;
  urgent: boolean;
  resolve(result: unknown): void;
  reject(error: Error): void;
}

interface Slot {
  worker: Worker;
  ready: boolean;
  task: Task | null;
}

/*
 * The worker runs TypeScript sources from the repository through tsx's loader rather than a
 * bundled copy: one code path for `next start`, `next dev` and the tests. The paths are resolved
 * at run time from the project root, and the bundler is told to leave `new Worker()` alone.
 */
const workerDir = () => path.join(process.cwd(), "lib", "ingest", "worker");

/**
 * A fixed number of worker threads running jobs off the request thread. Urgent jobs (hashing a
 * fresh upload, which a waiting browser needs) go ahead of queued ones.
 */
export class WorkerPool {
  private readonly slots = new Set<Slot>();
  private readonly queue: Task[] = [];
  private nextId = 1;
  private closed = false;

  constructor(
    readonly size: number,
    private readonly heapLimitMb = 512,
  ) {}

  run<J extends Job>(job: J, options: { urgent?: boolean } = {}): Promise<JobResult<J>> {
    if (this.closed) return Promise.reject(new Error("The analysis pool is shut down"));
    return new Promise<JobResult<J>>((resolve, reject) => {
      const task: Task = { id: this.nextId++, job, urgent: options.urgent ?? false, resolve: (r) => resolve(r as JobResult<J>), reject };
      if (task.urgent) {
        const firstNormal = this.queue.findIndex((t) => !t.urgent);
        this.queue.splice(firstNormal === -1 ? this.queue.length : firstNormal, 0, task);
      } else this.queue.push(task);
      this.dispatch();
    });
  }

  /** Jobs waiting plus jobs running. */
  get load(): number {
    let running = 0;
    for (const slot of this.slots) if (slot.task) running += 1;
    return running + this.queue.length;
  }

  async close(): Promise<void> {
    this.closed = true;
    for (const task of this.queue.splice(0)) task.reject(new Error("The analysis pool is shut down"));
    await Promise.all([...this.slots].map((slot) => slot.worker.terminate()));
    this.slots.clear();
  }

  private dispatch(): void {
    while (this.queue.length > 0) {
      const idle = [...this.slots].find((slot) => slot.ready && !slot.task);
      if (!idle) {
        if (this.slots.size < this.size) this.spawn();
        return;
      }
      const task = this.queue.shift();
      if (!task) return;
      idle.task = task;
      idle.worker.ref();
      idle.worker.postMessage({ id: task.id, job: task.job } satisfies JobMessage);
    }
  }

  private spawn(): void {
    // turbopackIgnore: Turbopack would otherwise try to bundle the worker entry (and tsx with esbuild's binary).
    const worker = new Worker(/* turbopackIgnore: true */ path.join(workerDir(), "boot.mjs"), {
      workerData: { entry: path.join(workerDir(), "analysis-worker.ts") },
      resourceLimits: { maxOldGenerationSizeMb: this.heapLimitMb },
      // The worker's console goes to the server log like the main thread's.
      stdout: false,
      stderr: false,
    });
    const slot: Slot = { worker, ready: false, task: null };
    this.slots.add(slot);
    worker.on("message", (message: WorkerMessage) => {
      if (message.type === "ready") {
        slot.ready = true;
        worker.unref();
        this.dispatch();
        return;
      }
      const task = slot.task;
      if (!task || task.id !== message.id) return;
      slot.task = null;
      worker.unref();
      if (message.type === "result") task.resolve(message.result);
      else task.reject(new WorkerJobFailed(message.error.name, message.error.message, message.error.stack));
      this.dispatch();
    });
    const retire = (reason: string) => {
      if (!this.slots.delete(slot)) return;
      slot.task?.reject(new WorkerCrashed(reason));
      slot.task = null;
      // A worker that cannot even start would be replaced forever: let the next job fail instead.
      if (!slot.ready) this.queue.shift()?.reject(new WorkerCrashed(`The analysis worker could not start: ${reason}`));
      if (!this.closed) this.dispatch();
    };
    worker.on("error", (error) => retire(`The analysis worker failed: ${error.message}`));
    worker.on("exit", (code) => retire(`The analysis worker stopped (exit code ${code})`));
  }
}
