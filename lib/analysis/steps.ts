/**
 * Turns the segmenter's run parts into classified, merged steps.
 *
 * Kinds (plain words, types.ts): rest, constant-current charge, constant-voltage charge,
 * constant-current discharge, other. Our own classification rules (no source):
 * - rest: |mean current| below the rest threshold (max(σ_I, 0.2 % of 1C));
 * - the two halves of a charge split at the CC→CV switch are a constant-current and a
 *   constant-voltage charge;
 * - constant current: the current's standard deviation over the step is at most
 *   max(2σ_I, 3 % of its mean, floor), and the step lasts at least 30 s and 4 samples;
 *   shorter constant-current pieces (pulses such as the IEC 61960-3 10 s / 1 s sequence) are "other";
 * - a charge that starts at its voltage plateau with a falling current is a constant-voltage charge;
 * - anything else is "other".
 * A piece of fewer than 16 samples whose mean current matches the end of the step before it
 * is absorbed into that step (a boundary set off by noise).
 * Adjacent steps merge when a boundary turns out not to separate different things: two rests,
 * two constant-voltage charges, two "other" steps, or two constant-current steps whose mean
 * currents agree within 5σ of their difference and 2 % — but never across a change of the
 * log's own step index.
 *
 * Per step: duration, charged/discharged mAh and Wh, start/end/mean voltage, mean current.
 * Charge accounting: a charge step's net integral is its charged amount (and a discharge step's
 * its discharged amount), so current noise around a small CV tail does not leak into
 * "discharged"; a rest's net goes to whichever side it falls; "other" steps keep the per-sample
 * sign split, since they may hold charge and discharge pulses.
 */
import type { StepKind } from "./types";
import type { RunPart } from "./segmenter";
import type { PartCurve, PartHistogram } from "./plot";
import type { CumSnapshot } from "./ring";
import { voltageBand, type Thresholds } from "./thresholds";

export interface AnalysedStep {
  /** 1-based, in log order. */
  step: number;
  kind: StepKind;
  /** 1-based cycle (cycles.ts); 0 until cycles are built. */
  cycle: number;
  start_s: number;
  end_s: number;
  duration_s: number;
  first_line: number;
  last_line: number;
  charged_mAh: number;
  discharged_mAh: number;
  charged_Wh: number;
  discharged_Wh: number;
  start_voltage_V: number;
  end_voltage_V: number;
  mean_voltage_V: number;
  mean_current_A: number;
  /** Mean current of the last samples (the final current of a CV charge). */
  end_current_A: number;
  /** The log's own step index, when it has one. */
  logged_step: number | null;
  samples: number;
  /** For a constant-voltage charge: the plateau voltage and how its start was found. */
  plateau_voltage_V: number | null;
  switch_method: "hinge-fit" | "threshold" | "sharp-edge" | null;
}

interface Pending {
  kind: StepKind;
  curves: PartCurve[];
  hists: PartHistogram[];
  first: RunPart;
  lastPart: RunPart;
  base: CumSnapshot;
  last: CumSnapshot;
  samples: number;
}

const minConstantCurrentDuration_s = 30;
const minConstantCurrentSamples = 4;
const fragmentSamples = 16;

export class StepBuilder {
  readonly steps: AnalysedStep[] = [];
  private pending: Pending | null = null;

  constructor(private readonly onStep: (s: AnalysedStep, baseQ: number, curves: PartCurve[], hists: PartHistogram[]) => void = () => {}) {}

  addParts(parts: RunPart[], th: Thresholds): void {
    for (const p of parts) this.add(p, classify(p, th), th);
  }

  finish(): AnalysedStep[] {
    if (this.pending) this.flush(this.pending);
    this.pending = null;
    return this.steps;
  }

  private add(p: RunPart, kind: StepKind, th: Thresholds): void {
    const q = this.pending;
    if (q && q.kind !== kind && isFragmentOf(q, p, th)) {
      // Keep the longer part's end current: the fragment's few samples are noisier.
      q.lastPart = { ...p, finalCurrent: q.lastPart.finalCurrent };
      this.extend(q, p);
      return;
    }
    if (q && mergeable(q, p, kind, th)) {
      q.lastPart = p;
      this.extend(q, p);
      return;
    }
    if (q) this.flush(q);
    this.pending = { kind, curves: [], hists: [], first: p, lastPart: p, base: p.base, last: p.base, samples: 0 };
    this.extend(this.pending, p);
  }

  private extend(q: Pending, p: RunPart): void {
    q.last = p.last;
    q.samples += p.end - p.start + 1;
    if (p.curve) q.curves.push(p.curve);
    if (p.hist) q.hists.push(p.hist);
  }

  private flush(q: Pending): void {
    const s = toStep(q, this.steps.length + 1);
    this.steps.push(s);
    this.onStep(s, q.base.q, q.curves, q.hists);
  }
}

function stats(p: { base: CumSnapshot; last: CumSnapshot }, n: number): { mean: number; std: number } {
  const mean = (p.last.si - p.base.si) / n;
  const v = (p.last.si2 - p.base.si2) / n - mean * mean;
  return { mean, std: Math.sqrt(Math.max(0, v)) };
}

export function classify(p: RunPart, th: Thresholds): StepKind {
  if (p.hint === "cv") return "constant-voltage charge";
  const n = p.end - p.start + 1;
  const { mean, std } = stats(p, n);
  if (Math.abs(mean) < th.restCurrent) return "rest";
  const constant = std <= Math.max(2 * th.sigmaI, 0.03 * Math.abs(mean), th.floorCurrent);
  const long = p.tEnd - p.tStart >= minConstantCurrentDuration_s && n >= minConstantCurrentSamples;
  if (p.hint === "cc") return constant ? "constant-current charge" : "other";
  if (mean > 0) {
    if (constant && long) return "constant-current charge";
    const flat = Math.abs(p.tailVoltage - p.headVoltage) <= voltageBand(th, 8, 8);
    if (long && flat && p.finalCurrent < 0.8 * p.headCurrent) return "constant-voltage charge";
    return "other";
  }
  return constant && long ? "constant-current discharge" : "other";
}

function mergeable(q: Pending, p: RunPart, kind: StepKind, th: Thresholds): boolean {
  if (q.kind !== kind) return false;
  const a = q.lastPart.loggedStep;
  const b = p.loggedStep;
  if (a === a && b === b && a !== b) return false;
  if (kind === "rest" || kind === "other" || kind === "constant-voltage charge") return true;
  const nA = q.samples;
  const nB = p.end - p.start + 1;
  const mA = stats(q, nA).mean;
  const mB = stats(p, nB).mean;
  const tol = Math.max(5 * th.sigmaI * Math.sqrt(1 / nA + 1 / nB), 0.02 * Math.max(Math.abs(mA), Math.abs(mB)), th.floorCurrent);
  return Math.abs(mA - mB) <= tol;
}

/**
 * A piece shorter than 16 samples whose mean current matches the end of the step before it
 * is that step's tail, cut off by a noise-triggered boundary (our own rule).
 */
function isFragmentOf(q: Pending, p: RunPart, th: Thresholds): boolean {
  const n = p.end - p.start + 1;
  if (n >= fragmentSamples) return false;
  const a = q.lastPart.loggedStep;
  const b = p.loggedStep;
  if (a === a && b === b && a !== b) return false;
  const mean = stats(p, n).mean;
  const ref = q.lastPart.finalCurrent;
  const tol = Math.max(5 * th.sigmaI * Math.sqrt(1 / n + 1 / 9), 0.05 * Math.abs(ref), th.floorCurrent);
  return Math.abs(mean - ref) <= tol;
}

function toStep(q: Pending, number: number): AnalysedStep {
  const d = (k: keyof CumSnapshot): number => q.last[k] - q.base[k];
  const netQ = d("q");
  const netE = d("e");
  let chargedAs: number;
  let dischargedAs: number;
  let chargedJ: number;
  let dischargedJ: number;
  if (q.kind === "other") {
    chargedAs = d("qPos");
    dischargedAs = -d("qNeg");
    chargedJ = d("ePos");
    dischargedJ = -d("eNeg");
  } else if (q.kind === "constant-current discharge" || (q.kind === "rest" && netQ < 0)) {
    chargedAs = 0;
    dischargedAs = -netQ;
    chargedJ = 0;
    dischargedJ = -netE;
  } else {
    chargedAs = netQ;
    dischargedAs = 0;
    chargedJ = netE;
    dischargedJ = 0;
  }
  const w = d("w");
  const duration = q.lastPart.tEnd - q.first.tStart;
  const logged = q.lastPart.loggedStep;
  return {
    step: number,
    kind: q.kind,
    cycle: 0,
    start_s: q.first.tStart,
    end_s: q.lastPart.tEnd,
    duration_s: duration,
    first_line: q.first.startLine,
    last_line: q.lastPart.endLine,
    charged_mAh: chargedAs / 3.6,
    discharged_mAh: dischargedAs / 3.6,
    charged_Wh: chargedJ / 3600,
    discharged_Wh: dischargedJ / 3600,
    start_voltage_V: q.first.vStart,
    end_voltage_V: q.lastPart.vEnd,
    mean_voltage_V: w > 0 ? d("vw") / w : q.first.vStart,
    mean_current_A: w > 0 ? netQ / w : q.first.headCurrent,
    end_current_A: q.lastPart.finalCurrent,
    logged_step: logged === logged ? logged : null,
    samples: q.samples,
    plateau_voltage_V: q.kind === "constant-voltage charge" ? (q.first.plateauV === q.first.plateauV ? q.first.plateauV : q.first.headVoltage) : null,
    switch_method: q.kind === "constant-voltage charge" ? q.first.switchMethod : null,
  };
}
