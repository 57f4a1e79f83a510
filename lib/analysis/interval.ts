/**
 * The typical logging interval (median of recent intervals, robust-scale.ts) and the rule for
 * a logging gap: an interval longer than 5 × the typical one (our own rule, no source; a dropped
 * row or two stays below it).
 */
import { BlockMedian } from "./robust-scale";

export const gapFactor = 5;

export class IntervalScale {
  private readonly med = new BlockMedian();
  /** Adds the interval before sample k of a ring time column. */
  add(t: Float64Array, k: number, mask: number): void {
    const dt = (t[k & mask] ?? 0) - (t[(k - 1) & mask] ?? 0);
    if (dt > 0) this.med.add(dt);
  }
  typical(): number {
    const m = this.med.value();
    return m === m ? m : NaN;
  }
  /** Intervals longer than this are gaps; Infinity until an interval has been seen. */
  gapThreshold(): number {
    const m = this.med.value();
    return m === m && m > 0 ? gapFactor * m : Infinity;
  }
}
