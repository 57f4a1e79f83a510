import "server-only";
import { and, asc, count, eq, inArray, isNotNull, sql } from "drizzle-orm";
import { capacityCurvesOf, voltageTraceOf, type XY } from "@/lib/charts/plot-series";
import { dischargeCurve } from "@/lib/charts/curves";
import { deliveredCapacity, type CycleCapacity } from "@/lib/charts/capacity";
import { unclosedFlagStates } from "@/lib/flags/vocabulary";
import { AppError } from "@/lib/http/errors";
import { batchCellRow, type BatchCellRow } from "@/lib/notebook/batch-rows";
import { cellFigures, type CellFigures, type RunFigures } from "@/lib/notebook/cell-figures";
import { limitKinds } from "@/lib/notebook/findings";
import type { NoteEntry } from "@/lib/notebook/notes";
import type { AddRunNoteInput } from "@/lib/validations/notebook";
import { getDb, type Executor } from "../client";
import { analysisVersion, batch, cell, cellType, flag, plotSeries, run, runCycle, runFinding, runNote } from "../schema";
import { recordAudit, type AuditActor } from "./audit";
import { getRunDetail, getRunHeader, listRunsOfCell, runEndedAt, type RunDetail, type RunListItem } from "./run-views";

/**
 * Reads for the notebook pages (run, cell, batch) and the run notes. Built on the ingest's run
 * views; everything here selects the columns a page shows, and traces are thinned or picked on
 * the server before they travel.
 */

const latestAnalysis = and(eq(analysisVersion.runId, run.id), eq(analysisVersion.version, run.latestVersion));

// The report keeps every resistance measurement; these pull out just the values, by method, in SQL.
const dcirValues = (method: string) =>
  sql<number[] | null>`jsonb_path_query_array(${analysisVersion.report}, ${`$.dcir[*] ? (@.method == "${method}").resistance_mOhm`}::jsonpath)`;

// Safety findings as the notebook counts them (lib/notebook/findings.ts), of the latest analysis.
const safetyCount = sql<number | null>`(select count(*)::int from ${runFinding} where ${runFinding.analysisId} = ${analysisVersion.id} and (${runFinding.severity} = 'danger' or ${inArray(runFinding.kind, [...limitKinds])}))`;

/* ---------------------------------- the run page ---------------------------------- */

export interface RunCellContext {
  cellTypeName: string;
  ratedCapacityMah: number;
  batchId: string | null;
  lotCode: string | null;
  cellStatus: "active" | "flagged" | "retired";
}

export interface RunPage {
  detail: RunDetail;
  cell: RunCellContext;
  notes: NoteEntry[];
}

export async function getRunPage(runId: string, version?: number): Promise<RunPage | null> {
  const detail = await getRunDetail(runId, version);
  if (!detail) return null;
  const db = await getDb();
  const [context] = await db
    .select({ cellTypeName: cellType.name, ratedCapacityMah: cellType.ratedCapacityMah, batchId: cell.batchId, lotCode: batch.lotCode, cellStatus: cell.status })
    .from(cell)
    .innerJoin(cellType, eq(cellType.id, cell.cellTypeId))
    .leftJoin(batch, eq(batch.id, cell.batchId))
    .where(eq(cell.id, detail.run.cellId));
  if (!context) return null;
  return { detail, cell: context, notes: await listRunNotes(runId, db) };
}

/* ---------------------------------- notes ---------------------------------- */

export async function listRunNotes(runId: string, exec?: Executor): Promise<NoteEntry[]> {
  const db = exec ?? (await getDb());
  const rows = await db
    .select({ id: runNote.id, authorName: runNote.authorName, at: runNote.at, text: runNote.text, amends: runNote.amends })
    .from(runNote)
    .where(eq(runNote.runId, runId))
    .orderBy(asc(runNote.at), asc(runNote.id));
  return rows.map((r) => ({ ...r, at: r.at.toISOString() }));
}

/**
 * Appends a note, or an amendment of an earlier note of the same run, with its audit event in
 * the same transaction. Nothing is ever updated: the amended note stays as it was written.
 */
export async function addRunNote(input: AddRunNoteInput, actor: AuditActor): Promise<NoteEntry> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const [target] = await tx.select({ id: run.id }).from(run).where(eq(run.id, input.runId));
    if (!target) throw new AppError("not-found", "That run does not exist.");
    if (input.amends !== undefined) {
      const [original] = await tx.select({ runId: runNote.runId }).from(runNote).where(eq(runNote.id, input.amends));
      if (!original || original.runId !== input.runId)
        throw new AppError("bad-request", "The note to amend is not a note of this run.", { fieldErrors: { amends: ["Choose a note of this run"] } });
    }
    const [row] = await tx
      .insert(runNote)
      .values({ runId: input.runId, authorId: actor.id, authorName: actor.name, text: input.text, amends: input.amends ?? null })
      .returning({ id: runNote.id, authorName: runNote.authorName, at: runNote.at, text: runNote.text, amends: runNote.amends });
    if (!row) throw new Error("insert returned no row");
    await recordAudit(tx, actor, {
      action: input.amends === undefined ? "add note" : "amend note",
      entity: "run",
      entityId: input.runId,
      after: { noteId: row.id, amends: row.amends, text: row.text },
    });
    return { ...row, at: row.at.toISOString() };
  });
}

/* ---------------------------------- runs' figures ---------------------------------- */

interface RunFigureRow extends RunFigures {
  cellId: string;
  analysisId: string | null;
}

/** Every run of the given cells with what a cell's figures need: key numbers, DCIR values and full-cycle capacities of the latest analysis. */
async function runFiguresOfCells(cellIds: string[]): Promise<RunFigureRow[]> {
  if (cellIds.length === 0) return [];
  const db = await getDb();
  const runs = await db
    .select({
      runId: run.id,
      cellId: run.cellId,
      endedAt: runEndedAt,
      analysisId: analysisVersion.id,
      findingsCount: analysisVersion.findingsCount,
      safetyFindingsCount: safetyCount,
      dcirIec: dcirValues("IEC 61960-3 DC"),
      dcirEdge: dcirValues("step-edge"),
    })
    .from(run)
    .leftJoin(analysisVersion, latestAnalysis)
    .where(inArray(run.cellId, cellIds));
  const analysisIds = runs.flatMap((r) => (r.analysisId ? [r.analysisId] : []));
  const cycles = analysisIds.length
    ? await db
        .select({
          analysisId: runCycle.analysisId,
          cycle: runCycle.cycle,
          chargedMah: runCycle.chargedMah,
          dischargedMah: runCycle.dischargedMah,
          coulombicEfficiency: runCycle.coulombicEfficiency,
        })
        .from(runCycle)
        .where(and(inArray(runCycle.analysisId, analysisIds), isNotNull(runCycle.dischargedMah)))
    : [];
  const byAnalysis = new Map<string, CycleCapacity[]>();
  for (const { analysisId, ...c } of cycles) {
    const list = byAnalysis.get(analysisId) ?? [];
    list.push(c);
    byAnalysis.set(analysisId, list);
  }
  const numbers = (v: unknown): number[] => (Array.isArray(v) ? v.filter((x): x is number => typeof x === "number" && Number.isFinite(x)) : []);
  return runs.map((r) => ({
    runId: r.runId,
    cellId: r.cellId,
    analysisId: r.analysisId,
    endedAt: r.endedAt,
    analysed: r.analysisId !== null,
    findingsCount: r.findingsCount,
    safetyFindingsCount: r.safetyFindingsCount,
    dcirIecMohm: numbers(r.dcirIec),
    dcirEdgeMohm: numbers(r.dcirEdge),
    cycles: r.analysisId ? (byAnalysis.get(r.analysisId) ?? []) : [],
  }));
}

async function openFlagCounts(cellIds: string[]): Promise<Map<string, number>> {
  if (cellIds.length === 0) return new Map();
  const db = await getDb();
  const rows = await db
    .select({ cellId: flag.cellId, n: count() })
    .from(flag)
    .where(and(inArray(flag.cellId, cellIds), inArray(flag.state, [...unclosedFlagStates])))
    .groupBy(flag.cellId);
  return new Map(rows.map((r) => [r.cellId, r.n]));
}

/* ---------------------------------- the cell page ---------------------------------- */

export interface CellRunEntry extends RunListItem {
  /** Delivered capacity of the run's last full cycle, when it has one. */
  delivered: { cycle: number; mAh: number; coulombicEfficiency: number | null; afterCharge: boolean } | null;
  cycles: CycleCapacity[];
  /** DC resistance values of the latest analysis, mΩ, by method. */
  dcir: { iec: number[]; edge: number[] };
  /** The voltage trace, for the run's sparkline (stays on the server). */
  voltage: XY | null;
}

export interface CellNotebook {
  cellId: string;
  serial: string;
  ratedCapacityMah: number;
  figures: CellFigures;
  openFlags: number;
  runs: CellRunEntry[];
}

export async function getCellNotebook(serial: string): Promise<CellNotebook | null> {
  const listed = await listRunsOfCell(serial);
  if (!listed) return null;
  const db = await getDb();
  const [type] = await db
    .select({ ratedCapacityMah: cellType.ratedCapacityMah })
    .from(cell)
    .innerJoin(cellType, eq(cellType.id, cell.cellTypeId))
    .where(eq(cell.id, listed.cellId));
  const ids = listed.runs.map((r) => r.id);
  const [figures, flags, traces] = await Promise.all([
    runFiguresOfCells([listed.cellId]),
    openFlagCounts([listed.cellId]),
    ids.length
      ? db
          .select({ runId: run.id, data: plotSeries.data })
          .from(run)
          .innerJoin(analysisVersion, latestAnalysis)
          .innerJoin(plotSeries, and(eq(plotSeries.analysisId, analysisVersion.id), eq(plotSeries.trace, "voltage")))
          .where(inArray(run.id, ids))
      : [],
  ]);
  const figuresOf = new Map(figures.map((f) => [f.runId, f]));
  const voltageOf = new Map(traces.map((t) => [t.runId, voltageTraceOf(t.data)]));
  const rated = type?.ratedCapacityMah ?? null;
  return {
    cellId: listed.cellId,
    serial: listed.serial,
    ratedCapacityMah: rated ?? 0,
    figures: cellFigures(figures, rated),
    openFlags: flags.get(listed.cellId) ?? 0,
    runs: listed.runs.map((r) => {
      const f = figuresOf.get(r.id);
      return {
        ...r,
        // The notebook's own count (limits and danger), not every finding that carries a caution.
        safetyFindingsCount: f ? f.safetyFindingsCount : r.safetyFindingsCount,
        cycles: f?.cycles ?? [],
        delivered: f ? deliveredCapacity(f.cycles) : null,
        dcir: { iec: f?.dcirIecMohm ?? [], edge: f?.dcirEdgeMohm ?? [] },
        voltage: voltageOf.get(r.id) ?? null,
      };
    }),
  };
}

/* ---------------------------------- discharge curves ---------------------------------- */

export interface RunDischargeCurve {
  cycle: number;
  capacity_mAh: number[];
  voltage_V: number[];
}

/** The discharge curve of a run's delivered-capacity cycle (latest analysis), for overlays; null when the run has none. */
export async function getRunDischargeCurve(runId: string): Promise<RunDischargeCurve | null> {
  const db = await getDb();
  const [row] = await db
    .select({ analysisId: analysisVersion.id, data: plotSeries.data })
    .from(run)
    .innerJoin(analysisVersion, latestAnalysis)
    .innerJoin(plotSeries, and(eq(plotSeries.analysisId, analysisVersion.id), eq(plotSeries.trace, "capacity_curves")))
    .where(eq(run.id, runId));
  if (!row) return null;
  const cycles = await db
    .select({ cycle: runCycle.cycle, chargedMah: runCycle.chargedMah, dischargedMah: runCycle.dischargedMah, coulombicEfficiency: runCycle.coulombicEfficiency })
    .from(runCycle)
    .where(eq(runCycle.analysisId, row.analysisId));
  return dischargeCurve(capacityCurvesOf(row.data), deliveredCapacity(cycles)?.cycle ?? null);
}

/** What GET /api/runs/:id/discharge-curve sends, and what a page prefetches for first paint. */
export interface DischargeCurvePayload {
  runId: string;
  serial: string;
  createdAt: string;
  /** Null for a run without one (not analysed yet, or no discharge). */
  curve: RunDischargeCurve | null;
}

export async function getDischargeCurvePayload(runId: string): Promise<DischargeCurvePayload | null> {
  const header = await getRunHeader(runId);
  if (!header) return null;
  return { runId: header.id, serial: header.serial, createdAt: header.createdAt.toISOString(), curve: await getRunDischargeCurve(header.id) };
}

/* ---------------------------------- the batch page ---------------------------------- */

export interface BatchNotebook {
  ratedCapacityMah: number;
  rows: BatchCellRow[];
}

/** Every cell of a batch with its figures (unsorted; lib/notebook/batch-rows.ts orders and pages them). */
export async function getBatchCellRows(batchId: string): Promise<BatchNotebook | null> {
  const db = await getDb();
  const [b] = await db
    .select({ ratedCapacityMah: cellType.ratedCapacityMah })
    .from(batch)
    .innerJoin(cellType, eq(cellType.id, batch.cellTypeId))
    .where(eq(batch.id, batchId));
  if (!b) return null;
  const cells = await db.select({ id: cell.id, serial: cell.serial, status: cell.status }).from(cell).where(eq(cell.batchId, batchId)).orderBy(asc(cell.serial));
  const ids = cells.map((c) => c.id);
  const [figures, flags] = await Promise.all([runFiguresOfCells(ids), openFlagCounts(ids)]);
  const runsOf = new Map<string, RunFigureRow[]>();
  for (const f of figures) runsOf.set(f.cellId, [...(runsOf.get(f.cellId) ?? []), f]);
  return {
    ratedCapacityMah: b.ratedCapacityMah,
    rows: cells.map((c) => batchCellRow(c, cellFigures(runsOf.get(c.id) ?? [], b.ratedCapacityMah), flags.get(c.id) ?? 0)),
  };
}
