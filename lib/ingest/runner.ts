import "server-only";
import { randomUUID } from "node:crypto";
import { databaseIsExclusive } from "@/lib/db/client";
import {
  analysisLeaseSeconds,
  claimQueuedRun,
  completeAnalysis,
  failAnalysis,
  recoverInterruptedRuns,
  releaseClaim,
  renewLease,
  type ClaimedRun,
} from "@/lib/db/queries/runs";
import { evaluateFlagsAfterAnalysis } from "@/lib/flags/evaluate";
import { storedFileUrl } from "@/lib/uploads/storage";
import { WorkerPool } from "./pool";
import { analysisRows, ReportNotUnderstood } from "./report-rows";
import type { AnalyseResult, HashResult } from "./worker/jobs";

/** A run whose analysis crashed the worker this often is failed instead of retried. */
export const maxAnalysisAttempts = 2;

/** Analyses at once: 1 by default (2 cores serve pages too), at most 2, from KNEEPOINT_ANALYSIS_CONCURRENCY. */
function analysisConcurrency(): number {
  const n = Number(process.env.KNEEPOINT_ANALYSIS_CONCURRENCY ?? 1);
  return n >= 2 ? 2 : 1;
}

interface IngestState {
  pool?: WorkerPool;
  queue?: RunQueue;
  recovery?: Promise<void>;
  /** This process's name on the runs it claims. */
  owner?: string;
  /** On a shared PostgreSQL server: the periodic look for runs another process left behind. */
  sweep?: NodeJS.Timeout;
}
// Route handlers, actions and instrumentation are separate module instances: share one state.
const stateKey = Symbol.for("kneepoint.ingest");
const state = ((globalThis as Record<symbol, unknown>)[stateKey] ??= {}) as IngestState;

/** The worker threads: one per concurrent analysis plus one kept for hashing fresh uploads. */
export function workerPool(): WorkerPool {
  state.pool ??= new WorkerPool(analysisConcurrency() + 1);
  return state.pool;
}

/** SHA-256 of a stored file, computed in a worker while streaming it; ahead of queued analyses. */
export async function hashStoredFile(fileKey: string): Promise<HashResult> {
  return workerPool().run({ kind: "hash", url: await storedFileUrl(fileKey) }, { urgent: true });
}

async function analyse(claim: ClaimedRun): Promise<AnalyseResult> {
  return workerPool().run({
    kind: "analyse",
    url: await storedFileUrl(claim.fileKey),
    fileName: claim.fileName,
    columnMap: claim.columnMap,
    limits: claim.limits,
    expectedSha256: claim.sha256,
  });
}

function owner(): string {
  state.owner ??= randomUUID();
  return state.owner;
}

/** Keeps the claim's lease alive while the analysis runs, renewing at a third of its length. */
function holdLease(claim: ClaimedRun): () => void {
  const timer = setInterval(() => {
    renewLease(claim).catch((error: unknown) => console.error(`Renewing the lease on run ${claim.runId} failed`, error));
  }, (analysisLeaseSeconds * 1000) / 3);
  timer.unref();
  return () => clearInterval(timer);
}

/** Runs one queued run's analysis and stores its outcome, under a lease. Returns whether the run must run again. */
async function processRun(runId: string): Promise<boolean> {
  const claim = await claimQueuedRun(runId, owner());
  if (!claim) return false;
  const release = holdLease(claim);
  try {
    return await analyseAndStore(claim);
  } finally {
    release();
  }
}

async function analyseAndStore(claim: ClaimedRun): Promise<boolean> {
  const { runId } = claim;
  let result: AnalyseResult;
  try {
    result = await analyse(claim);
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    console.error(`Analysis of run ${runId} (attempt ${claim.attempts}) failed: ${message}`);
    return (await releaseClaim(claim, message, maxAnalysisAttempts)) === "queued";
  }
  if (result.outcome === "rejected") {
    const { code, message, line, column, file } = result.error;
    return (await failAnalysis(claim, { code, message, line, column, file }))?.requeue ?? false;
  }
  if (result.outcome === "file-changed") {
    const error = { code: "file-changed", message: "The stored file no longer matches the SHA-256 recorded at upload; it was not analysed." };
    return (await failAnalysis(claim, error))?.requeue ?? false;
  }
  try {
    const rows = analysisRows(result.report, result.series);
    const stored = await completeAnalysis(claim, { rows, columnMap: result.columnMap, engineVersion: result.engineVersion });
    // Flag rules run on the stored analysis; a failure there must not fail the run, whose analysis is kept.
    if (stored && !stored.requeue) await evaluateFlagsAfterAnalysis(runId).catch((error: unknown) => console.error(`Flag rules after the analysis of run ${runId} failed`, error));
    return stored?.requeue ?? false;
  } catch (error) {
    if (!(error instanceof ReportNotUnderstood)) throw error;
    console.error(error);
    return (await failAnalysis(claim, { code: "internal", message: "The analysis finished but its report could not be stored; the error was logged." }))?.requeue ?? false;
  }
}

/** FIFO of run ids with a fixed number running at once. */
class RunQueue {
  private readonly pending: string[] = [];
  private readonly running = new Set<string>();
  private readonly again = new Set<string>();
  private waiters: (() => void)[] = [];

  constructor(private readonly limit: number) {}

  enqueue(runId: string): void {
    if (this.running.has(runId)) this.again.add(runId);
    else if (!this.pending.includes(runId)) this.pending.push(runId);
    this.kick();
  }

  get idle(): boolean {
    return this.pending.length === 0 && this.running.size === 0;
  }

  whenIdle(): Promise<void> {
    if (this.idle) return Promise.resolve();
    return new Promise((resolve) => this.waiters.push(resolve));
  }

  private kick(): void {
    while (this.running.size < this.limit && this.pending.length > 0) {
      const runId = this.pending.shift();
      if (!runId) break;
      this.running.add(runId);
      processRun(runId)
        .catch((error: unknown) => {
          console.error(`Analysis of run ${runId} stopped unexpectedly`, error);
          return false;
        })
        .then((requeue) => {
          this.running.delete(runId);
          if (requeue || this.again.delete(runId)) this.pending.push(runId);
          this.kick();
          if (this.idle) for (const wake of this.waiters.splice(0)) wake();
        });
    }
  }
}

function queue(): RunQueue {
  state.queue ??= new RunQueue(analysisConcurrency());
  return state.queue;
}

async function takeOverRuns(onlyExpired: boolean): Promise<void> {
  const { requeued, failed, queued } = await recoverInterruptedRuns(maxAnalysisAttempts, { onlyExpired });
  if (requeued.length || failed.length) console.log(`Analysis queue: resumed ${requeued.length} interrupted run(s), failed ${failed.length}.`);
  for (const runId of queued) queue().enqueue(runId);
}

/**
 * Once per process: runs left `analysing` by a crash or restart are queued again (or failed when
 * out of attempts), and every queued run is put on the queue. Alone on the database (PGlite) every
 * analysing run is an orphan; on a PostgreSQL server shared with other app processes only runs
 * whose lease ran out are, and this process looks for them again every half lease, so runs a
 * dead process held or queued are finished by a live one.
 */
export function recoverRuns(): Promise<void> {
  state.recovery ??= databaseIsExclusive()
    .then(async (exclusive) => {
      await takeOverRuns(!exclusive);
      if (!exclusive && !state.sweep) {
        state.sweep = setInterval(() => {
          takeOverRuns(true).catch((error: unknown) => console.error("Looking for runs other processes left failed", error));
        }, (analysisLeaseSeconds * 1000) / 2);
        state.sweep.unref();
      }
    })
    .catch((error: unknown) => {
      state.recovery = undefined;
      throw error;
    });
  return state.recovery;
}

/** Puts a run on the analysis queue (after start-up recovery has run). */
export async function enqueueAnalysis(runId: string): Promise<void> {
  await recoverRuns();
  queue().enqueue(runId);
}

/** Resolves when no analysis is queued or running (tests and scripts). */
export function analysisIdle(): Promise<void> {
  return state.queue ? state.queue.whenIdle() : Promise.resolve();
}

/** Stops the workers (tests and shutdown). Queued runs stay queued in the database. */
export async function stopAnalysis(): Promise<void> {
  const pool = state.pool;
  clearInterval(state.sweep);
  state.sweep = undefined;
  state.pool = undefined;
  state.queue = undefined;
  state.recovery = undefined;
  await pool?.close();
}
