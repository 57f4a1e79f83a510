/**
 * The typical logging interval (median of recent intervals, robust-scale.ts) and the rule for
 * a logging gap: an interval longer than 5 × the typical one (our own rule, no source; a dropped
 * row or two stays below it).
 */
import { BlockMedian } from "./robust-scale";

export const gapFactor = 5;

export class IntervalScale {
  private readonly med = new BlockMedian();
  /** Intervals longer than this are gaps; Infinity until an interval has been seen. Kept as a field so the per-sample read boxes nothing. */
  threshold = Infinity;
  private seenVersion = -1;

  /** Adds the interval before sample k of a ring time column. */
  add(t: Float64Array, k: number, mask: number): void {
    this.med.addPositiveDifference(t, k, mask);
    const version = this.med.version;
    if (version !== this.seenVersion) {
      this.seenVersion = version;
      const m = this.med.value();
      this.threshold = m === m && m > 0 ? gapFactor * m : Infinity;
    }
  }

  typical(): number {
    const m = this.med.value();
    return m === m ? m : NaN;
  }
}
