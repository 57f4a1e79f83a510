/**
 * Capacity figures for cells and runs. A run's delivered capacity is the discharge of its last
 * full cycle (a charge, then a discharge): a log that opens with a discharge from an unknown state
 * of charge must not count that first discharge as the cell's capacity. Without any full cycle
 * the last discharge stands in, marked as such.
 */
import { alignTraces, type Aligned } from "./align";

export interface CycleCapacity {
  cycle: number;
  chargedMah: number | null;
  dischargedMah: number | null;
  coulombicEfficiency: number | null;
}

export interface DeliveredCapacity {
  cycle: number;
  mAh: number;
  coulombicEfficiency: number | null;
  /** False when no cycle of the log had a charge before its discharge. */
  afterCharge: boolean;
}

const positive = (v: number | null): v is number => v !== null && Number.isFinite(v) && v > 0;

export function isFullCycle(c: CycleCapacity): boolean {
  return positive(c.chargedMah) && positive(c.dischargedMah);
}

export function deliveredCapacity(cycles: readonly CycleCapacity[]): DeliveredCapacity | null {
  const sorted = [...cycles].sort((a, b) => a.cycle - b.cycle);
  const full = sorted.filter(isFullCycle);
  const pick = full[full.length - 1];
  if (pick) return { cycle: pick.cycle, mAh: pick.dischargedMah as number, coulombicEfficiency: pick.coulombicEfficiency, afterCharge: true };
  const discharges = sorted.filter((c) => positive(c.dischargedMah));
  const last = discharges[discharges.length - 1];
  return last ? { cycle: last.cycle, mAh: last.dischargedMah as number, coulombicEfficiency: null, afterCharge: false } : null;
}

/**
 * State of health against rated capacity, in percent: SOH = 100 · Q_delivered / Q_rated
 * (the capacity definition of SOH, common practice).
 */
export function sohPercent(deliveredMah: number | null | undefined, ratedMah: number | null | undefined): number | null {
  if (deliveredMah === null || deliveredMah === undefined || !ratedMah || !(ratedMah > 0) || !Number.isFinite(deliveredMah)) return null;
  return (100 * deliveredMah) / ratedMah;
}

/** Delivered capacity per full cycle of one run (x: cycle number). */
export function capacityByCycle(cycles: readonly CycleCapacity[]): { x: number[]; y: number[] } {
  const full = [...cycles].filter(isFullCycle).sort((a, b) => a.cycle - b.cycle);
  return { x: full.map((c) => c.cycle), y: full.map((c) => c.dischargedMah as number) };
}

/** Several runs' capacity-per-cycle lines on one chart: one series per run, aligned on the cycle number. */
export function capacityByCycleOfRuns(runs: readonly { label: string; cycles: readonly CycleCapacity[] }[]): Aligned & { labels: string[] } {
  const traces = runs.map((r) => capacityByCycle(r.cycles));
  return { ...alignTraces(traces), labels: runs.map((r) => r.label) };
}

/**
 * Delivered capacity of each run against the time its test ended (stated, else the upload), oldest first; x in UNIX
 * seconds (uPlot's time scale). Runs without a delivered capacity are left out.
 */
export function capacityByDate(runs: readonly { at: string | Date; deliveredMah: number | null }[]): { x: number[]; y: number[] } {
  const points = runs
    .map((r) => ({ t: new Date(r.at).getTime() / 1000, y: r.deliveredMah }))
    .filter((p): p is { t: number; y: number } => Number.isFinite(p.t) && p.y !== null && Number.isFinite(p.y))
    .sort((a, b) => a.t - b.t);
  return { x: points.map((p) => p.t), y: points.map((p) => p.y) };
}
