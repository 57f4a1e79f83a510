/**
 * Plot series for the run page (JSON-serialisable, ≤ 2,000 points per trace):
 * - voltage, current and temperature against time (decimate.ts), with the samples on both sides
 *   of every step edge and of every CC→CV switch kept exactly;
 * - voltage against capacity for each constant-current and constant-voltage step;
 * - dQ/dV of constant-current steps: incremental capacity analysis as recommended by Dubarry &
 *   Anseán, "Best practices for incremental capacity analysis", Front. Energy Res. 10 (2022)
 *   1023555 — constant-current segments only (low rates give the clearest peaks, so the C-rate is
 *   reported with each curve), a uniform voltage grid, then smoothing. Our implementation: the
 *   charge each sample owns (ring.ts) is added to the 5 mV bin of its voltage, which is the
 *   finite-difference ΔQ/ΔV on that grid; the result is smoothed with a Gaussian of σ = 2 bins
 *   (10 mV), truncated at ±3σ (bin width and kernel are our choices within the 5–10 mV the notes give).
 * Memory is bounded: fixed decimation buffers, at most 1,024 candidate points and one 1,000-bin
 * histogram for the run being read, and curves for at most 400 steps: the first 100, the last 100,
 * and up to 200 evenly spaced through the middle (every step while they fit; then every 2nd,
 * every 4th, … so a long cycle-life log still shows how the curves change over its whole life).
 */
import { MinMaxDecimator, reduceWithExact } from "./decimate";
import { ringMask, type SampleRing } from "./ring";
import type { StepKind } from "./types";

export const pointsPerTrace = 2000;
const maxEdgePoints = 600;
const maxSwitchPoints = 200;
const runCurveCapacity = 1024;
const curvePointsPerStep = 400;
const keptCurvesEachEnd = 100;
const keptCurvesInMiddle = 200;
/** Middle curves show the trend across life; half the points keep the page's payload near what the two ends alone cost. */
const middleCurvePoints = 200;
export const dqdvBin_V = 0.005;
const histBins = 1000;
const smoothSigmaBins = 2;

const MASK = ringMask;

export interface XYTrace {
  x: number[];
  y: number[];
}

export interface StepCurve {
  step: number;
  cycle: number;
  kind: StepKind;
  capacity_mAh: number[];
  voltage_V: number[];
}

export interface IncrementalCapacityCurve {
  step: number;
  cycle: number;
  kind: StepKind;
  /** |mean current| / 1C, null without a rated capacity. */
  c_rate: number | null;
  voltage_V: number[];
  dQdV_mAh_per_V: number[];
}

export interface PlotSeries {
  /** x: seconds from the first row. */
  voltage: XYTrace;
  current: XYTrace;
  temperature: XYTrace | null;
  step_edges: { time_s: number; step: number; kind: StepKind }[];
  switch_points: { time_s: number; voltage_V: number; cycle: number }[];
  capacity_curves: StepCurve[];
  incremental_capacity: IncrementalCapacityCurve[];
  settings: { points_per_trace: number; dqdv_bin_V: number; dqdv_smoothing: string; decimation: string };
}

/** Curve and histogram material gathered for one run part (before classification). */
export interface PartCurve {
  /** Absolute cumulative charge, A·s (rebased per step later). */
  q: number[];
  v: number[];
}
export interface PartHistogram {
  firstBin: number;
  /** Charge per bin, A·s (signed). */
  values: Float64Array;
}

/** Thins a list of pinned points by doubling a stride, so its length stays bounded. */
class PinnedPoints {
  readonly t: number[] = [];
  readonly v: number[] = [];
  readonly i: number[] = [];
  readonly temp: number[] = [];
  private stride = 1;
  private seen = 0;
  constructor(private readonly max: number) {}
  add(r: SampleRing, a: number, b: number): void {
    if (this.seen++ % this.stride !== 0) return;
    for (let k = a; k <= b; k++) {
      const j = k & MASK;
      this.t.push(r.t[j] ?? 0);
      this.v.push(r.v[j] ?? 0);
      this.i.push(r.i[j] ?? 0);
      this.temp.push(r.temp[j] ?? NaN);
    }
    if (this.t.length > this.max) {
      // Keep every other pair.
      const keep = (arr: number[]): number[] => arr.filter((_, idx) => Math.floor(idx / 2) % 2 === 0);
      const nt = keep(this.t);
      this.t.length = 0;
      this.t.push(...nt);
      for (const arr of [this.v, this.i, this.temp]) {
        const kept = keep(arr);
        arr.length = 0;
        arr.push(...kept);
      }
      this.stride *= 2;
    }
  }
  pairs(y: number[]): [number, number][] {
    const out: [number, number][] = [];
    for (let k = 0; k < this.t.length; k++) {
      const yy = y[k] ?? NaN;
      if (yy === yy) out.push([this.t[k] ?? 0, yy]);
    }
    return out;
  }
}

/**
 * Gathers, with a lag, the samples of the run being segmented: a thinned V–Q curve and the
 * dQ/dV histogram of its constant-current part.
 */
export class RunCollector {
  private q = new Float64Array(runCurveCapacity);
  private v = new Float64Array(runCurveCapacity);
  private idx = new Float64Array(runCurveCapacity);
  private n = 0;
  private stride = 1;
  private countdown = 0;
  private readonly hist = new Float64Array(histBins);
  private histLo = histBins;
  private histHi = -1;
  private runStart = 0;
  private switchAt = -1;
  fed = -1;

  constructor(private readonly r: SampleRing) {}

  /** Feeds sample k (k > fed) of the current run. */
  feed(k: number): void {
    const r = this.r;
    const j = k & MASK;
    this.fed = k;
    const q = r.qCum[j] ?? 0;
    const v = r.v[j] ?? 0;
    if (--this.countdown <= 0) {
      this.countdown = this.stride;
      if (this.n === runCurveCapacity) this.halve();
      this.q[this.n] = q;
      this.v[this.n] = v;
      this.idx[this.n] = k;
      this.n++;
    }
    if (this.switchAt < 0 || k < this.switchAt) this.addHist(k, 1);
  }

  private halve(): void {
    {
      let w = 0;
      for (let s = 0; s < this.n; s += 2) {
        this.q[w] = this.q[s] ?? 0;
        this.v[w] = this.v[s] ?? 0;
        this.idx[w] = this.idx[s] ?? 0;
        w++;
      }
      this.n = w;
      this.stride *= 2;
    }
  }

  private addHist(k: number, sign: number): void {
    const r = this.r;
    const j = k & MASK;
    const own = (r.qCum[j] ?? 0) - (k > 0 ? (r.qCum[(k - 1) & MASK] ?? 0) : 0);
    const bin = Math.floor((r.v[j] ?? 0) / dqdvBin_V);
    if (bin < 0 || bin >= histBins) return;
    this.hist[bin] = (this.hist[bin] ?? 0) + sign * own;
    if (bin < this.histLo) this.histLo = bin;
    if (bin > this.histHi) this.histHi = bin;
  }

  onSwitch(s: number): void {
    this.switchAt = s;
    // Samples of the CV part already counted in the histogram come out again.
    for (let k = s; k <= this.fed; k++) this.addHist(k, -1);
  }

  /** Ends the current run at `end` and returns what belongs to each part; starts the next run. */
  closeRun(end: number, splits: { start: number; end: number; cv: boolean }[]): { curve: PartCurve; hist: PartHistogram | null }[] {
    for (let k = this.fed + 1; k <= end; k++) this.feed(k);
    const overshoot = this.fed > end ? this.fed : -1;
    const out = splits.map((p) => {
      const curve: PartCurve = { q: [], v: [] };
      for (let m = 0; m < this.n; m++) {
        const k = this.idx[m] ?? 0;
        if (k >= p.start && k <= p.end) {
          curve.q.push(this.q[m] ?? 0);
          curve.v.push(this.v[m] ?? 0);
        }
      }
      // The part's exact last sample.
      const j = p.end & MASK;
      if (this.r.count - 1 - p.end < MASK) {
        curve.q.push(this.r.qCum[j] ?? 0);
        curve.v.push(this.r.v[j] ?? 0);
      }
      let hist: PartHistogram | null = null;
      if (!p.cv && this.histHi >= this.histLo) hist = { firstBin: this.histLo, values: this.hist.slice(this.histLo, this.histHi + 1) };
      return { curve, hist };
    });
    this.reset(end + 1);
    if (overshoot >= 0) for (let k = end + 1; k <= overshoot; k++) this.feed(k);
    return out;
  }

  private reset(start: number): void {
    this.runStart = start;
    this.n = 0;
    this.stride = 1;
    this.countdown = 0;
    this.switchAt = -1;
    if (this.histHi >= this.histLo) this.hist.fill(0, this.histLo, this.histHi + 1);
    this.histLo = histBins;
    this.histHi = -1;
    this.fed = start - 1;
  }

  get start(): number {
    return this.runStart;
  }
}

interface StoredCurves {
  capacity: StepCurve | null;
  ica: IncrementalCapacityCurve | null;
}

/** Collects the per-step curves of the whole log: the first and last 100 steps that have one, and a thinned middle. */
export class PlotCollector {
  private readonly vTrace = new MinMaxDecimator();
  private readonly iTrace = new MinMaxDecimator();
  private readonly tTrace = new MinMaxDecimator();
  private readonly edges = new PinnedPoints(maxEdgePoints);
  private readonly switches = new PinnedPoints(maxSwitchPoints);
  private readonly first: StoredCurves[] = [];
  private readonly last: StoredCurves[] = [];
  private middle: StoredCurves[] = [];
  /** Keep every `middleStride`-th step that leaves the last-100 window; doubles whenever the middle is full. */
  private middleStride = 1;
  private middleSeen = 0;
  private hasTemp = false;

  constructor(private readonly oneC: number) {}

  onSample(r: SampleRing, n: number): void {
    const j = n & MASK;
    this.vTrace.addAt(r.t, r.v, j);
    this.iTrace.addAt(r.t, r.i, j);
    const temp = r.temp[j] ?? NaN;
    if (temp === temp) {
      this.hasTemp = true;
      this.tTrace.addAt(r.t, r.temp, j);
    }
  }

  onBoundary(r: SampleRing, index: number, kind: "edge" | "switch"): void {
    if (index < 1) return;
    (kind === "edge" ? this.edges : this.switches).add(r, index - 1, index);
  }

  onStep(step: { step: number; kind: StepKind; mean_current_A: number }, baseQ: number, curves: PartCurve[], hists: PartHistogram[]): void {
    const kind = step.kind;
    if (kind === "rest" || kind === "other") return;
    const q: number[] = [];
    const v: number[] = [];
    for (const c of curves) {
      for (let k = 0; k < c.q.length; k++) {
        q.push(Math.abs((c.q[k] ?? 0) - baseQ) / 3.6);
        v.push(c.v[k] ?? 0);
      }
    }
    const capacity: StepCurve = { step: step.step, cycle: 0, kind, ...thinCurve(q, v, curvePointsPerStep) };
    let ica: IncrementalCapacityCurve | null = null;
    if ((kind === "constant-current charge" || kind === "constant-current discharge") && hists.length > 0) {
      ica = incrementalCapacity(hists, step.step, kind, this.oneC === this.oneC ? Math.abs(step.mean_current_A) / this.oneC : null);
    }
    const stored: StoredCurves = { capacity, ica };
    if (this.first.length < keptCurvesEachEnd) this.first.push(stored);
    else {
      this.last.push(stored);
      const leaving = this.last.length > keptCurvesEachEnd ? this.last.shift() : undefined;
      if (leaving) this.keepInMiddle(leaving);
    }
  }

  private keepInMiddle(stored: StoredCurves): void {
    const seen = this.middleSeen++;
    if (seen % this.middleStride !== 0) return;
    const capacity = stored.capacity ? { ...stored.capacity, ...thinCurve(stored.capacity.capacity_mAh, stored.capacity.voltage_V, middleCurvePoints) } : null;
    this.middle.push({ ...stored, capacity });
    if (this.middle.length > keptCurvesInMiddle) {
      // The kept ones are the multiples of the stride; every other one of them is a multiple of twice it.
      this.middle = this.middle.filter((_, k) => k % 2 === 0);
      this.middleStride *= 2;
    }
  }

  build(steps: { step: number; cycle: number; kind: StepKind; start_s: number }[], switchCycles: { time_s: number; voltage_V: number; cycle: number }[]): PlotSeries {
    const cycleOfStep = new Map<number, number>();
    for (const s of steps) cycleOfStep.set(s.step, s.cycle);
    const stored = [...this.first, ...this.middle, ...this.last];
    const capacity_curves: StepCurve[] = [];
    const incremental_capacity: IncrementalCapacityCurve[] = [];
    for (const s of stored) {
      if (s.capacity) capacity_curves.push({ ...s.capacity, cycle: cycleOfStep.get(s.capacity.step) ?? 0 });
      if (s.ica) incremental_capacity.push({ ...s.ica, cycle: cycleOfStep.get(s.ica.step) ?? 0 });
    }
    const exactV = [...this.edges.pairs(this.edges.v), ...this.switches.pairs(this.switches.v)];
    const exactI = [...this.edges.pairs(this.edges.i), ...this.switches.pairs(this.switches.i)];
    const exactT = [...this.edges.pairs(this.edges.temp), ...this.switches.pairs(this.switches.temp)];
    return {
      voltage: reduceWithExact(this.vTrace.points(), exactV, pointsPerTrace),
      current: reduceWithExact(this.iTrace.points(), exactI, pointsPerTrace),
      temperature: this.hasTemp ? reduceWithExact(this.tTrace.points(), exactT, pointsPerTrace) : null,
      step_edges: steps.slice(0, 5000).map((s) => ({ time_s: s.start_s, step: s.step, kind: s.kind })),
      switch_points: switchCycles,
      capacity_curves,
      incremental_capacity,
      settings: {
        points_per_trace: pointsPerTrace,
        dqdv_bin_V: dqdvBin_V,
        dqdv_smoothing: `Gaussian, sigma ${smoothSigmaBins} bins`,
        decimation: "min/max buckets, then Largest-Triangle-Three-Buckets (Steinarsson 2013); step edges and switch points exact",
      },
    };
  }
}

function thinCurve(q: number[], v: number[], max: number): { capacity_mAh: number[]; voltage_V: number[] } {
  if (q.length <= max) return { capacity_mAh: q, voltage_V: v };
  const pts: [number, number][] = q.map((x, k) => [x, v[k] ?? 0]);
  const reduced = reduceWithExact(pts.slice(0, -1), pts.slice(-1), max);
  return { capacity_mAh: reduced.x, voltage_V: reduced.y };
}

/** Sums the part histograms, converts to dQ/dV in mAh/V and smooths with a Gaussian kernel. */
export function incrementalCapacity(hists: PartHistogram[], step: number, kind: StepKind, cRate: number | null): IncrementalCapacityCurve {
  let lo = Infinity;
  let hi = -Infinity;
  for (const h of hists) {
    lo = Math.min(lo, h.firstBin);
    hi = Math.max(hi, h.firstBin + h.values.length - 1);
  }
  const n = hi - lo + 1;
  const raw = new Float64Array(n);
  for (const h of hists) for (let k = 0; k < h.values.length; k++) raw[h.firstBin - lo + k] = (raw[h.firstBin - lo + k] ?? 0) + (h.values[k] ?? 0);
  const half = 3 * smoothSigmaBins;
  const weights: number[] = [];
  for (let d = -half; d <= half; d++) weights.push(Math.exp(-(d * d) / (2 * smoothSigmaBins * smoothSigmaBins)));
  const voltage_V: number[] = [];
  const dQdV_mAh_per_V: number[] = [];
  for (let k = 0; k < n; k++) {
    let acc = 0;
    let wsum = 0;
    for (let d = -half; d <= half; d++) {
      const m = k + d;
      if (m < 0 || m >= n) continue;
      const w = weights[d + half] ?? 0;
      acc += w * (raw[m] ?? 0);
      wsum += w;
    }
    voltage_V.push((lo + k + 0.5) * dqdvBin_V);
    dQdV_mAh_per_V.push(Math.abs(acc / wsum) / 3.6 / dqdvBin_V);
  }
  return { step, cycle: 0, kind, c_rate: cRate, voltage_V, dQdV_mAh_per_V };
}
