import "server-only";
import { and, asc, eq, inArray, sql } from "drizzle-orm";
import type { DangerFinding, DcirInput, RunInput } from "@/lib/health/measurements";

export type { DangerFinding };
import { getDb, type Executor } from "../client";
import { analysisVersion, batch, cell, cellType, run, runCycle, runFinding } from "../schema";
import { runEndedAt } from "./run-views";

/** What the fade pages and the flag rules read of a cell's analysed runs: the latest analysis of each complete run. */

const latestAnalysis = and(eq(analysisVersion.runId, run.id), eq(analysisVersion.version, run.latestVersion));

export interface CellRuns {
  runs: RunInput[];
  dangers: DangerFinding[];
}

function dcirOf(value: unknown): DcirInput[] {
  if (!Array.isArray(value)) return [];
  const out: DcirInput[] = [];
  for (const item of value) {
    if (!item || typeof item !== "object") continue;
    const { method, resistance_mOhm } = item as Record<string, unknown>;
    if (typeof method === "string" && typeof resistance_mOhm === "number") out.push({ method, resistance_mOhm });
  }
  return out;
}

/** Every analysed run of the given cells, grouped by cell id (cells without runs are absent). */
export async function loadCellRuns(cellIds: readonly string[], exec?: Executor): Promise<Map<string, CellRuns>> {
  const out = new Map<string, CellRuns>();
  if (cellIds.length === 0) return out;
  const db = exec ?? (await getDb());
  const runs = await db
    .select({
      runId: run.id,
      cellId: run.cellId,
      purpose: run.purpose,
      endedAt: runEndedAt,
      analysisId: analysisVersion.id,
      durationS: sql<number | null>`(${analysisVersion.report}->'totals'->>'duration_s')::double precision`,
      dcir: sql<unknown>`${analysisVersion.report}->'dcir'`,
    })
    .from(run)
    .innerJoin(analysisVersion, latestAnalysis)
    .where(and(inArray(run.cellId, [...cellIds]), eq(run.status, "complete")))
    .orderBy(runEndedAt, asc(run.id));
  if (runs.length === 0) return out;
  const analysisIds = runs.map((r) => r.analysisId);
  const [cycles, dangers] = await Promise.all([
    db
      .select({
        analysisId: runCycle.analysisId,
        cycle: runCycle.cycle,
        chargedMah: runCycle.chargedMah,
        dischargedMah: runCycle.dischargedMah,
        coulombicEfficiency: runCycle.coulombicEfficiency,
        dischargeEndS: sql<number | null>`(${runCycle.detail}->'discharge'->>'end_s')::double precision`,
      })
      .from(runCycle)
      .where(inArray(runCycle.analysisId, analysisIds))
      .orderBy(asc(runCycle.cycle)),
    db
      .select({
        analysisId: runFinding.analysisId,
        kind: runFinding.kind,
        message: runFinding.message,
        caution: runFinding.caution,
        timeS: runFinding.timeS,
        value: runFinding.value,
        limitValue: runFinding.limitValue,
        unit: runFinding.unit,
      })
      .from(runFinding)
      .where(and(inArray(runFinding.analysisId, analysisIds), eq(runFinding.severity, "danger")))
      .orderBy(asc(runFinding.timeS)),
  ]);
  const cyclesBy = new Map<string, RunInput["cycles"]>();
  for (const { analysisId, ...c } of cycles) {
    const list = cyclesBy.get(analysisId) ?? [];
    list.push(c);
    cyclesBy.set(analysisId, list);
  }
  const runOfAnalysis = new Map(runs.map((r) => [r.analysisId, r]));
  for (const r of runs) {
    const entry = out.get(r.cellId) ?? { runs: [], dangers: [] };
    entry.runs.push({
      runId: r.runId,
      analysisId: r.analysisId,
      purpose: r.purpose,
      endedAt: r.endedAt,
      durationS: r.durationS === null ? null : Number(r.durationS),
      cycles: cyclesBy.get(r.analysisId) ?? [],
      dcir: dcirOf(r.dcir),
    });
    out.set(r.cellId, entry);
  }
  for (const d of dangers) {
    const owner = runOfAnalysis.get(d.analysisId);
    if (!owner) continue;
    out.get(owner.cellId)?.dangers.push({ ...d, runId: owner.runId });
  }
  return out;
}

export interface CellIdentity {
  id: string;
  serial: string;
  status: "active" | "flagged" | "retired";
  batchId: string | null;
  lotCode: string | null;
  ratedCapacityMah: number;
}

export async function cellIdentities(where: { cellIds?: readonly string[]; batchId?: string }, exec?: Executor): Promise<CellIdentity[]> {
  const db = exec ?? (await getDb());
  if (where.cellIds && where.cellIds.length === 0) return [];
  const filter = where.batchId ? eq(cell.batchId, where.batchId) : where.cellIds ? inArray(cell.id, [...where.cellIds]) : undefined;
  return db
    .select({
      id: cell.id,
      serial: cell.serial,
      status: cell.status,
      batchId: cell.batchId,
      lotCode: batch.lotCode,
      ratedCapacityMah: cellType.ratedCapacityMah,
    })
    .from(cell)
    .innerJoin(cellType, eq(cellType.id, cell.cellTypeId))
    .leftJoin(batch, eq(batch.id, cell.batchId))
    .where(filter)
    .orderBy(asc(cell.serial));
}

export async function cellOfRun(runId: string): Promise<string | null> {
  const db = await getDb();
  const [row] = await db.select({ cellId: run.cellId }).from(run).where(eq(run.id, runId));
  return row?.cellId ?? null;
}
