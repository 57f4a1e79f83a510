/**
 * Online segmentation of the sample stream into runs between step edges, with a bounded
 * look-back (the ring). Our own rules (no source), thresholds in thresholds.ts:
 *
 * - A logged step index that changes is always a boundary.
 * - Sharp edge at sample c, decided 3 samples later: the mean of the 3 samples from c differs
 *   from the mean of up to 8 samples before c (within the run) by more than 5σ of the difference
 *   and 5 % of the level; all 3 new samples lie beyond the midpoint of the two levels and the sample
 *   before c does not; and a step explains the window at least twice as well as a straight line
 *   (so a fast CV taper or a slow drift is not an edge). Excursions of 1–2 samples are thereby
 *   ignored as noise; they stay inside the surrounding step and their charge is still counted.
 * - Regime change (rest ↔ charge ↔ discharge) for shifts too small for the sharp test: the
 *   mean of the last 16 samples is a rest level (|I| < restCurrent) and the 32 before are active
 *   (|I| > 1.5·restCurrent), or the reverse, or both active with opposite signs. The boundary is
 *   placed at the split that maximises the two-sample statistic |m₂ − m₁|·√(n₁n₂/(n₁+n₂)).
 * - Inside a charge, a current drop with the voltage held at its plateau is the CC→CV switch
 *   (charge-phase.ts), not an edge; after the switch, further downward steps at the plateau are
 *   the taper continuing.
 */
import type { PartCurve, PartHistogram } from "./plot";
import { SwitchDetector, type SwitchCandidate } from "./charge-phase";
import { emptySnapshot as emptySnapshotBinding, meanCurrent as meanCurrentBinding, meanVoltage as meanVoltageBinding, ownedStart as ownedStartBinding, ringMask, snapshotAt as snapshotAtBinding, type CumSnapshot, type SampleRing } from "./ring";
import { hingeSse as hingeSseBinding } from "./line-fit";
import { edge, regime, voltageBand as voltageBandBinding, type Thresholds } from "./thresholds";

// A module-local copy: imported bindings are property reads through a getter once transpiled.
const MASK = ringMask;
const meanCurrent = meanCurrentBinding;
const meanVoltage = meanVoltageBinding;
const ownedStart = ownedStartBinding;
const snapshotAt = snapshotAtBinding;
const emptySnapshot = emptySnapshotBinding;
const voltageBand = voltageBandBinding;
const hingeSse = hingeSseBinding;
const EDGE = { ...edge };
const REGIME = { ...regime };

export interface RunPart {
  start: number;
  end: number;
  /** Cumulative values after the sample before `start`, and after `end`. */
  base: CumSnapshot;
  last: CumSnapshot;
  tStart: number;
  tEnd: number;
  startLine: number;
  endLine: number;
  vStart: number;
  vEnd: number;
  /** Mean current and voltage of the first (up to) 8 samples. */
  headCurrent: number;
  headVoltage: number;
  /** Mean current of the last (up to) 8 samples. */
  finalCurrent: number;
  tailVoltage: number;
  loggedStep: number;
  /** Set on the two halves of a charge split at the CC→CV switch. */
  hint: "cc" | "cv" | null;
  switchMethod: SwitchCandidate["method"] | null;
  /** Mean voltage over the first 16 samples of a CV part (the plateau). */
  plateauV: number;
  /** Plot material attached by the analyser before classification. */
  curve?: PartCurve;
  hist?: PartHistogram | null;
}

export interface SegmenterListener {
  /** Called with the parts of each finished run, in order. */
  onParts(parts: RunPart[], th: Thresholds): void;
  /** Called when a boundary or switch at `index` has been decided (for exact plot points). */
  onBoundary(index: number, kind: "edge" | "switch"): void;
}

export class Segmenter {
  private runStart = 0;
  private runBase = emptySnapshot();
  private switchAt = -1;
  private switchMethod: SwitchCandidate["method"] | null = null;
  private readonly detector = new SwitchDetector();
  private headCurrent = NaN;
  private headVoltage = NaN;
  private startInfo = { t: 0, line: 0, v: NaN };
  private switchInfo = {
    t: 0,
    line: 0,
    v: NaN,
    head: NaN,
    headV: NaN,
    plateauV: NaN,
    cum: emptySnapshot(),
    // The CC part's tail, captured now because it may leave the ring before the run closes.
    ccEndLine: 0,
    ccEndV: NaN,
    ccTailI: NaN,
    ccTailV: NaN,
  };

  constructor(
    private readonly r: SampleRing,
    private readonly listener: SegmenterListener,
  ) {}

  get currentRunStart(): number {
    return this.runStart;
  }
  get inConstantVoltage(): boolean {
    return this.switchAt >= 0;
  }

  onSample(n: number, th: Thresholds, hasStep: boolean): void {
    const r = this.r;
    if (n === 0) {
      this.startRun(0);
      return;
    }
    if (n - this.runStart === 7) {
      this.headCurrent = meanCurrent(r, this.runStart, n);
      this.headVoltage = meanVoltage(r, this.runStart, n);
    }
    if (hasStep) {
      const a = r.step[(n - 1) & MASK] ?? NaN;
      const b = r.step[n & MASK] ?? NaN;
      if (a === a && b === b && a !== b) {
        this.boundary(n, th);
        return;
      }
    }
    if (this.sharp(n, th)) return;
    // Small regime changes are looked for on every other sample; the split search places them exactly.
    if ((n & 1) === 0 && this.regimeChange(n, th)) return;
    if (this.switchAt < 0) {
      const runMean = ((r.si[n & MASK] ?? 0) - this.runBase.si) / (n - this.runStart + 1);
      if (runMean > th.restCurrent) {
        const s = this.detector.update(r, n, th);
        if (s) this.markSwitch(s.index, s.method, n);
      }
    }
  }

  finish(last: number, th: Thresholds): void {
    if (last < 0) return;
    this.close(last, th, this.r.t[last & MASK] ?? 0);
  }

  private sharp(n: number, th: Thresholds): boolean {
    const r = this.r;
    const m = EDGE.postSamples;
    const c = n - m + 1;
    if (c <= this.runStart) return false;
    const preStart = Math.max(this.runStart, c - EDGE.preSamples);
    const nPre = c - preStart;
    // Window means from prefix sums, written out so no number crosses a call on the hot path.
    const si = r.si;
    const sBefore = preStart > 0 ? (si[(preStart - 1) & MASK] ?? 0) : 0;
    const sMid = si[(c - 1) & MASK] ?? 0;
    const pre = (sMid - sBefore) / nPre;
    const post = ((si[n & MASK] ?? 0) - sMid) / m;
    const d = post - pre;
    const thr = Math.max(EDGE.sigmas * th.sigmaI * Math.sqrt(1 / nPre + 1 / m), EDGE.relative * Math.max(Math.abs(pre), Math.abs(post)), th.floorCurrent);
    if (!(Math.abs(d) > thr)) return false;
    const mid = 0.5 * (pre + post);
    const sgn = d > 0 ? 1 : -1;
    for (let k = c; k <= n; k++) if (sgn * ((r.i[k & MASK] ?? 0) - mid) <= 0) return false;
    if (sgn * ((r.i[(c - 1) & MASK] ?? 0) - mid) >= 0) return false;
    if (nPre >= 3 && !stepBeatsLine(r, preStart, c, n, pre, post)) return false;

    // At the plateau the voltage does not fall across the edge; a step down to a lower constant
    // current drops it by ΔI·R. Compared with the sample just before the edge, since the CC voltage
    // is still rising over the pre window.
    const flat = meanVoltage(r, c, n) >= (r.v[(c - 1) & MASK] ?? 0) - voltageBand(th, 1, m);
    const chargingDown = pre > th.restCurrent && post > th.restCurrent && post < pre;
    if (chargingDown && flat) {
      if (this.switchAt < 0) this.markSwitch(c, "sharp-edge", n);
      return true;
    }
    this.boundary(c, th);
    return true;
  }

  private regimeChange(n: number, th: Thresholds): boolean {
    const r = this.r;
    const postN = REGIME.postSamples;
    const postStart = n - postN + 1;
    const preStart = Math.max(this.runStart, postStart - REGIME.preSamples);
    if (postStart - preStart < 8) return false;
    const si = r.si;
    const sBefore = preStart > 0 ? (si[(preStart - 1) & MASK] ?? 0) : 0;
    const sMid = si[(postStart - 1) & MASK] ?? 0;
    const pre = (sMid - sBefore) / (postStart - preStart);
    const post = ((si[n & MASK] ?? 0) - sMid) / postN;
    const rest = th.restCurrent;
    const act = rest * REGIME.activeFactor;
    const aPre = Math.abs(pre);
    const aPost = Math.abs(post);
    const change = (aPre < rest && aPost > act) || (aPre > act && aPost < rest) || (aPre > act && aPost > act && pre * post < 0);
    if (!change) return false;
    // Best split over the window.
    let best = postStart;
    let bestStat = -1;
    // In a CV phase the change to look for is its end, not the CC level before the switch.
    const lo = Math.max(this.runStart + 1, preStart + 2, this.switchAt + 1);
    for (let k = lo; k <= n - 1; k++) {
      const n1 = k - preStart;
      const n2 = n - k + 1;
      const m1 = meanCurrent(r, preStart, k - 1);
      const m2 = meanCurrent(r, k, n);
      const stat = Math.abs(m2 - m1) * Math.sqrt((n1 * n2) / (n1 + n2));
      if (stat > bestStat) {
        bestStat = stat;
        best = k;
      }
    }
    // A change only a few samples old is left to the sharp-edge test, which places it exactly.
    if (best > n - EDGE.postSamples) return false;
    this.boundary(best, th);
    return true;
  }

  private markSwitch(index: number, method: SwitchCandidate["method"], n: number): void {
    if (index <= this.runStart || index > n) return;
    const r = this.r;
    const j = index & MASK;
    this.switchAt = index;
    this.switchMethod = method;
    const w = this.switchInfo;
    w.t = ownedStart(r, index);
    w.line = r.line[j] ?? 0;
    w.v = r.v[j] ?? NaN;
    w.head = meanCurrent(r, index, Math.min(n, index + 7));
    w.headV = meanVoltage(r, index, Math.min(n, index + 7));
    w.plateauV = n >= index + 15 ? meanVoltage(r, index, index + 15) : NaN;
    snapshotAt(r, index - 1, w.cum);
    const jp = (index - 1) & MASK;
    w.ccEndLine = r.line[jp] ?? 0;
    w.ccEndV = r.v[jp] ?? NaN;
    w.ccTailI = medianCurrent(r, Math.max(this.runStart, index - 9), index - 1);
    w.ccTailV = meanVoltage(r, Math.max(this.runStart, index - 8), index - 1);
    this.listener.onBoundary(index, "switch");
  }

  private boundary(b: number, th: Thresholds): void {
    const r = this.r;
    const j = b & MASK;
    const end = r.gapBefore[j] === 1 ? (r.t[(b - 1) & MASK] ?? 0) : ownedStart(r, b);
    this.close(b - 1, th, end);
    this.startRun(b);
    this.listener.onBoundary(b, "edge");
  }

  private startRun(b: number): void {
    const r = this.r;
    this.runStart = b;
    snapshotAt(r, b - 1, this.runBase);
    this.startInfo.t = ownedStart(r, b);
    this.startInfo.line = r.line[b & MASK] ?? 0;
    this.startInfo.v = r.v[b & MASK] ?? NaN;
    this.switchAt = -1;
    this.switchMethod = null;
    this.detector.reset(b, this.runBase.si);
    this.headCurrent = NaN;
    this.headVoltage = NaN;
  }

  private close(e: number, th: Thresholds, tEnd: number): void {
    const r = this.r;
    const parts: RunPart[] = [];
    const s = this.switchAt;
    const st = this.startInfo;
    if (s > this.runStart && s <= e) {
      const w = this.switchInfo;
      const mid = { ...w.cum };
      const cc = this.part(this.runStart, s - 1, this.runBase, mid, st.t, w.t, st.line, st.v, this.headCurrent, this.headVoltage, "cc", th);
      cc.endLine = w.ccEndLine;
      cc.vEnd = w.ccEndV;
      cc.finalCurrent = w.ccTailI;
      cc.tailVoltage = w.ccTailV;
      parts.push(cc);
      const cv = this.part(s, e, mid, snapshotAt(r, e, emptySnapshot()), w.t, tEnd, w.line, w.v, w.head, w.headV, "cv", th);
      cv.plateauV = w.plateauV === w.plateauV ? w.plateauV : meanVoltage(r, s, Math.min(e, s + 15));
      parts.push(cv);
    } else {
      parts.push(this.part(this.runStart, e, this.runBase, snapshotAt(r, e, emptySnapshot()), st.t, tEnd, st.line, st.v, this.headCurrent, this.headVoltage, null, th));
    }
    this.listener.onParts(parts, th);
  }

  private part(
    a: number,
    b: number,
    base: CumSnapshot,
    last: CumSnapshot,
    tStart: number,
    tEnd: number,
    startLine: number,
    vStart: number,
    head: number,
    headV: number,
    hint: RunPart["hint"],
    th: Thresholds,
  ): RunPart {
    const r = this.r;
    const tailStart = Math.max(a, b - 7);
    // Short parts are still wholly in the ring; long ones had their head captured at the time.
    const short = b - a < 8;
    return {
      start: a,
      end: b,
      base: { ...base },
      last,
      tStart,
      tEnd,
      startLine,
      endLine: r.line[b & MASK] ?? 0,
      vStart,
      vEnd: r.v[b & MASK] ?? NaN,
      headCurrent: short || head !== head ? meanCurrent(r, a, Math.min(b, a + 7)) : head,
      headVoltage: short || headV !== headV ? meanVoltage(r, a, Math.min(b, a + 7)) : headV,
      finalCurrent: finalCurrent(r, a, b, th),
      tailVoltage: meanVoltage(r, tailStart, b),
      loggedStep: r.step[b & MASK] ?? NaN,
      hint,
      switchMethod: hint === "cv" ? this.switchMethod : null,
      plateauV: NaN,
    };
  }
}

const medianScratch = new Float64Array(9);

/**
 * Median current of samples a..b (at most 9): the final current of a step, robust to a sample
 * or two of the next step that a noisy boundary may have left in it.
 */
function medianCurrent(r: SampleRing, a: number, b: number): number {
  const n = Math.min(9, b - a + 1);
  if (n <= 0) return NaN;
  for (let k = 0; k < n; k++) medianScratch[k] = r.i[(b - k) & MASK] ?? 0;
  const m = medianScratch.subarray(0, n);
  m.sort();
  return n % 2 === 1 ? (m[(n - 1) >> 1] ?? NaN) : 0.5 * ((m[n / 2 - 1] ?? 0) + (m[n / 2] ?? 0));
}

/**
 * The current at the end of a step: the median of its last rows — at most 9, and only those in
 * the last 30 s, so a slowly logged CV taper is not read minutes early. Under heavy noise (σ above
 * 2 % of that) the mean of rows 44..5 before the end instead, when they span under a minute:
 * the noisy boundary may be a few rows off and the tail of a CV taper is nearly flat over 40 s.
 */
function finalCurrent(r: SampleRing, a: number, b: number, th: Thresholds): number {
  const tEnd = r.t[b & MASK] ?? 0;
  let m = 1;
  while (m < 9 && b - m >= a && (r.t[(b - m) & MASK] ?? -Infinity) >= tEnd - 30) m++;
  const med = medianCurrent(r, b - m + 1, b);
  if (b - a >= 48 && th.sigmaI > 0.02 * Math.abs(med) && tEnd - (r.t[(b - 44) & MASK] ?? 0) <= 60) return meanCurrent(r, b - 44, b - 5);
  return med;
}

/**
 * True when "a line up to c, then a level" fits samples a..n at least twice as well as one line
 * through all of them: an edge, not a bend of a smooth taper (a CV taper sampled every minute can
 * fall fast, and the edge at its end follows a trend).
 */
function stepBeatsLine(r: SampleRing, a: number, c: number, n: number, _pre: number, post: number): boolean {
  let sseStep = c - a >= 3 ? hingeSse(r, a, c - 1, (r.t[a & MASK] ?? 0) - 1) : 0;
  if (!(sseStep === sseStep)) sseStep = 0;
  for (let k = c; k <= n; k++) {
    const d = (r.i[k & MASK] ?? 0) - post;
    sseStep += d * d;
  }
  const sseLine = hingeSse(r, a, n, (r.t[a & MASK] ?? 0) - 1);
  if (!(sseLine === sseLine)) return true;
  return sseStep < EDGE.stepVersusLine * sseLine;
}
