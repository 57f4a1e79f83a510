import "server-only";
import { and, asc, eq, isNull, lt, max, or, sql } from "drizzle-orm";
import { columnMapSchema, type CellLimits, type ColumnMap } from "@/lib/analysis/types";
import { AppError } from "@/lib/http/errors";
import { cellLimitsOf } from "@/lib/ingest/limits";
import type { AnalysisRows } from "@/lib/ingest/report-rows";
import type { RunPurpose, RunStatus } from "@/lib/validations/runs";
import { getDb, type Executor, type Transaction } from "../client";
import { analysisVersion, cell, plotSeries, run, runCycle, runFinding, runStep, type RunError } from "../schema";
import { recordAudit, type AuditActor } from "./audit";
import { isUniqueViolation } from "./pg-errors";
import { createCell, getCellType } from "./registry";

/* ------------------------------------------------------------------------------------------
 * Intake: a stored file becomes a queued run.
 * ---------------------------------------------------------------------------------------- */

export interface NewRun {
  cellSerial: string;
  /** Where a new cell belongs, when the serial is not registered yet. */
  newCell?: { batchId?: string; cellTypeId?: string };
  /** Whether the uploader may register a new cell (the `cell.write` capability). */
  mayCreateCell: boolean;
  source: "browser" | "api";
  purpose: RunPurpose;
  ambientTempC: number | null;
  /**
   * When the test ended (ISO 8601 instant); null for "just before the upload". Text, not a Date:
   * a browser upload's fields travel through the upload service as JSON and come back as text.
   */
  testEndedAt?: string | null;
  operatorNote: string;
  fileKey: string;
  fileName: string;
  fileSize: number;
  sha256: string;
  columnMap: ColumnMap | null;
}

/** Thrown when the same bytes are already stored for the cell; `runId` is the existing run. */
export class DuplicateRun extends AppError {
  constructor(readonly runId: string, serial: string) {
    super("conflict", `This file is byte-identical to a run already stored for cell ${serial}.`, { details: { runId } });
  }
}

async function findCellId(exec: Executor, serial: string): Promise<{ id: string; serial: string } | null> {
  const [row] = await exec
    .select({ id: cell.id, serial: cell.serial })
    .from(cell)
    .where(eq(sql`lower(${cell.serial})`, serial.toLowerCase()));
  return row ?? null;
}

/** Checks, before any bytes move, that a run for this serial could be recorded. */
export async function assertCellUsable(serial: string, newCell: NewRun["newCell"], mayCreateCell: boolean): Promise<void> {
  const db = await getDb();
  if (await findCellId(db, serial)) return;
  if (!mayCreateCell) throw new AppError("forbidden", `Cell ${serial} is not registered, and your role may not register cells.`);
  if (!newCell?.batchId && !newCell?.cellTypeId)
    throw new AppError("bad-request", `Cell ${serial} is not registered yet: choose its batch or cell type to register it.`, {
      fieldErrors: { batchId: ["Choose a batch or a cell type for the new cell"] },
    });
}

export async function findRunByHash(cellSerial: string, sha256: string): Promise<{ runId: string; serial: string } | null> {
  const db = await getDb();
  const [row] = await db
    .select({ runId: run.id, serial: cell.serial })
    .from(run)
    .innerJoin(cell, eq(cell.id, run.cellId))
    .where(and(eq(sql`lower(${cell.serial})`, cellSerial.toLowerCase()), eq(run.sha256, sha256)));
  return row ?? null;
}

/**
 * Records a queued run (and registers its cell when new) in one transaction. A byte-identical
 * file for the same cell is refused with DuplicateRun, by a check and by the unique index.
 */
export async function recordRun(input: NewRun, actor: AuditActor): Promise<{ runId: string; cellId: string; serial: string }> {
  const db = await getDb();
  try {
    return await db.transaction(async (tx) => {
      let target = await findCellId(tx, input.cellSerial);
      if (!target) {
        if (!input.mayCreateCell) throw new AppError("forbidden", `Cell ${input.cellSerial} is not registered, and your role may not register cells.`);
        target = await createCell({ serial: input.cellSerial, batchId: input.newCell?.batchId, cellTypeId: input.newCell?.cellTypeId }, actor, tx);
      }
      const [existing] = await tx
        .select({ id: run.id })
        .from(run)
        .where(and(eq(run.cellId, target.id), eq(run.sha256, input.sha256)));
      if (existing) throw new DuplicateRun(existing.id, target.serial);
      const [row] = await tx
        .insert(run)
        .values({
          cellId: target.id,
          uploadedBy: actor.id,
          source: input.source,
          purpose: input.purpose,
          ambientTempC: input.ambientTempC,
          testEndedAt: input.testEndedAt ? new Date(input.testEndedAt) : null,
          operatorNote: input.operatorNote,
          fileKey: input.fileKey,
          fileName: input.fileName,
          fileSize: input.fileSize,
          sha256: input.sha256,
          status: "queued",
          requestedColumnMap: input.columnMap,
          requestSeq: 1,
          requestedBy: actor.id,
        })
        .returning({ id: run.id });
      if (!row) throw new Error("insert returned no row");
      await recordAudit(tx, actor, {
        action: "upload",
        entity: "run",
        entityId: row.id,
        after: { cellId: target.id, serial: target.serial, fileName: input.fileName, fileSize: input.fileSize, sha256: input.sha256, source: input.source, testEndedAt: input.testEndedAt ?? null },
      });
      return { runId: row.id, cellId: target.id, serial: target.serial };
    });
  } catch (error) {
    // Two uploads of the same bytes at once: the unique index lets one through.
    if (!(error instanceof AppError) && isUniqueViolation(error)) {
      const existing = await findRunByHash(input.cellSerial, input.sha256);
      if (existing) throw new DuplicateRun(existing.runId, existing.serial);
    }
    throw error;
  }
}

/* ------------------------------------------------------------------------------------------
 * Analysis requests and the runner's bookkeeping.
 * ---------------------------------------------------------------------------------------- */

function parseStoredMap(value: unknown): ColumnMap | null {
  if (value === null || value === undefined) return null;
  const parsed = columnMapSchema.safeParse(value);
  return parsed.success ? parsed.data : null;
}

/**
 * Asks for a (new) analysis of a stored run. A run being analysed keeps going; its result is
 * stored and the new request runs right after (see completeAnalysis). Returns whether the run
 * must be put on the queue now.
 */
export async function requestAnalysis(
  runId: string,
  columnMap: ColumnMap | null,
  actor: AuditActor,
): Promise<{ runId: string; status: RunStatus; enqueue: boolean }> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const [current] = await tx.select({ status: run.status }).from(run).where(eq(run.id, runId)).for("update");
    if (!current) throw new AppError("not-found", "That run does not exist.");
    const busy = current.status === "analysing";
    const status: RunStatus = busy ? "analysing" : "queued";
    await tx
      .update(run)
      .set({
        status,
        requestedColumnMap: columnMap,
        requestSeq: sql`${run.requestSeq} + 1`,
        requestedBy: actor.id,
        attempts: 0,
        ...(busy ? {} : { error: null, finishedAt: null }),
      })
      .where(eq(run.id, runId));
    await recordAudit(tx, actor, { action: "request analysis", entity: "run", entityId: runId, before: { status: current.status }, after: { status, columnMap } });
    return { runId, status, enqueue: !busy };
  });
}

/**
 * How long a claim on a run holds without a renewal. The runner renews it while it analyses; a
 * process that dies lets its runs go this long after its last renewal.
 */
export const analysisLeaseSeconds = 60;

/** The lease's end, by the database's clock, so processes on hosts with drifting clocks agree. */
const leaseEnd = sql`now() + make_interval(secs => ${analysisLeaseSeconds})`;

export interface ClaimedRun {
  runId: string;
  /** The claiming process. */
  owner: string;
  fileKey: string;
  fileName: string;
  sha256: string;
  columnMap: ColumnMap | null;
  requestSeq: number;
  requestedBy: string | null;
  attempts: number;
  limits: CellLimits;
}

/** Moves a queued run to analysing under `owner`'s lease and hands the runner what it needs; null when not queued. */
export async function claimQueuedRun(runId: string, owner = "this process"): Promise<ClaimedRun | null> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const [row] = await tx
      .select({
        fileKey: run.fileKey,
        fileName: run.fileName,
        sha256: run.sha256,
        requestedColumnMap: run.requestedColumnMap,
        requestSeq: run.requestSeq,
        requestedBy: run.requestedBy,
        attempts: run.attempts,
        cellTypeId: cell.cellTypeId,
      })
      .from(run)
      .innerJoin(cell, eq(cell.id, run.cellId))
      .where(and(eq(run.id, runId), eq(run.status, "queued")))
      .for("update", { of: run });
    if (!row) return null;
    const type = await getCellType(row.cellTypeId, tx);
    if (!type) throw new Error(`cell type ${row.cellTypeId} vanished`);
    const attempts = row.attempts + 1;
    await tx.update(run).set({ status: "analysing", startedAt: new Date(), attempts, leaseOwner: owner, leaseExpiresAt: leaseEnd }).where(eq(run.id, runId));
    return {
      runId,
      owner,
      fileKey: row.fileKey,
      fileName: row.fileName,
      sha256: row.sha256,
      columnMap: parseStoredMap(row.requestedColumnMap),
      requestSeq: row.requestSeq,
      requestedBy: row.requestedBy,
      attempts,
      limits: cellLimitsOf(type),
    };
  });
}

/**
 * The run row under a lock, or null when it is no longer being analysed by this claim: finished,
 * or taken over by another process after this one's lease ran out (its late result is dropped).
 */
async function lockClaimed(tx: Transaction, claim: ClaimedRun): Promise<{ overtaken: boolean } | null> {
  const [row] = await tx.select({ status: run.status, requestSeq: run.requestSeq, leaseOwner: run.leaseOwner }).from(run).where(eq(run.id, claim.runId)).for("update");
  if (!row || row.status !== "analysing" || row.leaseOwner !== claim.owner) return null;
  return { overtaken: row.requestSeq !== claim.requestSeq };
}

/** A run leaving `analysing` is no process's any more. */
const released = { leaseOwner: null, leaseExpiresAt: null };

/** Extends a claim's lease while its analysis runs; false once the run is no longer this claim's. */
export async function renewLease(claim: Pick<ClaimedRun, "runId" | "owner">): Promise<boolean> {
  const db = await getDb();
  const renewed = await db
    .update(run)
    .set({ leaseExpiresAt: leaseEnd })
    .where(and(eq(run.id, claim.runId), eq(run.status, "analysing"), eq(run.leaseOwner, claim.owner)))
    .returning({ id: run.id });
  return renewed.length > 0;
}

async function insertInChunks<T>(rows: T[], size: number, insert: (chunk: T[]) => Promise<unknown>): Promise<void> {
  for (let start = 0; start < rows.length; start += size) await insert(rows.slice(start, start + size));
}

/**
 * Stores a finished analysis as the run's next version — version row, steps, cycles, findings
 * and plot series — and marks the run complete, all in one transaction. When a newer request
 * arrived meanwhile the run goes back to the queue instead (`requeue`).
 */
export async function completeAnalysis(
  claim: ClaimedRun,
  result: { rows: AnalysisRows; columnMap: ColumnMap; engineVersion: string },
): Promise<{ version: number; requeue: boolean } | null> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const state = await lockClaimed(tx, claim);
    if (!state) return null;
    const [latest] = await tx.select({ v: max(analysisVersion.version) }).from(analysisVersion).where(eq(analysisVersion.runId, claim.runId));
    const version = (latest?.v ?? 0) + 1;
    const { rows } = result;
    const [av] = await tx
      .insert(analysisVersion)
      .values({
        runId: claim.runId,
        version,
        columnMap: result.columnMap,
        detection: rows.detected ?? {},
        report: rows.report,
        engineVersion: result.engineVersion,
        requestedBy: claim.requestedBy,
        ...rows.keyNumbers,
      })
      .returning({ id: analysisVersion.id });
    if (!av) throw new Error("insert returned no row");
    const analysisId = av.id;
    await insertInChunks(rows.steps, 500, (chunk) => tx.insert(runStep).values(chunk.map((s) => ({ ...s, analysisId }))));
    await insertInChunks(rows.cycles, 500, (chunk) => tx.insert(runCycle).values(chunk.map((c) => ({ ...c, analysisId }))));
    await insertInChunks(rows.findings, 500, (chunk) => tx.insert(runFinding).values(chunk.map((f) => ({ ...f, analysisId }))));
    await insertInChunks(rows.series, 4, (chunk) => tx.insert(plotSeries).values(chunk.map((s) => ({ ...s, analysisId }))));
    const status: RunStatus = state.overtaken ? "queued" : "complete";
    await tx
      .update(run)
      .set({ status, latestVersion: version, error: null, finishedAt: new Date(), ...released, ...(state.overtaken ? { attempts: 0 } : {}) })
      .where(eq(run.id, claim.runId));
    await recordAudit(tx, null, {
      action: "analyse",
      entity: "run",
      entityId: claim.runId,
      after: { status, version, analysisId, findings: rows.keyNumbers.findingsCount, engineVersion: result.engineVersion },
    });
    return { version, requeue: state.overtaken };
  });
}

/** Marks the claimed run failed with its error; nothing of the analysis is stored. */
export async function failAnalysis(claim: ClaimedRun, error: RunError): Promise<{ requeue: boolean } | null> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const state = await lockClaimed(tx, claim);
    if (!state) return null;
    const status: RunStatus = state.overtaken ? "queued" : "failed";
    await tx
      .update(run)
      .set({ status, error: state.overtaken ? null : error, finishedAt: new Date(), ...released, ...(state.overtaken ? { attempts: 0 } : {}) })
      .where(eq(run.id, claim.runId));
    await recordAudit(tx, null, { action: "analyse", entity: "run", entityId: claim.runId, after: { status, error } });
    return { requeue: state.overtaken };
  });
}

/**
 * After the worker died or storage could not be read: queue the run again, or fail it once it
 * has used its attempts, so no run retries forever.
 */
export async function releaseClaim(claim: ClaimedRun, message: string, maxAttempts: number): Promise<"queued" | "failed" | null> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const state = await lockClaimed(tx, claim);
    if (!state) return null;
    const retry = state.overtaken || claim.attempts < maxAttempts;
    const status = retry ? "queued" : "failed";
    const error: RunError | null = retry ? null : { code: "analysis-crashed", message: `The analysis could not finish: ${message}` };
    await tx
      .update(run)
      .set({ status, error, ...released, ...(retry ? {} : { finishedAt: new Date() }) })
      .where(eq(run.id, claim.runId));
    if (!retry) await recordAudit(tx, null, { action: "analyse", entity: "run", entityId: claim.runId, after: { status, error } });
    return status;
  });
}

/**
 * Runs left `analysing` by a crash or restart go back to the queue, or fail when they have used
 * their attempts. Returns every queued run, oldest first, for the queue. `onlyExpired`: take only
 * runs whose lease ran out (several processes share a PostgreSQL server); without it every
 * analysing run is taken, which is right when this process holds the database alone (PGlite's
 * directory lock) and so no other process can be analysing.
 */
export async function recoverInterruptedRuns(maxAttempts: number, options: { onlyExpired?: boolean } = {}): Promise<{ requeued: string[]; failed: string[]; queued: string[] }> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const expired = or(isNull(run.leaseExpiresAt), lt(run.leaseExpiresAt, sql`now()`));
    const interrupted = await tx
      .select({ id: run.id, attempts: run.attempts })
      .from(run)
      .where(options.onlyExpired ? and(eq(run.status, "analysing"), expired) : eq(run.status, "analysing"))
      .for("update", { skipLocked: true });
    const requeued: string[] = [];
    const failed: string[] = [];
    for (const r of interrupted) {
      if (r.attempts < maxAttempts) {
        await tx.update(run).set({ status: "queued", ...released }).where(eq(run.id, r.id));
        requeued.push(r.id);
      } else {
        const error: RunError = { code: "analysis-interrupted", message: "The analysis was interrupted by restarts too often; start it again." };
        await tx.update(run).set({ status: "failed", error, finishedAt: new Date() }).where(eq(run.id, r.id));
        await recordAudit(tx, null, { action: "analyse", entity: "run", entityId: r.id, after: { status: "failed", error } });
        failed.push(r.id);
      }
    }
    const queued = await tx.select({ id: run.id }).from(run).where(eq(run.status, "queued")).orderBy(asc(run.createdAt));
    return { requeued, failed, queued: queued.map((q) => q.id) };
  });
}
