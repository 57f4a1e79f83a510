/**
 * The streaming analyser: push SampleBatches in file order, then finish.
 * Memory is bounded: a 1,024-sample ring for look-back, O(steps) records, fixed-size plot buffers.
 * Work per sample is O(1) and allocation-free.
 */
import { buildCycles, type AnalysedCycle } from "./cycles";
import { ResistanceFinder, type ResistanceResult } from "./dcir";
import { PlotCollector, RunCollector } from "./plot";
import { SafetyMonitor } from "./safety";
import { GapLog } from "./gaps";
import { IntervalScale } from "./interval";
import { NoiseScale } from "./robust-scale";
import { meanCurrent as meanCurrentBinding, ringMask, SampleRing } from "./ring";
import { Segmenter } from "./segmenter";
import { StepBuilder, type AnalysedStep } from "./steps";
import { edge, type Thresholds } from "./thresholds";
import type { CellLimits, Detection, Finding, SampleBatch } from "./types";

// A module-local copy: imported bindings are property reads through a getter once transpiled.
const MASK = ringMask;
const meanCurrent = meanCurrentBinding;
const EDGE = { ...edge };

/** What the analyser needs from the reader's summary (structurally the reader's ReadSummary). */
export interface ReadSummaryInput {
  detection: Detection | null;
  findings: Finding[];
  rows: number;
  bytes: number;
  path: string;
}

export interface AnalyzerCore {
  steps: AnalysedStep[];
  cycles: AnalysedCycle[];
  samples: number;
  skipped: number;
  thresholds: Thresholds;
  typicalInterval_s: number;
  gaps: GapLog;
  temperature: { start_C: number; max_C: number; min_C: number; max_at_s: number } | null;
  duration_s: number;
  safety: Finding[];
  resistance: { iec: ResistanceResult[]; edges: ResistanceResult[]; edgeCount: number };
  plot: PlotCollector;
}

/** The segmenter works this many samples behind the newest one. */
const segmenterLag = 32;
/** Plot material is gathered this many samples behind the newest, after boundaries are decided. */
const plotLag = 256;

export class StreamingAnalyzer {
  readonly ring = new SampleRing();
  private readonly noiseI = new NoiseScale(MASK);
  private readonly noiseV = new NoiseScale(MASK);
  private readonly interval = new IntervalScale();
  readonly gapLog = new GapLog();
  readonly th: Thresholds;
  private readonly stepBuilder: StepBuilder;
  private readonly segmenter: Segmenter;
  private readonly oneC: number;
  private maxAbsI = 0;
  private skipped = 0;
  private hasStep = false;
  private finished = false;
  // Running cumulative shares and the pending (left-half) share of the newest sample.
  private cQ = 0;
  private cQp = 0;
  private cQn = 0;
  private cE = 0;
  private cEp = 0;
  private cEn = 0;
  private cW = 0;
  private cVW = 0;
  private pendI = 0;
  private pendW = 0;
  private shareV = 0;
  private shareQ = 0;
  private shareW = 0;
  private tempStart = NaN;
  private tempMax = -Infinity;
  private tempMin = Infinity;
  private tempMaxAt = 0;
  private tempSeen = false;

  private readonly plot: PlotCollector;
  private readonly collector: RunCollector;
  private readonly safety: SafetyMonitor;
  private readonly resistance: ResistanceFinder;

  constructor(readonly limits: CellLimits) {
    const rated = limits.ratedCapacity_mAh;
    this.oneC = rated !== undefined && rated > 0 ? rated / 1000 : NaN;
    this.th = { sigmaI: 0, sigmaV: 0, restCurrent: 0, floorCurrent: 0, oneC: this.oneC };
    this.plot = new PlotCollector(this.oneC);
    this.collector = new RunCollector(this.ring);
    this.safety = new SafetyMonitor(limits);
    this.resistance = new ResistanceFinder(this.oneC);
    this.stepBuilder = new StepBuilder((s, baseQ, curves, hists) => this.plot.onStep(s, baseQ, curves, hists));
    this.segmenter = new Segmenter(this.ring, {
      onParts: (parts, th) => {
        const last = parts[parts.length - 1];
        if (last) {
          const material = this.collector.closeRun(
            last.end,
            parts.map((p) => ({ start: p.start, end: p.end, cv: p.hint === "cv" })),
          );
          parts.forEach((p, k) => {
            p.curve = material[k]?.curve;
            p.hist = material[k]?.hist ?? null;
          });
        }
        this.stepBuilder.addParts(parts, th);
      },
      onBoundary: (index, kind) => {
        this.plot.onBoundary(this.ring, index, kind);
        if (kind === "switch") this.collector.onSwitch(index);
      },
    });
  }

  get count(): number {
    return this.ring.count;
  }

  push(b: SampleBatch): void {
    if (this.finished) throw new Error("analyser already finished");
    const r = this.ring;
    const th = this.th;
    const bt = b.t;
    const bv = b.v;
    const bi = b.i;
    const btemp = b.temp;
    const bstep = b.step;
    if (bstep) this.hasStep = true;
    for (let k = 0; k < b.length; k++) {
      const t = bt[k] ?? NaN;
      const v = bv[k] ?? NaN;
      const i = bi[k] ?? NaN;
      if (!(t === t && v === v && i === i)) {
        this.skipped += 1;
        continue;
      }
      const n = r.count;
      const j = n & MASK;
      const jp = (n - 1) & MASK;
      r.t[j] = t;
      r.v[j] = v;
      r.i[j] = i;
      r.line[j] = b.line[k] ?? 0;
      const temp = btemp ? (btemp[k] ?? NaN) : NaN;
      r.temp[j] = temp;
      r.step[j] = bstep ? (bstep[k] ?? NaN) : NaN;
      r.gapBefore[j] = 0;
      if (n > 0) {
        r.si[j] = (r.si[jp] ?? 0) + i;
        r.si2[j] = (r.si2[jp] ?? 0) + i * i;
        r.sv[j] = (r.sv[jp] ?? 0) + v;
      } else {
        r.si[j] = i;
        r.si2[j] = i * i;
        r.sv[j] = v;
      }
      r.count = n + 1;

      const ai = i < 0 ? -i : i;
      if (ai > this.maxAbsI) this.maxAbsI = ai;
      // Noise is estimated from every 4th pair of samples; thresholds follow every 64 samples.
      if (n > 0 && (n < 256 || (n & 3) === 0)) {
        this.noiseI.add(r.i, n);
        this.noiseV.add(r.v, n);
      }
      if (n < 256 || (n & 63) === 0) {
        th.sigmaI = this.noiseI.sigma();
        th.sigmaV = this.noiseV.sigma();
        th.floorCurrent = 0.002 * (this.oneC === this.oneC ? this.oneC : this.maxAbsI);
        // 1 µA keeps a perfectly clean all-rest log a rest before any current has been seen.
        th.restCurrent = Math.max(th.sigmaI, th.floorCurrent, 1e-6);
      }

      if (n > 0) this.integrate(n);

      if (temp === temp) {
        if (!this.tempSeen) {
          this.tempSeen = true;
          this.tempStart = temp;
        }
        if (temp > this.tempMax) {
          this.tempMax = temp;
          this.tempMaxAt = t;
        }
        if (temp < this.tempMin) this.tempMin = temp;
      }

      // The segmenter runs segmenterLag samples behind, so its thresholds rest on a noise
      // estimate that already covers the start of the log.
      if (n >= segmenterLag) this.segmenter.onSample(n - segmenterLag, th, this.hasStep);

      if ((n & 63) === 0) {
        const typical = this.interval.typical();
        this.safety.mergeGap = typical === typical ? Math.max(10, 5 * typical) : 10;
      }
      this.safety.onSample(r, n, th);
      this.resistance.onSample(r, n, th);
      this.plot.onSample(r, n);
      const lagged = n - plotLag;
      const collector = this.collector;
      if (lagged > collector.fed && lagged >= collector.start) {
        for (let k = collector.fed + 1; k <= lagged; k++) collector.feed(k);
      }
    }
  }

  /** Integrates the interval (n−1, n) and completes sample n−1's cumulative shares. */
  private integrate(n: number): void {
    const r = this.ring;
    const th = this.th;
    const j = n & MASK;
    const jp = (n - 1) & MASK;
    const t = r.t[j] ?? 0;
    const v = r.v[j] ?? 0;
    const i = r.i[j] ?? 0;
    const tp = r.t[jp] ?? t;
    const vp = r.v[jp] ?? v;
    let ip = r.i[jp] ?? i;
    let dt = t - tp;
    if (dt < 0) dt = 0;
    if ((n & 3) === 0 || n < 256) this.interval.add(r.t, n, MASK);
    let iNew = i;
    let integrated = true;
    if (dt > this.interval.threshold) {
      const runStart = this.segmenter.currentRunStart;
      const from = Math.max(runStart, n - 8);
      const level = from <= n - 1 ? meanCurrent(r, from, n - 1) : ip;
      const tol = Math.max(EDGE.sigmas * th.sigmaI * Math.sqrt(1 + 1 / 8), EDGE.relative * Math.abs(level), th.floorCurrent);
      // The segmenter runs behind, so also check that the window before the gap is one level.
      let oneLevel = true;
      for (let k = from; k <= n - 1; k++) if (Math.abs((r.i[k & MASK] ?? 0) - level) > tol) oneLevel = false;
      const sa = r.step[jp] ?? NaN;
      const sb = r.step[j] ?? NaN;
      const sameStep = !(sa === sa && sb === sb && sa !== sb);
      integrated = sameStep && oneLevel && Math.abs(level) > th.restCurrent && Math.abs(i - level) <= tol;
      const restToRest = Math.abs(ip) <= th.restCurrent * 3 && Math.abs(i) <= th.restCurrent * 3;
      const quiet = restToRest && Math.abs(v - vp) < Math.max(5 * th.sigmaV, 0.01);
      this.gapLog.add({ start_s: tp, end_s: t, line: r.line[j] ?? 0, integrated, quietRest: quiet });
      if (integrated) {
        ip = level;
        iNew = level;
      } else {
        r.gapBefore[j] = 1;
      }
    }
    const half = integrated ? 0.5 * dt : 0;
    // Complete sample n−1: its pending left half plus its right half now.
    this.shareV = vp;
    this.shareQ = ip * half;
    this.shareW = half;
    this.applyShare();
    this.storeCumulative(jp);
    this.pendI = iNew * half;
    this.pendW = half;
  }

  private storeCumulative(j: number): void {
    const r = this.ring;
    r.qCum[j] = this.cQ;
    r.qPosCum[j] = this.cQp;
    r.qNegCum[j] = this.cQn;
    r.eCum[j] = this.cE;
    r.ePosCum[j] = this.cEp;
    r.eNegCum[j] = this.cEn;
    r.wCum[j] = this.cW;
    r.vwCum[j] = this.cVW;
  }

  /**
   * Completes the newest-but-one sample's share: its pending left half plus the right half now
   * known (charge `rightQ` over `rightW` seconds), at voltage `v`. Values are kept in fields, not
   * passed, where this runs per sample, so nothing is boxed.
   */
  private addShare(v: number, rightQ: number, rightW: number): void {
    this.shareV = v;
    this.shareQ = rightQ;
    this.shareW = rightW;
    this.applyShare();
  }

  private applyShare(): void {
    const q = this.pendI + this.shareQ;
    const w = this.pendW + this.shareW;
    const v = this.shareV;
    const e = v * q;
    this.cQ += q;
    if (q >= 0) {
      this.cQp += q;
      this.cEp += e;
    } else {
      this.cQn += q;
      this.cEn += e;
    }
    this.cE += e;
    this.cW += w;
    this.cVW += v * w;
  }

  finish(): AnalyzerCore {
    const r = this.ring;
    const last = r.count - 1;
    if (!this.finished && last >= 0) {
      const j = last & MASK;
      this.addShare(r.v[j] ?? 0, 0, 0);
      this.storeCumulative(j);
      for (let k = Math.max(0, last - segmenterLag + 1); k <= last; k++) this.segmenter.onSample(k, this.th, this.hasStep);
      this.segmenter.finish(last, this.th);
    }
    this.finished = true;
    const steps = this.stepBuilder.finish();
    this.resistance.finish();
    const termC = this.limits.terminationC;
    const cycles = buildCycles(steps, {
      oneC: this.oneC,
      terminationCurrent: termC !== undefined && this.oneC === this.oneC ? termC * this.oneC : NaN,
      noiseAllowance: (3 * this.th.sigmaI) / Math.sqrt(8),
    });
    return {
      steps,
      cycles,
      samples: r.count,
      skipped: this.skipped,
      thresholds: { ...this.th },
      typicalInterval_s: this.interval.typical(),
      gaps: this.gapLog,
      temperature: this.tempSeen ? { start_C: this.tempStart, max_C: this.tempMax, min_C: this.tempMin, max_at_s: this.tempMaxAt } : null,
      duration_s: last >= 0 ? (r.t[last & MASK] ?? 0) : 0,
      safety: this.safety.finish(),
      resistance: { iec: this.resistance.iec, edges: this.resistance.edges, edgeCount: this.resistance.edgeCount },
      plot: this.plot,
    };
  }
}
