import "server-only";
import { and, asc, desc, eq, getTableColumns, inArray, sql } from "drizzle-orm";
import type { ChargeBalance, CycleRow, FindingRow, StepRow } from "@/lib/ingest/report-rows";
import type { RunPurpose, RunStatus } from "@/lib/validations/runs";
import { getDb } from "../client";
import { analysisVersion, cell, plotSeries, run, runCycle, runFinding, runStep, user, type RunError } from "../schema";

/** What the pages and the bench API show about runs. Narrow columns; no file keys leave the server. */

const latestAnalysis = and(eq(analysisVersion.runId, run.id), eq(analysisVersion.version, run.latestVersion));

/** When a run's test ended: as the uploader stated it, else the upload time. Dates and order of a cell's measurements follow it. */
export const runEndedAt = sql<Date>`coalesce(${run.testEndedAt}, ${run.createdAt})`.mapWith(run.createdAt);

const runHeaderColumns = {
  id: run.id,
  cellId: run.cellId,
  serial: cell.serial,
  source: run.source,
  purpose: run.purpose,
  ambientTempC: run.ambientTempC,
  testEndedAt: run.testEndedAt,
  operatorNote: run.operatorNote,
  fileName: run.fileName,
  fileSize: run.fileSize,
  sha256: run.sha256,
  status: run.status,
  error: run.error,
  uploadedByName: user.name,
  createdAt: run.createdAt,
  startedAt: run.startedAt,
  finishedAt: run.finishedAt,
  latestVersion: run.latestVersion,
};

export interface RunHeader {
  id: string;
  cellId: string;
  serial: string;
  source: "browser" | "api";
  purpose: RunPurpose;
  ambientTempC: number | null;
  /** As the uploader stated it; null for "just before the upload". */
  testEndedAt: Date | null;
  operatorNote: string;
  fileName: string;
  fileSize: number;
  sha256: string;
  status: RunStatus;
  error: RunError | null;
  uploadedByName: string | null;
  createdAt: Date;
  startedAt: Date | null;
  finishedAt: Date | null;
  latestVersion: number | null;
}

/** Null throughout until the run's first analysis completes. */
export interface RunKeyNumbers extends ChargeBalance {
  findingsCount: number | null;
  safetyFindingsCount: number | null;
}

export type RunListItem = RunHeader & RunKeyNumbers;

const keyNumberColumns = {
  chargedMah: analysisVersion.chargedMah,
  dischargedMah: analysisVersion.dischargedMah,
  coulombicEfficiency: analysisVersion.coulombicEfficiency,
  switchTimeS: analysisVersion.switchTimeS,
  switchVoltageV: analysisVersion.switchVoltageV,
  switchCapacityMah: analysisVersion.switchCapacityMah,
  findingsCount: analysisVersion.findingsCount,
  safetyFindingsCount: analysisVersion.safetyFindingsCount,
};

/** Every run of a cell (serial matched without regard to case), newest first, with the latest analysis' key numbers. */
export async function listRunsOfCell(serial: string): Promise<{ cellId: string; serial: string; runs: RunListItem[] } | null> {
  const db = await getDb();
  const [target] = await db.select({ id: cell.id, serial: cell.serial }).from(cell).where(eq(sql`lower(${cell.serial})`, serial.toLowerCase()));
  if (!target) return null;
  const runs = await db
    .select({ ...runHeaderColumns, ...keyNumberColumns })
    .from(run)
    .innerJoin(cell, eq(cell.id, run.cellId))
    .leftJoin(user, eq(user.id, run.uploadedBy))
    .leftJoin(analysisVersion, latestAnalysis)
    .where(eq(run.cellId, target.id))
    .orderBy(desc(run.createdAt), desc(run.id));
  return { cellId: target.id, serial: target.serial, runs };
}

export async function getRunHeader(runId: string): Promise<RunListItem | null> {
  const db = await getDb();
  const [row] = await db
    .select({ ...runHeaderColumns, ...keyNumberColumns })
    .from(run)
    .innerJoin(cell, eq(cell.id, run.cellId))
    .leftJoin(user, eq(user.id, run.uploadedBy))
    .leftJoin(analysisVersion, latestAnalysis)
    .where(eq(run.id, runId));
  return row ?? null;
}

export interface AnalysisView {
  id: string;
  version: number;
  engineVersion: string;
  createdAt: Date;
  columnMap: unknown;
  detection: unknown;
  report: unknown;
}

export type RunStepView = Omit<StepRow, "detail">;
export type RunCycleView = CycleRow;
export type RunFindingView = FindingRow;

// Everything a result row holds but its own id and its analysis' id.
const { id: _stepId, analysisId: _stepAnalysis, detail: _stepDetail, ...stepColumns } = getTableColumns(runStep);
const { id: _cycleId, analysisId: _cycleAnalysis, ...cycleColumns } = getTableColumns(runCycle);
const { id: _findingId, analysisId: _findingAnalysis, ...findingColumns } = getTableColumns(runFinding);

export interface RunDetail {
  run: RunListItem;
  /** The latest stored analysis; null until one completes. */
  analysis: AnalysisView | null;
  versions: { version: number; engineVersion: string; createdAt: Date }[];
  steps: RunStepView[];
  cycles: RunCycleView[];
  findings: RunFindingView[];
  /** Trace name → the stored downsampled points. */
  series: Record<string, unknown>;
}

/** One run with an analysis version (the latest unless `version` is given) and everything stored for it. */
export async function getRunDetail(runId: string, version?: number): Promise<RunDetail | null> {
  const header = await getRunHeader(runId);
  if (!header) return null;
  const db = await getDb();
  const versions = await db
    .select({ version: analysisVersion.version, engineVersion: analysisVersion.engineVersion, createdAt: analysisVersion.createdAt })
    .from(analysisVersion)
    .where(eq(analysisVersion.runId, runId))
    .orderBy(desc(analysisVersion.version));
  const wanted = version ?? header.latestVersion;
  const [analysis] =
    wanted === null
      ? []
      : await db
          .select({
            id: analysisVersion.id,
            version: analysisVersion.version,
            engineVersion: analysisVersion.engineVersion,
            createdAt: analysisVersion.createdAt,
            columnMap: analysisVersion.columnMap,
            detection: analysisVersion.detection,
            report: analysisVersion.report,
          })
          .from(analysisVersion)
          .where(and(eq(analysisVersion.runId, runId), eq(analysisVersion.version, wanted)));
  if (!analysis) return { run: header, analysis: null, versions, steps: [], cycles: [], findings: [], series: {} };
  const [steps, cycles, findings, series] = await Promise.all([
    db
      .select(stepColumns)
      .from(runStep)
      .where(eq(runStep.analysisId, analysis.id))
      .orderBy(asc(runStep.step)),
    db
      .select(cycleColumns)
      .from(runCycle)
      .where(eq(runCycle.analysisId, analysis.id))
      .orderBy(asc(runCycle.cycle)),
    db
      .select(findingColumns)
      .from(runFinding)
      .where(eq(runFinding.analysisId, analysis.id))
      .orderBy(asc(runFinding.timeS), asc(runFinding.id)),
    db.select({ trace: plotSeries.trace, data: plotSeries.data }).from(plotSeries).where(eq(plotSeries.analysisId, analysis.id)),
  ]);
  return { run: header, analysis, versions, steps, cycles, findings, series: Object.fromEntries(series.map((s) => [s.trace, s.data])) };
}

/** The latest analysis' plot series of several runs at once (a cell page plots every run). */
export async function getLatestSeries(runIds: string[]): Promise<Map<string, Record<string, unknown>>> {
  const out = new Map<string, Record<string, unknown>>();
  if (runIds.length === 0) return out;
  const db = await getDb();
  const rows = await db
    .select({ runId: run.id, trace: plotSeries.trace, data: plotSeries.data })
    .from(run)
    .innerJoin(analysisVersion, latestAnalysis)
    .innerJoin(plotSeries, eq(plotSeries.analysisId, analysisVersion.id))
    .where(inArray(run.id, runIds));
  for (const row of rows) {
    const traces = out.get(row.runId) ?? {};
    traces[row.trace] = row.data;
    out.set(row.runId, traces);
  }
  return out;
}

/** Where a run's raw bytes are and what they must hash to. Server-side only (has the storage key). */
export async function getRunFile(runId: string): Promise<{ fileKey: string; fileName: string; fileSize: number; sha256: string } | null> {
  const db = await getDb();
  const [row] = await db
    .select({ fileKey: run.fileKey, fileName: run.fileName, fileSize: run.fileSize, sha256: run.sha256 })
    .from(run)
    .where(eq(run.id, runId));
  return row ?? null;
}
