/**
 * A fixed-size ring of the most recent samples with everything the detectors look back at:
 * raw values, prefix sums for O(1) window means and variances, and the cumulative
 * integrals that turn any later-decided step boundary into exact step totals.
 *
 * Integration (standard trapezoid rule, domain notes): Q_k = Q_{k−1} + ½(I_k + I_{k−1})(t_k − t_{k−1}),
 * mAh = A·s / 3.6, and likewise E = ∫V·I dt with the trapezoid of power. Each interval's two
 * halves are credited to the sample at each end, so every sample "owns" the time from the
 * midpoint before it to the midpoint after it. A step made of samples b..e then owns exactly
 * its samples' shares, step boundaries fall on interval midpoints, and the sum over steps is the
 * trapezoid total of the whole log. Sign splits (charged vs discharged) follow each sample's own
 * current sign. Columns with suffix "cum" hold Σ_{j ≤ k} of the sample's share; a sample's share
 * is complete once the next sample has arrived (or the log has ended).
 */
export const ringSize = 1024;
export const ringMask = ringSize - 1;

export class SampleRing {
  readonly t = new Float64Array(ringSize);
  readonly v = new Float64Array(ringSize);
  readonly i = new Float64Array(ringSize);
  readonly temp = new Float64Array(ringSize);
  readonly line = new Int32Array(ringSize);
  readonly step = new Float64Array(ringSize);
  /** 1 when the interval before this sample was not integrated (a gap). */
  readonly gapBefore = new Uint8Array(ringSize);
  /** Prefix sums over all samples so far (not time weighted): Σi, Σi², Σv. */
  readonly si = new Float64Array(ringSize);
  readonly si2 = new Float64Array(ringSize);
  readonly sv = new Float64Array(ringSize);
  /** Cumulative owned shares, A·s, W·s, s and V·s. */
  readonly qCum = new Float64Array(ringSize);
  readonly qPosCum = new Float64Array(ringSize);
  readonly qNegCum = new Float64Array(ringSize);
  readonly eCum = new Float64Array(ringSize);
  readonly ePosCum = new Float64Array(ringSize);
  readonly eNegCum = new Float64Array(ringSize);
  readonly wCum = new Float64Array(ringSize);
  readonly vwCum = new Float64Array(ringSize);
  /** Number of samples written; the newest has index count − 1. */
  count = 0;
}

/** Cumulative values at one sample, captured when a boundary is decided. */
export interface CumSnapshot {
  q: number;
  qPos: number;
  qNeg: number;
  e: number;
  ePos: number;
  eNeg: number;
  w: number;
  vw: number;
  si: number;
  si2: number;
  sv: number;
}

export function emptySnapshot(): CumSnapshot {
  return { q: 0, qPos: 0, qNeg: 0, e: 0, ePos: 0, eNeg: 0, w: 0, vw: 0, si: 0, si2: 0, sv: 0 };
}

/** Writes the cumulative values after sample `k` (k = −1 gives zeros) into `out`. */
export function snapshotAt(r: SampleRing, k: number, out: CumSnapshot): CumSnapshot {
  if (k < 0) {
    out.q = out.qPos = out.qNeg = out.e = out.ePos = out.eNeg = out.w = out.vw = out.si = out.si2 = out.sv = 0;
    return out;
  }
  const j = k & ringMask;
  out.q = r.qCum[j] ?? 0;
  out.qPos = r.qPosCum[j] ?? 0;
  out.qNeg = r.qNegCum[j] ?? 0;
  out.e = r.eCum[j] ?? 0;
  out.ePos = r.ePosCum[j] ?? 0;
  out.eNeg = r.eNegCum[j] ?? 0;
  out.w = r.wCum[j] ?? 0;
  out.vw = r.vwCum[j] ?? 0;
  out.si = r.si[j] ?? 0;
  out.si2 = r.si2[j] ?? 0;
  out.sv = r.sv[j] ?? 0;
  return out;
}

/** Mean of current over samples a..b (inclusive, both within the ring). */
export function meanCurrent(r: SampleRing, a: number, b: number): number {
  const before = a > 0 ? (r.si[(a - 1) & ringMask] ?? 0) : 0;
  return ((r.si[b & ringMask] ?? 0) - before) / (b - a + 1);
}

/** Mean of voltage over samples a..b (inclusive, both within the ring). */
export function meanVoltage(r: SampleRing, a: number, b: number): number {
  const before = a > 0 ? (r.sv[(a - 1) & ringMask] ?? 0) : 0;
  return ((r.sv[b & ringMask] ?? 0) - before) / (b - a + 1);
}

/** Start of the time a sample owns: the midpoint to its predecessor, or its own time after a gap. */
export function ownedStart(r: SampleRing, k: number): number {
  const j = k & ringMask;
  const t = r.t[j] ?? 0;
  if (k === 0 || r.gapBefore[j] === 1) return t;
  return 0.5 * (t + (r.t[(k - 1) & ringMask] ?? t));
}
