/**
 * Runs a protocol on the Thevenin model of chen-2006.ts and returns
 *  - the series a logger would have written (sampled at a logging interval, with
 *    optional noise, timing jitter, dropped rows and gaps), and
 *  - the exact ground truth of what the cell did, integrated at a fine internal step.
 *
 * Model (from memory, domain notes): V = Voc(SOC) + R_s·I + V_TS + V_TL,
 * dV_j/dt = I/C_j − V_j/(R_j·C_j), dSOC/dt = I / (3600·Q), current positive while charging.
 * Integration is our own: for each internal step of constant current the RC states are
 * advanced with the exact exponential solution, so the step length only affects how
 * SOC-dependent parameters are tracked. Voltage limits are located by bisection inside
 * the internal step (to ~1e-6 s), and the constant-voltage hold solves each internal step
 * for the current that puts the terminal voltage exactly at the hold voltage at its end.
 */
import type { StepKind } from "@/lib/analysis/types";
import { cellParameters, emptyParameters, openCircuitVoltage, type CellParameters } from "./chen-2006";
import { createPrng } from "./prng";
import { stepKindOf, type PlannedStep } from "./protocol";

export interface ThermalOptions {
  ambient_C: number;
  /** Lumped heat capacity, J/K. Our own round number: about 1 J/(g·K) for a ~40 g cell. */
  heatCapacity_J_per_K: number;
  /** Heat loss to ambient, W/K. */
  conductance_W_per_K: number;
}

export interface SimulationOptions {
  ratedCapacity_mAh?: number;
  /** State of charge at t = 0 (0..1). */
  initialSoc?: number;
  /** Linear capacity fade per cycle as a fraction of rated: Q_n = Q_0·(1 − k·(n − 1)). */
  fadePerCycle?: number;
  logInterval_s?: number;
  /** Standard deviation of Gaussian noise added to logged voltage, V. */
  voltageNoise_V?: number;
  /** Standard deviation of Gaussian noise added to logged current, A. */
  currentNoise_A?: number;
  temperatureNoise_C?: number;
  /** Each logged time is moved by up to ±jitter·interval (uniform); timestamps stay truthful. */
  jitter?: number;
  /** Probability that any row after the first is not written. */
  dropProbability?: number;
  /** Spans in which the logger wrote nothing. */
  gaps?: { start_s: number; duration_s: number }[];
  /** Lumped thermal model; false for a log without a temperature column. */
  thermal?: ThermalOptions | false;
  /** Longest internal step, s; the first seconds of every step use 0.01 s. */
  maxInternalStep_s?: number;
  seed?: number;
}

export type EndReason = "voltage" | "current" | "time";

export interface TruthStep {
  index: number;
  cycle: number;
  kind: StepKind;
  type: PlannedStep["step"]["type"];
  start_s: number;
  end_s: number;
  charged_mAh: number;
  discharged_mAh: number;
  charged_Wh: number;
  discharged_Wh: number;
  startVoltage_V: number;
  endVoltage_V: number;
  /** Current at the very start and end of the step (the CV hold tapers). */
  startCurrent_A: number;
  endCurrent_A: number;
  endedBy: EndReason;
}

export interface TruthCharge {
  start_s: number;
  end_s: number;
  mAh: number;
  Wh: number;
  cc_mAh: number;
  cv_mAh: number;
  /** The constant-current to constant-voltage switch, null when the charge had no CV hold. */
  transition: { time_s: number; voltage_V: number; capacity_mAh: number } | null;
  cvDuration_s: number;
  finalCvCurrent_A: number | null;
  cvEndedBy: EndReason | null;
}

export interface TruthCycle {
  cycle: number;
  capacity_mAh: number;
  charged_mAh: number;
  discharged_mAh: number;
  charged_Wh: number;
  discharged_Wh: number;
  charge: TruthCharge | null;
  discharge: { start_s: number; end_s: number; mAh: number; Wh: number } | null;
}

/** A change between two constant-current steps: what a DC resistance method sees, noise-free. */
export interface TruthCurrentStep {
  time_s: number;
  i1_A: number;
  i2_A: number;
  /** Voltage at the end of the step before the change. */
  u1_V: number;
  /** Voltage at the end of the step after the change. */
  u2_V: number;
  secondDuration_s: number;
  /** (U1 − U2) / (I1 − I2), signed currents; equals the IEC 61960-3 form for two discharge levels. */
  resistance_ohm: number;
}

export interface Truth {
  steps: TruthStep[];
  cycles: TruthCycle[];
  totals: { charged_mAh: number; discharged_mAh: number; charged_Wh: number; discharged_Wh: number };
  currentSteps: TruthCurrentStep[];
  end_s: number;
}

export interface SampledSeries {
  length: number;
  t: Float64Array;
  v: Float64Array;
  i: Float64Array;
  temp: Float64Array | null;
  /** Planned step index of each row (what a cycler writes into a step column). */
  step: Float64Array;
  cycle: Float64Array;
}

export interface SimulationResult {
  samples: SampledSeries;
  truth: Truth;
  ratedCapacity_mAh: number;
}

interface CellState {
  soc: number;
  vShort: number;
  vLong: number;
  temp: number;
}

const defaults = {
  ratedCapacity_mAh: 2000,
  initialSoc: 0.05,
  fadePerCycle: 0,
  logInterval_s: 1,
  voltageNoise_V: 0,
  currentNoise_A: 0,
  temperatureNoise_C: 0,
  jitter: 0,
  dropProbability: 0,
  maxInternalStep_s: 0.5,
  seed: 1,
};

const defaultThermal: ThermalOptions = { ambient_C: 23, heatCapacity_J_per_K: 40, conductance_W_per_K: 0.08 };

class GrowableColumn {
  data = new Float64Array(1024);
  length = 0;
  push(x: number): void {
    if (this.length === this.data.length) {
      const next = new Float64Array(this.data.length * 2);
      next.set(this.data);
      this.data = next;
    }
    this.data[this.length++] = x;
  }
  done(): Float64Array {
    return this.data.slice(0, this.length);
  }
}

export function simulate(plan: PlannedStep[], options: SimulationOptions = {}): SimulationResult {
  const o = { ...defaults, ...options };
  const thermal = options.thermal === false ? null : (options.thermal ?? defaultThermal);
  const rated = o.ratedCapacity_mAh;
  const prng = createPrng(o.seed);
  const p: CellParameters = emptyParameters();
  const state: CellState = { soc: o.initialSoc, vShort: 0, vLong: 0, temp: thermal?.ambient_C ?? 25 };
  const scratch: CellState = { ...state };

  const cols = { t: new GrowableColumn(), v: new GrowableColumn(), i: new GrowableColumn(), temp: new GrowableColumn(), step: new GrowableColumn(), cycle: new GrowableColumn() };
  let sampleNumber = 0;
  let nextSample = 0;
  let capacity_mAh = rated;

  const terminal = (s: CellState, current: number): number => {
    cellParameters(s.soc, capacity_mAh, p);
    return p.voc_V + p.rSeries_ohm * current + s.vShort + s.vLong;
  };
  const advance = (from: CellState, current: number, h: number, to: CellState): void => {
    cellParameters(from.soc, capacity_mAh, p);
    const eS = Math.exp(-h / (p.rShort_ohm * p.cShort_F));
    const eL = Math.exp(-h / (p.rLong_ohm * p.cLong_F));
    const heat = current * current * p.rSeries_ohm + (from.vShort * from.vShort) / p.rShort_ohm + (from.vLong * from.vLong) / p.rLong_ohm;
    to.vShort = from.vShort * eS + current * p.rShort_ohm * (1 - eS);
    to.vLong = from.vLong * eL + current * p.rLong_ohm * (1 - eL);
    to.soc = from.soc + (current * h) / (3.6 * capacity_mAh);
    to.temp = thermal ? from.temp + (h * (heat - thermal.conductance_W_per_K * (from.temp - thermal.ambient_C))) / thermal.heatCapacity_J_per_K : from.temp;
  };
  const cvCurrent = (s: CellState, hold_V: number, h: number): number => {
    cellParameters(s.soc, capacity_mAh, p);
    if (h <= 0) return (hold_V - p.voc_V - s.vShort - s.vLong) / p.rSeries_ohm;
    const eS = Math.exp(-h / (p.rShort_ohm * p.cShort_F));
    const eL = Math.exp(-h / (p.rLong_ohm * p.cLong_F));
    return (hold_V - openCircuitVoltage(s.soc) - s.vShort * eS - s.vLong * eL) / (p.rSeries_ohm + p.rShort_ohm * (1 - eS) + p.rLong_ohm * (1 - eL));
  };
  const copy = (from: CellState, to: CellState): void => {
    to.soc = from.soc;
    to.vShort = from.vShort;
    to.vLong = from.vLong;
    to.temp = from.temp;
  };

  const inGap = (time: number): boolean => (o.gaps ?? []).some((g) => time >= g.start_s && time < g.start_s + g.duration_s);
  const scheduleNext = (): void => {
    sampleNumber += 1;
    const u = o.jitter > 0 ? (prng.next() * 2 - 1) * o.jitter : 0;
    nextSample = (sampleNumber + u) * o.logInterval_s;
  };
  const record = (time: number, current: number, planned: PlannedStep): void => {
    const keep = sampleNumber === 0 || ((o.dropProbability <= 0 || prng.next() >= o.dropProbability) && !inGap(time));
    if (keep) {
      cols.t.push(time);
      cols.v.push(terminal(state, current) + (o.voltageNoise_V > 0 ? o.voltageNoise_V * prng.normal() : 0));
      cols.i.push(current + (o.currentNoise_A > 0 ? o.currentNoise_A * prng.normal() : 0));
      cols.temp.push(state.temp + (o.temperatureNoise_C > 0 ? o.temperatureNoise_C * prng.normal() : 0));
      cols.step.push(planned.index);
      cols.cycle.push(planned.cycle);
    }
    scheduleNext();
  };

  const steps: TruthStep[] = [];
  let t = 0;
  let lastCycle = 0;
  for (const planned of plan) {
    const step = planned.step;
    if (planned.cycle !== lastCycle) {
      capacity_mAh = rated * (1 - o.fadePerCycle * (planned.cycle - 1));
      lastCycle = planned.cycle;
    }
    const start = t;
    const oneC = rated / 1000;
    const fixedCurrent =
      step.type === "rest" ? 0 : step.type === "cc-charge" ? step.cRate * oneC : step.type === "cc-discharge" ? -step.cRate * oneC : step.type === "pulse" ? step.cRate * oneC : NaN;
    const deadline =
      step.type === "rest" || step.type === "pulse" ? start + step.duration_s : step.maxDuration_s !== undefined ? start + step.maxDuration_s : Infinity;
    const activeCurrent = (h: number): number => (step.type === "cv-hold" ? cvCurrent(state, step.voltage_V, h) : fixedCurrent);
    const truth: TruthStep = {
      index: planned.index,
      cycle: planned.cycle,
      kind: stepKindOf(step),
      type: step.type,
      start_s: start,
      end_s: start,
      charged_mAh: 0,
      discharged_mAh: 0,
      charged_Wh: 0,
      discharged_Wh: 0,
      startVoltage_V: terminal(state, activeCurrent(0)),
      endVoltage_V: NaN,
      startCurrent_A: activeCurrent(0),
      endCurrent_A: NaN,
      endedBy: "time",
    };
    let endedBy: EndReason | null = null;
    let lastCurrent = truth.startCurrent_A;
    while (endedBy === null) {
      // A row due exactly at a step boundary belongs to the step that starts there.
      if (t >= deadline - 1e-12) {
        endedBy = "time";
        break;
      }
      if (Math.abs(t - nextSample) < 1e-9 || nextSample < t) record(t, activeCurrent(0), planned);
      const hMax = t - start < 5 ? 0.01 : o.maxInternalStep_s;
      let h = Math.min(hMax, nextSample - t, deadline - t);
      if (h <= 1e-12) h = Math.min(hMax, deadline - t);
      const current = activeCurrent(h);
      if (step.type === "cv-hold" && current <= step.untilCRate * oneC) {
        endedBy = "current";
        break;
      }
      advance(state, current, h, scratch);
      const vStart = terminal(state, current);
      let vEnd = terminal(scratch, current);
      const limit = step.type === "cc-charge" ? step.untilVoltage_V : step.type === "cc-discharge" ? step.untilVoltage_V : NaN;
      const crossed = step.type === "cc-charge" ? vEnd >= limit : step.type === "cc-discharge" ? vEnd <= limit : false;
      if (crossed) {
        let lo = 0;
        let hi = h;
        for (let k = 0; k < 60; k++) {
          const mid = 0.5 * (lo + hi);
          advance(state, current, mid, scratch);
          const vm = terminal(scratch, current);
          const beyond = step.type === "cc-charge" ? vm >= limit : vm <= limit;
          if (beyond) hi = mid;
          else lo = mid;
        }
        h = hi;
        advance(state, current, h, scratch);
        vEnd = terminal(scratch, current);
        endedBy = "voltage";
      }
      const dq = (current * h) / 3.6;
      const de = (current * h * (vStart + vEnd)) / 2 / 3600;
      if (dq >= 0) {
        truth.charged_mAh += dq;
        truth.charged_Wh += de;
      } else {
        truth.discharged_mAh -= dq;
        truth.discharged_Wh -= de;
      }
      copy(scratch, state);
      t += h;
      lastCurrent = current;
    }
    truth.end_s = t;
    truth.endedBy = endedBy;
    // A hold that ends at once (already below its termination current) keeps the last applied current.
    truth.endCurrent_A = step.type === "cv-hold" ? Math.max(0, Math.min(lastCurrent, cvCurrent(state, step.voltage_V, 0))) : lastCurrent;
    truth.endVoltage_V = terminal(state, truth.endCurrent_A);
    steps.push(truth);
  }
  const last = plan[plan.length - 1];
  const lastStep = steps[steps.length - 1];
  if (last && lastStep && (cols.t.length === 0 || (cols.t.data[cols.t.length - 1] ?? 0) < t - 1e-9)) {
    // The logger writes a closing row at the end of the test.
    nextSample = t;
    sampleNumber = Math.max(sampleNumber, 1);
    const saveDrop = o.dropProbability;
    o.dropProbability = 0;
    record(t, lastStep.endCurrent_A, last);
    o.dropProbability = saveDrop;
  }

  const samples: SampledSeries = {
    length: cols.t.length,
    t: cols.t.done(),
    v: cols.v.done(),
    i: cols.i.done(),
    temp: thermal ? cols.temp.done() : null,
    step: cols.step.done(),
    cycle: cols.cycle.done(),
  };
  return { samples, truth: summarise(steps, rated, o.fadePerCycle, t), ratedCapacity_mAh: rated };
}

function summarise(steps: TruthStep[], rated: number, fade: number, end_s: number): Truth {
  const cycles: TruthCycle[] = [];
  const totals = { charged_mAh: 0, discharged_mAh: 0, charged_Wh: 0, discharged_Wh: 0 };
  for (const s of steps) {
    totals.charged_mAh += s.charged_mAh;
    totals.discharged_mAh += s.discharged_mAh;
    totals.charged_Wh += s.charged_Wh;
    totals.discharged_Wh += s.discharged_Wh;
    let c = cycles[cycles.length - 1];
    if (!c || c.cycle !== s.cycle) {
      c = { cycle: s.cycle, capacity_mAh: rated * (1 - fade * (s.cycle - 1)), charged_mAh: 0, discharged_mAh: 0, charged_Wh: 0, discharged_Wh: 0, charge: null, discharge: null };
      cycles.push(c);
    }
    c.charged_mAh += s.charged_mAh;
    c.discharged_mAh += s.discharged_mAh;
    c.charged_Wh += s.charged_Wh;
    c.discharged_Wh += s.discharged_Wh;
    if (s.type === "cc-charge" || s.type === "cv-hold") {
      const ch: TruthCharge = (c.charge ??= {
        start_s: s.start_s,
        end_s: s.end_s,
        mAh: 0,
        Wh: 0,
        cc_mAh: 0,
        cv_mAh: 0,
        transition: null,
        cvDuration_s: 0,
        finalCvCurrent_A: null,
        cvEndedBy: null,
      });
      if (s.type === "cv-hold" && ch.transition === null && ch.cc_mAh > 0) {
        ch.transition = { time_s: s.start_s, voltage_V: s.startVoltage_V, capacity_mAh: ch.mAh };
      }
      ch.end_s = s.end_s;
      ch.mAh += s.charged_mAh;
      ch.Wh += s.charged_Wh;
      if (s.type === "cc-charge") ch.cc_mAh += s.charged_mAh;
      else {
        ch.cv_mAh += s.charged_mAh;
        ch.cvDuration_s += s.end_s - s.start_s;
        ch.finalCvCurrent_A = s.endCurrent_A;
        ch.cvEndedBy = s.endedBy;
      }
    }
    if (s.type === "cc-discharge") {
      const d = (c.discharge ??= { start_s: s.start_s, end_s: s.end_s, mAh: 0, Wh: 0 });
      d.end_s = s.end_s;
      d.mAh += s.discharged_mAh;
      d.Wh += s.discharged_Wh;
    }
  }
  const currentSteps: TruthCurrentStep[] = [];
  for (let k = 1; k < steps.length; k++) {
    const a = steps[k - 1];
    const b = steps[k];
    if (!a || !b || a.type === "cv-hold" || b.type === "cv-hold") continue;
    if (Math.abs(a.endCurrent_A - b.startCurrent_A) < 1e-9) continue;
    currentSteps.push({
      time_s: b.start_s,
      i1_A: a.endCurrent_A,
      i2_A: b.startCurrent_A,
      u1_V: a.endVoltage_V,
      u2_V: b.endVoltage_V,
      secondDuration_s: b.end_s - b.start_s,
      resistance_ohm: (a.endVoltage_V - b.endVoltage_V) / (a.endCurrent_A - b.startCurrent_A),
    });
  }
  return { steps, cycles, totals, currentSteps, end_s };
}
