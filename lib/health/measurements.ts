/**
 * A cell's measurements across all its runs, from the rows the ingest stores: capacity points on
 * one cycle axis, per-run DC resistance and per-run coulombic efficiency. Pure (no database), so
 * pages, flag rules and tests share it.
 *
 * Conventions (ours, shown on the health page):
 * - Runs are taken in the order their tests ended (as the uploader stated, else the upload
 *   time). A cycle is the analysis engine's: a charge and the discharge
 *   after it. A cycle with both is a full cycle; the cell's cycle count advances by one for each
 *   full cycle of every run, whatever the run's purpose, because every cycle ages the cell.
 * - Capacity points come from "capacity check" runs (one point: the last full cycle, the
 *   measurement after the declared charge, IEC 61960-3 §7.3.1) and "cycle life" runs (every full
 *   cycle). A discharge without a charge before it starts from an unknown state and is no point.
 * - A point's date is the test's end less the time from the cycle's discharge end to the end of
 *   the log; without a stated end, the upload is taken as the end of the test.
 * - DC resistance per run: the median of the IEC 61960-3 two-current results when the run has
 *   any, else of the step-edge estimates (the two methods measure different things and are never
 *   mixed in one comparison).
 */
import type { CapacityPoint } from "@/lib/stats";

export interface RunCycleInput {
  cycle: number;
  chargedMah: number | null;
  dischargedMah: number | null;
  coulombicEfficiency: number | null;
  /** Seconds from the log's first row at which the cycle's discharge ended. */
  dischargeEndS: number | null;
}

export interface DcirInput {
  method: string;
  resistance_mOhm: number;
}

export interface RunInput {
  runId: string;
  analysisId: string;
  purpose: string;
  /** When the test ended: as the uploader stated it, else the upload time. Dates and order follow it. */
  endedAt: Date;
  durationS: number | null;
  cycles: RunCycleInput[];
  dcir: DcirInput[];
}

/** A finding of severity danger in a run's latest analysis. */
export interface DangerFinding {
  analysisId: string;
  runId: string;
  kind: string;
  message: string;
  caution: string;
  timeS: number;
  value: number | null;
  limitValue: number | null;
  unit: string | null;
}

export interface CellCapacityPoint extends CapacityPoint {
  cycle: number;
  date: string;
  runId: string;
  analysisId: string;
}

export type DcirMethod = "IEC 61960-3 DC" | "step-edge";

export interface RunResistance {
  runId: string;
  analysisId: string;
  at: string;
  method: DcirMethod;
  median_mOhm: number;
  n: number;
}

export interface RunEfficiency {
  runId: string;
  analysisId: string;
  at: string;
  purpose: string;
  /** Lowest per-cycle coulombic efficiency of the run (1 = 100 %). */
  min: number;
  /** Cycle that had it. */
  cycle: number;
  cycles: number;
}

export interface CellMeasurements {
  capacity: CellCapacityPoint[];
  resistance: RunResistance[];
  efficiency: RunEfficiency[];
  /** Full cycles counted over every run. */
  totalCycles: number;
}

const capacityPurposes = new Set(["capacity check", "cycle life"]);

const isFull = (c: RunCycleInput): c is RunCycleInput & { chargedMah: number; dischargedMah: number } =>
  c.chargedMah !== null && c.dischargedMah !== null && c.dischargedMah > 0;

export function median(values: readonly number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? (sorted[mid] as number) : ((sorted[mid - 1] as number) + (sorted[mid] as number)) / 2;
}

function pointDate(run: RunInput, cycle: RunCycleInput): string {
  const end = run.endedAt.getTime();
  if (run.durationS === null || cycle.dischargeEndS === null) return run.endedAt.toISOString();
  const before = Math.max(0, run.durationS - cycle.dischargeEndS);
  return new Date(end - before * 1000).toISOString();
}

function runResistance(run: RunInput): RunResistance | null {
  const usable = run.dcir.filter((d) => Number.isFinite(d.resistance_mOhm) && d.resistance_mOhm > 0);
  const iec = usable.filter((d) => d.method === "IEC 61960-3 DC");
  const edges = usable.filter((d) => d.method === "step-edge");
  const [method, values]: [DcirMethod, DcirInput[]] = iec.length ? ["IEC 61960-3 DC", iec] : ["step-edge", edges];
  if (values.length === 0) return null;
  return {
    runId: run.runId,
    analysisId: run.analysisId,
    at: run.endedAt.toISOString(),
    method,
    median_mOhm: median(values.map((d) => d.resistance_mOhm)),
    n: values.length,
  };
}

function runEfficiency(run: RunInput): RunEfficiency | null {
  let worst: RunCycleInput | null = null;
  let counted = 0;
  for (const c of run.cycles) {
    if (c.coulombicEfficiency === null || !Number.isFinite(c.coulombicEfficiency)) continue;
    counted++;
    if (!worst || c.coulombicEfficiency < (worst.coulombicEfficiency as number)) worst = c;
  }
  if (!worst) return null;
  return {
    runId: run.runId,
    analysisId: run.analysisId,
    at: run.endedAt.toISOString(),
    purpose: run.purpose,
    min: worst.coulombicEfficiency as number,
    cycle: worst.cycle,
    cycles: counted,
  };
}

/** Builds a cell's measurements from its analysed runs (any order; they are sorted by when their tests ended). */
export function cellMeasurements(runs: readonly RunInput[]): CellMeasurements {
  const ordered = [...runs].sort((a, b) => a.endedAt.getTime() - b.endedAt.getTime() || a.runId.localeCompare(b.runId));
  const capacity: CellCapacityPoint[] = [];
  const resistance: RunResistance[] = [];
  const efficiency: RunEfficiency[] = [];
  let offset = 0;
  for (const run of ordered) {
    const full = [...run.cycles].sort((a, b) => a.cycle - b.cycle).filter(isFull);
    const point = (c: (typeof full)[number], i: number): CellCapacityPoint => ({
      cycle: offset + i + 1,
      date: pointDate(run, c),
      capacity_mAh: c.dischargedMah,
      runId: run.runId,
      analysisId: run.analysisId,
    });
    if (run.purpose === "capacity check" && full.length > 0) {
      capacity.push(point(full[full.length - 1] as (typeof full)[number], full.length - 1));
    } else if (capacityPurposes.has(run.purpose)) {
      full.forEach((c, i) => capacity.push(point(c, i)));
    }
    offset += full.length;
    const r = runResistance(run);
    if (r) resistance.push(r);
    const e = runEfficiency(run);
    if (e) efficiency.push(e);
  }
  return { capacity, resistance, efficiency, totalCycles: offset };
}

/** The rise of the latest resistance over the first one measured by the same method, or null. */
export function resistanceRise(resistance: readonly RunResistance[]): { first: RunResistance; latest: RunResistance; risePct: number } | null {
  const latest = resistance[resistance.length - 1];
  if (!latest) return null;
  const first = resistance.find((r) => r.method === latest.method);
  if (!first || first === latest) return null;
  return { first, latest, risePct: (latest.median_mOhm / first.median_mOhm - 1) * 100 };
}
