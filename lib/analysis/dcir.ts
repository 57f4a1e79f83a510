/**
 * DC internal resistance from current steps in the log.
 *
 * 1. IEC 61960-3 §7.7 DC method (as summarised in the domain notes, from memory): from a rested
 *    cell, discharge at I1 = 0.2 It for 10 s (U1 measured at its end), then at I2 = 1 It for 1 s
 *    (U2 at its end); R_dc = (U1 − U2) / (I2 − I1). We recognise the sequence as two consecutive
 *    discharge levels: the first 0.17–0.23 It for 8–12 s, the second 0.85–1.15 It for 0.5–1.5 s
 *    (tolerances are ours). Without a rated capacity (It unknown) the ratio I2/I1 must be 4–6.
 *    U1 is the last sample of the first level, U2 the last sample of the second.
 * 2. Step-edge estimate (our own, in the spirit of the pulse methods in the domain notes): at any
 *    sharp current step, R = (V_before − V_after) / (I_before − I_after) with V_before the last
 *    sample before the edge, V_after the first sample after it, I_before the mean of the old level
 *    (up to 8 samples) and I_after the mean of the first (up to 3) samples of the new one. It holds
 *    the ohmic drop plus whatever polarisation builds within the logging interval, so the delay
 *    after the edge is reported with it. Only edges logged at ≤ 5 s intervals are used.
 * A sharp step is a change between consecutive samples larger than max(10·σ_I, 0.1 It) —
 * 0.1 It taken as 10 % of the largest current seen when the rated capacity is unknown.
 */
import { ringMask, type SampleRing } from "./ring";
import type { Thresholds } from "./thresholds";

const MASK = ringMask;

export interface ResistanceResult {
  method: "IEC 61960-3 DC" | "step-edge";
  /** Seconds from the first row: where the current changed. */
  time_s: number;
  resistance_mOhm: number;
  i1_A: number;
  i2_A: number;
  u1_V: number;
  u2_V: number;
  u1_time_s: number;
  u2_time_s: number;
  line: number;
  /** Step-edge only: how long after the edge V_after was taken. */
  delay_s?: number;
}

/** A completed level of current (between two sharp steps). */
interface Level {
  startT: number;
  startLine: number;
  count: number;
  sumI: number;
  lastT: number;
  lastV: number;
}

const maxEdgeResults = 500;
const maxIecResults = 1000;

export class ResistanceFinder {
  readonly iec: ResistanceResult[] = [];
  readonly edges: ResistanceResult[] = [];
  edgeCount = 0;
  // The level being read, kept in flat fields: this runs for every sample.
  private curStartT = 0;
  private curStartLine = 0;
  private curCount = 0;
  private curSumI = 0;
  private curLastT = 0;
  private curLastV = 0;
  private curFirstV = 0;
  private curFirstT = 0;
  private curHeadSum = 0;
  private curHeadCount = 0;
  private readonly prev: Level = { startT: 0, startLine: 0, count: 0, sumI: 0, lastT: 0, lastV: 0 };
  private readonly second: Level = { startT: 0, startLine: 0, count: 0, sumI: 0, lastT: 0, lastV: 0 };
  private havePrev = false;
  private lastI = NaN;
  private maxAbsI = 0;
  /** Step edge waiting for the new level's first samples. */
  private pendingEdge = false;
  private pendingBeforeV = 0;
  private pendingBeforeT = 0;
  private pendingBeforeI = 0;
  private pendingLine = 0;

  constructor(private readonly oneC: number) {}

  onSample(r: SampleRing, n: number, th: Thresholds): void {
    const j = n & MASK;
    const i = r.i[j] ?? 0;
    const ai = i < 0 ? -i : i;
    if (ai > this.maxAbsI) this.maxAbsI = ai;
    const last = this.lastI;
    this.lastI = i;
    if (last === last && this.curCount > 0) {
      const d = i > last ? i - last : last - i;
      const it = this.oneC === this.oneC ? this.oneC : this.maxAbsI;
      if (d > 10 * th.sigmaI && d > 0.1 * it && d > th.floorCurrent) this.closeLevel(r, n);
    }
    const t = r.t[j] ?? 0;
    const v = r.v[j] ?? 0;
    if (this.curCount === 0) {
      this.curStartT = t;
      this.curStartLine = r.line[j] ?? 0;
      this.curFirstV = v;
      this.curFirstT = t;
    }
    this.curCount += 1;
    this.curSumI += i;
    this.curLastT = t;
    this.curLastV = v;
    if (this.curHeadCount < 3) {
      this.curHeadSum += i;
      this.curHeadCount += 1;
      if (this.pendingEdge && this.curHeadCount === 3) this.emitEdge();
    }
  }

  finish(): void {
    if (this.pendingEdge) this.emitEdge();
    if (this.curCount > 0) {
      const c = this.currentAsLevel();
      this.checkIec(c, c.lastT + (c.count > 1 ? (c.lastT - c.startT) / (c.count - 1) : 0));
    }
  }

  private currentAsLevel(): Level {
    const c = this.second;
    c.startT = this.curStartT;
    c.startLine = this.curStartLine;
    c.count = this.curCount;
    c.sumI = this.curSumI;
    c.lastT = this.curLastT;
    c.lastV = this.curLastV;
    return c;
  }

  private closeLevel(r: SampleRing, n: number): void {
    if (this.pendingEdge) this.emitEdge();
    const t = r.t[n & MASK] ?? 0;
    const done = this.currentAsLevel();
    this.checkIec(done, t);
    if (done.count >= 3 && t - done.lastT <= 5) {
      this.pendingEdge = true;
      this.pendingBeforeV = done.lastV;
      this.pendingBeforeT = done.lastT;
      this.pendingBeforeI = done.sumI / done.count;
      this.pendingLine = r.line[n & MASK] ?? 0;
    }
    Object.assign(this.prev, done);
    this.havePrev = true;
    this.curCount = 0;
    this.curSumI = 0;
    this.curHeadSum = 0;
    this.curHeadCount = 0;
  }

  private emitEdge(): void {
    this.pendingEdge = false;
    if (this.curHeadCount === 0) return;
    const iAfter = this.curHeadSum / this.curHeadCount;
    const dI = this.pendingBeforeI - iAfter;
    const res = (this.pendingBeforeV - this.curFirstV) / dI;
    this.edgeCount += 1;
    if (!(res > 0) || this.edges.length >= maxEdgeResults) return;
    const mid = 0.5 * (this.pendingBeforeT + this.curFirstT);
    this.edges.push({
      method: "step-edge",
      time_s: mid,
      resistance_mOhm: res * 1000,
      i1_A: this.pendingBeforeI,
      i2_A: iAfter,
      u1_V: this.pendingBeforeV,
      u2_V: this.curFirstV,
      u1_time_s: this.pendingBeforeT,
      u2_time_s: this.curFirstT,
      line: this.pendingLine,
      delay_s: this.curFirstT - mid,
    });
  }

  /** `second` has just ended at `endT` (the next level's first sample): is it the 1 It part of an IEC sequence? */
  private checkIec(second: Level, endT: number): void {
    const first = this.prev;
    if (!this.havePrev || first.count === 0 || second.count === 0 || this.iec.length >= maxIecResults) return;
    const i1 = first.sumI / first.count;
    const i2 = second.sumI / second.count;
    if (!(i1 < 0 && i2 < 0)) return;
    const d1 = second.startT - first.startT;
    const d2 = endT - second.startT;
    const a1 = -i1;
    const a2 = -i2;
    const it = this.oneC;
    const levelsOk = it === it ? a1 >= 0.17 * it && a1 <= 0.23 * it && a2 >= 0.85 * it && a2 <= 1.15 * it : a2 / a1 >= 4 && a2 / a1 <= 6;
    if (!levelsOk || d1 < 8 || d1 > 12 || d2 < 0.5 || d2 > 1.5) return;
    this.iec.push({
      method: "IEC 61960-3 DC",
      time_s: second.startT,
      resistance_mOhm: ((first.lastV - second.lastV) / (a2 - a1)) * 1000,
      i1_A: a1,
      i2_A: a2,
      u1_V: first.lastV,
      u2_V: second.lastV,
      u1_time_s: first.lastT,
      u2_time_s: second.lastT,
      line: second.startLine,
    });
  }
}
