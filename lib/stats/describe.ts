/**
 * Descriptive statistics of a sample, from simple-statistics: mean, sample standard deviation
 * (n − 1 divisor), coefficient of variation, extremes, quartiles and per-value z-scores.
 */
import { max, mean, min, quantileSorted, sampleStandardDeviation, zScore } from "simple-statistics";

export interface SampleSummary {
  n: number;
  mean: number;
  /** Sample standard deviation (divisor n − 1); null with one value. */
  sd: number | null;
  /** 100·sd/mean; null when sd is null or the mean is zero. */
  cv_pct: number | null;
  min: number;
  max: number;
  /** Quartiles by simple-statistics `quantile`: linear interpolation, R's and NumPy's default (type 7). */
  q1: number;
  median: number;
  q3: number;
}

export function assertFinite(values: readonly number[], what = "values"): void {
  for (const v of values) if (!Number.isFinite(v)) throw new RangeError(`${what} must be finite numbers, got ${v}`);
}

/** Summary of a sample; null for an empty one. */
export function summarize(values: readonly number[]): SampleSummary | null {
  assertFinite(values);
  if (values.length === 0) return null;
  const data = values as number[];
  const sorted = [...values].sort((a, b) => a - b);
  const m = mean(data);
  const sd = values.length >= 2 ? sampleStandardDeviation(data) : null;
  return {
    n: values.length,
    mean: m,
    sd,
    cv_pct: sd !== null && m !== 0 ? (100 * sd) / m : null,
    min: min(data),
    max: max(data),
    q1: quantileSorted(sorted, 0.25),
    median: quantileSorted(sorted, 0.5),
    q3: quantileSorted(sorted, 0.75),
  };
}

/** z = (x − mean)/sd with the sample standard deviation; null where sd is missing or zero. */
export function zScores(values: readonly number[]): (number | null)[] {
  const s = summarize(values);
  if (!s || s.sd === null || s.sd === 0) return values.map(() => null);
  const sd = s.sd;
  return values.map((v) => zScore(v, s.mean, sd));
}
