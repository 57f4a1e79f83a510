/**
 * Cycles from steps. Convention (ours, stated for users):
 * a cycle is a charge followed by its discharge. A new cycle opens at the first charge step
 * (constant-current or constant-voltage charge) that comes after a discharge; everything up to
 * that point — rests, pulses, the discharge — belongs to the cycle before. A log that starts
 * with a discharge therefore starts with a cycle that has no charge.
 * A "discharge" here is a constant-current discharge, or an "other" step that removes at least
 * 10 % of the rated capacity (a dynamic discharge profile).
 *
 * Coulombic efficiency CE = Q_discharge / Q_charge of the same cycle (domain notes), counting
 * every step of the cycle; energy efficiency likewise with Wh. Both are null when the cycle
 * lacks a charge or a discharge.
 */
import type { AnalysedStep } from "./steps";

export type CvEnd = "termination-current" | "cut-short" | "unknown";

export interface ChargeSummary {
  start_s: number;
  end_s: number;
  duration_s: number;
  mAh: number;
  Wh: number;
  cc: { mAh: number; Wh: number; duration_s: number; current_A: number } | null;
  cv: {
    mAh: number;
    Wh: number;
    duration_s: number;
    voltage_V: number;
    final_current_A: number;
    /** Final current as a fraction of 1C (e.g. 0.05) and as "C/x", when the rated capacity is known. */
    final_current_C: number | null;
    final_current_label: string | null;
    ended_by: CvEnd;
    termination_current_A: number | null;
  } | null;
  transition: { time_s: number; voltage_V: number; capacity_mAh: number; method: string } | null;
  /** CC share of the charge, 0..1. */
  cc_share: number | null;
}

export interface DischargeSummary {
  start_s: number;
  end_s: number;
  duration_s: number;
  mAh: number;
  Wh: number;
  /** Wh / Ah of the discharge, V. */
  mean_voltage_V: number | null;
  current_A: number;
}

export interface AnalysedCycle {
  cycle: number;
  start_s: number;
  end_s: number;
  duration_s: number;
  start_voltage_V: number;
  end_voltage_V: number;
  /** Time-weighted over the cycle's steps. */
  mean_voltage_V: number;
  /** Net charge over the cycle's duration (positive when it charged more than it discharged). */
  mean_current_A: number;
  first_step: number;
  last_step: number;
  charged_mAh: number;
  discharged_mAh: number;
  charged_Wh: number;
  discharged_Wh: number;
  charge: ChargeSummary | null;
  discharge: DischargeSummary | null;
  coulombic_efficiency: number | null;
  energy_efficiency: number | null;
}

export interface CycleOptions {
  /** 1C in A, NaN when unknown. */
  oneC: number;
  /** Termination current, A; NaN when unknown. */
  terminationCurrent: number;
  /** Allowance on the termination current for current noise, A. */
  noiseAllowance: number;
}

const isCharge = (s: AnalysedStep): boolean => s.kind === "constant-current charge" || s.kind === "constant-voltage charge";

export function buildCycles(steps: AnalysedStep[], o: CycleOptions): AnalysedCycle[] {
  const groups: AnalysedStep[][] = [];
  let group: AnalysedStep[] = [];
  let sawDischarge = false;
  const bigDischarge = (s: AnalysedStep): boolean => {
    if (s.kind === "constant-current discharge") return true;
    if (s.kind !== "other") return false;
    const ref = o.oneC === o.oneC ? o.oneC * 1000 : group.reduce((a, x) => a + x.charged_mAh, 0);
    return s.discharged_mAh - s.charged_mAh >= 0.1 * ref && ref > 0;
  };
  for (const s of steps) {
    if (isCharge(s) && sawDischarge) {
      groups.push(group);
      group = [];
      sawDischarge = false;
    }
    if (bigDischarge(s)) sawDischarge = true;
    group.push(s);
  }
  if (group.length > 0) groups.push(group);
  return groups.map((g, k) => summarise(g, k + 1, o));
}

function summarise(g: AnalysedStep[], cycle: number, o: CycleOptions): AnalysedCycle {
  for (const s of g) s.cycle = cycle;
  const first = g[0] as AnalysedStep;
  const last = g[g.length - 1] as AnalysedStep;
  const sum = (f: (s: AnalysedStep) => number, filter: (s: AnalysedStep) => boolean = () => true): number =>
    g.filter(filter).reduce((a, s) => a + f(s), 0);
  const charged = sum((s) => s.charged_mAh);
  const discharged = sum((s) => s.discharged_mAh);
  const chargedWh = sum((s) => s.charged_Wh);
  const dischargedWh = sum((s) => s.discharged_Wh);
  const charge = chargeSummary(g.filter(isCharge), o);
  const dis = g.filter((s) => s.kind === "constant-current discharge" || (s.kind === "other" && s.discharged_mAh > s.charged_mAh && s.discharged_mAh > 0.1 * Math.max(charged, 1e-9)));
  let discharge: DischargeSummary | null = null;
  const d0 = dis[0];
  const d1 = dis[dis.length - 1];
  if (d0 && d1) {
    const mAh = dis.reduce((a, s) => a + s.discharged_mAh, 0);
    const Wh = dis.reduce((a, s) => a + s.discharged_Wh, 0);
    const dur = dis.reduce((a, s) => a + s.duration_s, 0);
    discharge = {
      start_s: d0.start_s,
      end_s: d1.end_s,
      duration_s: d1.end_s - d0.start_s,
      mAh,
      Wh,
      mean_voltage_V: mAh > 0 ? (Wh * 1000) / mAh : null,
      current_A: dur > 0 ? -(mAh * 3.6) / dur : 0,
    };
  }
  const hasBoth = charge !== null && discharge !== null && charged > 0;
  const duration = last.end_s - first.start_s;
  const weighted = sum((s) => s.mean_voltage_V * s.duration_s);
  const timed = sum((s) => s.duration_s);
  return {
    cycle,
    start_s: first.start_s,
    end_s: last.end_s,
    duration_s: duration,
    start_voltage_V: first.start_voltage_V,
    end_voltage_V: last.end_voltage_V,
    mean_voltage_V: timed > 0 ? weighted / timed : first.mean_voltage_V,
    mean_current_A: duration > 0 ? ((charged - discharged) * 3.6) / duration : 0,
    first_step: first.step,
    last_step: last.step,
    charged_mAh: charged,
    discharged_mAh: discharged,
    charged_Wh: chargedWh,
    discharged_Wh: dischargedWh,
    charge,
    discharge,
    coulombic_efficiency: hasBoth ? discharged / charged : null,
    energy_efficiency: hasBoth && chargedWh > 0 ? dischargedWh / chargedWh : null,
  };
}

function chargeSummary(cs: AnalysedStep[], o: CycleOptions): ChargeSummary | null {
  const c0 = cs[0];
  const c1 = cs[cs.length - 1];
  if (!c0 || !c1) return null;
  const cc = cs.filter((s) => s.kind === "constant-current charge");
  const cv = cs.filter((s) => s.kind === "constant-voltage charge");
  const mAh = cs.reduce((a, s) => a + s.charged_mAh, 0);
  const Wh = cs.reduce((a, s) => a + s.charged_Wh, 0);
  const ccMAh = cc.reduce((a, s) => a + s.charged_mAh, 0);
  let transition: ChargeSummary["transition"] = null;
  let before = 0;
  for (let k = 0; k < cs.length; k++) {
    const s = cs[k] as AnalysedStep;
    const prev = cs[k - 1];
    if (s.kind === "constant-voltage charge" && prev?.kind === "constant-current charge" && transition === null) {
      transition = { time_s: s.start_s, voltage_V: s.plateau_voltage_V ?? s.start_voltage_V, capacity_mAh: before, method: s.switch_method ?? "step-kind" };
    }
    before += s.charged_mAh;
  }
  const cvLast = cv[cv.length - 1];
  const cvFirst = cv[0];
  let cvSummary: ChargeSummary["cv"] = null;
  if (cvLast && cvFirst) {
    const final = cvLast.end_current_A;
    const term = o.terminationCurrent;
    const endedBy: CvEnd = term === term ? (final <= term * 1.1 + o.noiseAllowance ? "termination-current" : "cut-short") : "unknown";
    const frac = o.oneC === o.oneC && o.oneC > 0 ? final / o.oneC : null;
    cvSummary = {
      mAh: cv.reduce((a, s) => a + s.charged_mAh, 0),
      Wh: cv.reduce((a, s) => a + s.charged_Wh, 0),
      duration_s: cv.reduce((a, s) => a + s.duration_s, 0),
      voltage_V: cvFirst.plateau_voltage_V ?? cvFirst.mean_voltage_V,
      final_current_A: final,
      final_current_C: frac,
      final_current_label: frac !== null && frac > 0 ? `C/${formatDivisor(1 / frac)}` : null,
      ended_by: endedBy,
      termination_current_A: term === term ? term : null,
    };
  }
  const ccDur = cc.reduce((a, s) => a + s.duration_s, 0);
  return {
    start_s: c0.start_s,
    end_s: c1.end_s,
    duration_s: c1.end_s - c0.start_s,
    mAh,
    Wh,
    cc: cc.length > 0 ? { mAh: ccMAh, Wh: cc.reduce((a, s) => a + s.charged_Wh, 0), duration_s: ccDur, current_A: ccDur > 0 ? (ccMAh * 3.6) / ccDur : 0 } : null,
    cv: cvSummary,
    transition,
    cc_share: mAh > 0 ? ccMAh / mAh : null,
  };
}

function formatDivisor(x: number): string {
  return x >= 10 ? String(Math.round(x)) : String(Math.round(x * 10) / 10);
}
