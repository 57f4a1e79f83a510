/**
 * Voltage against capacity, and dQ/dV, shaped for the charts. The engine stores one curve per
 * step with the capacity counted from that step's start; a charge is a constant-current step
 * followed by a constant-voltage one, so the charge curve of a cycle joins them end to end.
 */
import { alignTraces, type Aligned, type Trace } from "./align";
import type { CapacityCurve, IcaCurve } from "./plot-series";

const isCharge = (c: { kind: string }) => c.kind === "constant-current charge" || c.kind === "constant-voltage charge";
const isDischarge = (c: { kind: string }) => c.kind === "constant-current discharge";

/** The cycles that have a stored curve, ascending. */
export function curveCycles(curves: readonly { cycle: number }[]): number[] {
  return [...new Set(curves.map((c) => c.cycle))].sort((a, b) => a - b);
}

export interface JoinedCurve {
  capacity_mAh: number[];
  voltage_V: number[];
  /** Where the constant-voltage part starts (the CC→CV switch), when the charge has one. */
  switchAt: { capacity_mAh: number; voltage_V: number } | null;
}

function finitePairs(c: CapacityCurve): { q: number[]; v: number[] } {
  const q: number[] = [];
  const v: number[] = [];
  const n = Math.min(c.capacity_mAh.length, c.voltage_V.length);
  for (let k = 0; k < n; k++) {
    const x = c.capacity_mAh[k];
    const y = c.voltage_V[k];
    if (typeof x === "number" && typeof y === "number" && Number.isFinite(x) && Number.isFinite(y)) {
      q.push(x);
      v.push(y);
    }
  }
  return { q, v };
}

/**
 * The charge curve of one cycle: its charge steps in step order, each shifted by the capacity the
 * steps before it reached, so the CV part continues where the CC part ended (capacities add:
 * Q = Q_CC + Q_CV). Null when the cycle has no charge curve.
 */
export function chargeCurve(curves: readonly CapacityCurve[], cycle: number): JoinedCurve | null {
  const parts = curves.filter((c) => c.cycle === cycle && isCharge(c)).sort((a, b) => a.step - b.step);
  if (parts.length === 0) return null;
  const out: JoinedCurve = { capacity_mAh: [], voltage_V: [], switchAt: null };
  let offset = 0;
  for (const part of parts) {
    const { q, v } = finitePairs(part);
    if (q.length === 0) continue;
    if (part.kind === "constant-voltage charge" && out.switchAt === null && out.capacity_mAh.length > 0) {
      out.switchAt = { capacity_mAh: offset, voltage_V: out.voltage_V[out.voltage_V.length - 1] as number };
    }
    for (let k = 0; k < q.length; k++) {
      out.capacity_mAh.push(offset + (q[k] as number));
      out.voltage_V.push(v[k] as number);
    }
    offset += q[q.length - 1] as number;
  }
  return out.capacity_mAh.length > 0 ? out : null;
}

/**
 * The discharge curve of a cycle: its constant-current discharge step, the one that delivered the
 * most when a cycle holds several (a short pulse beside the full discharge). With `cycle` null,
 * the last cycle that has one.
 */
export function dischargeCurve(curves: readonly CapacityCurve[], cycle: number | null): { capacity_mAh: number[]; voltage_V: number[]; cycle: number } | null {
  const candidates = curves.filter((c) => isDischarge(c) && (cycle === null || c.cycle === cycle));
  if (candidates.length === 0) return null;
  const targetCycle = cycle ?? Math.max(...candidates.map((c) => c.cycle));
  let best: { q: number[]; v: number[] } | null = null;
  for (const c of candidates.filter((x) => x.cycle === targetCycle)) {
    const pairs = finitePairs(c);
    const reach = pairs.q[pairs.q.length - 1] ?? -Infinity;
    const bestReach = best?.q[best.q.length - 1] ?? -Infinity;
    if (reach > bestReach) best = pairs;
  }
  return best && best.q.length > 0 ? { capacity_mAh: best.q, voltage_V: best.v, cycle: targetCycle } : null;
}

export interface LabelledTrace extends Trace {
  label: string;
}

/** Several curves on one chart: aligned onto the union of their x, with their labels kept in order. */
export function overlay(traces: readonly LabelledTrace[]): Aligned & { labels: string[] } {
  return { ...alignTraces(traces), labels: traces.map((t) => t.label) };
}

/** The dQ/dV curves of one cycle's constant-current steps, in step order, with a label that states the C-rate (peaks depend on it). */
export function icaCurvesOfCycle(curves: readonly IcaCurve[], cycle: number): LabelledTrace[] {
  return curves
    .filter((c) => c.cycle === cycle)
    .sort((a, b) => a.step - b.step)
    .map((c) => ({
      label: `${c.kind === "constant-current charge" ? "Charge" : "Discharge"}, step ${c.step}${c.c_rate !== null ? ` at ${c.c_rate.toFixed(2)}C` : ""}`,
      x: c.voltage_V.map((v) => v ?? NaN),
      y: c.dQdV_mAh_per_V,
    }));
}
