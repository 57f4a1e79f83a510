/**
 * Outlier screens for a batch's values.
 *
 * Tukey fences, NIST/SEMATECH e-Handbook §7.1.6 ("What are outliers in the data?"): inner fences
 * Q1 − 1.5·IQR and Q3 + 1.5·IQR (beyond them: mild outlier), outer fences Q1 − 3·IQR and
 * Q3 + 3·IQR (beyond them: extreme outlier). Quartiles by simple-statistics `quantile`, linear
 * interpolation between order statistics (R and NumPy default, "type 7"); the handbook's own
 * percentile rule (§7.2.6.2) interpolates at (n + 1)·p instead, so quartiles of small samples can
 * differ slightly from a hand calculation by that rule.
 *
 * Grubbs test, e-Handbook §1.3.5.17 (also ASTM E178): G = max|Yi − Ȳ|/s, reject "no outlier" when
 * G > ((N − 1)/√N)·√(t²/(N − 2 + t²)), t the upper critical value of the t distribution at α/(2N)
 * with N − 2 degrees of freedom (two-sided). It assumes normal data and tests one value at a time;
 * `grubbsIterated` removes a rejected value and tests again, up to a stated maximum. For several
 * suspected outliers the handbook prefers the generalized ESD test (masking can hide a second
 * outlier from Grubbs); the handbook also warns against the test for N ≤ 6 (from memory).
 */
import { mean, quantileSorted, sampleStandardDeviation } from "simple-statistics";
import { tUpperCritical } from "./distributions";
import { assertFinite } from "./describe";

export type FenceClass = "extreme low" | "mild low" | "inside" | "mild high" | "extreme high";

export interface TukeyFences {
  q1: number;
  q3: number;
  iqr: number;
  lowerInner: number;
  upperInner: number;
  lowerOuter: number;
  upperOuter: number;
  quantileMethod: string;
  /** Class of each input value, in input order. */
  classes: FenceClass[];
}

export const QUANTILE_METHOD = "linear interpolation between order statistics (type 7, simple-statistics quantile)";

/** Tukey fences; null for an empty sample. */
export function tukeyFences(values: readonly number[]): TukeyFences | null {
  assertFinite(values);
  if (values.length === 0) return null;
  const sorted = [...values].sort((a, b) => a - b);
  const q1 = quantileSorted(sorted, 0.25);
  const q3 = quantileSorted(sorted, 0.75);
  const iqr = q3 - q1;
  const f = {
    lowerInner: q1 - 1.5 * iqr,
    upperInner: q3 + 1.5 * iqr,
    lowerOuter: q1 - 3 * iqr,
    upperOuter: q3 + 3 * iqr,
  };
  const classify = (v: number): FenceClass => {
    if (v < f.lowerOuter) return "extreme low";
    if (v < f.lowerInner) return "mild low";
    if (v > f.upperOuter) return "extreme high";
    if (v > f.upperInner) return "mild high";
    return "inside";
  };
  return { q1, q3, iqr, ...f, quantileMethod: QUANTILE_METHOD, classes: values.map(classify) };
}

export interface GrubbsStep {
  n: number;
  mean: number;
  sd: number;
  g: number;
  critical: number;
  /** Index into the original input of the value farthest from the mean. */
  suspectIndex: number;
  suspectValue: number;
  rejected: boolean;
}

/** Two-sided Grubbs critical value for N values at level α (handbook §1.3.5.17). */
export function grubbsCritical(n: number, alpha = 0.05): number {
  if (!Number.isInteger(n) || n < 3) throw new RangeError(`Grubbs needs at least 3 values, got ${n}`);
  const t = tUpperCritical(alpha / (2 * n), n - 2);
  return ((n - 1) / Math.sqrt(n)) * Math.sqrt((t * t) / (n - 2 + t * t));
}

function grubbsOn(values: readonly number[], indices: readonly number[], alpha: number): GrubbsStep | null {
  const sample = indices.map((i) => values[i] as number);
  if (sample.length < 3) return null;
  const m = mean(sample);
  const sd = sampleStandardDeviation(sample);
  if (!(sd > 0)) return null;
  let suspect = 0;
  for (let k = 1; k < sample.length; k++) {
    if (Math.abs((sample[k] as number) - m) > Math.abs((sample[suspect] as number) - m)) suspect = k;
  }
  const value = sample[suspect] as number;
  const g = Math.abs(value - m) / sd;
  const critical = grubbsCritical(sample.length, alpha);
  return { n: sample.length, mean: m, sd, g, critical, suspectIndex: indices[suspect] as number, suspectValue: value, rejected: g > critical };
}

/** One two-sided Grubbs test; null with fewer than 3 values or no spread. */
export function grubbsTest(values: readonly number[], alpha = 0.05): GrubbsStep | null {
  assertFinite(values);
  return grubbsOn(values, values.map((_, i) => i), alpha);
}

export interface GrubbsIteration {
  alpha: number;
  maxOutliers: number;
  /** Every test run, the last one being the first that did not reject (or the cap). */
  steps: GrubbsStep[];
  /** Input indices of the values rejected, in the order found. */
  outlierIndices: number[];
}

/** Grubbs repeated: remove each rejected value and test the rest, at most `maxOutliers` times. */
export function grubbsIterated(values: readonly number[], options: { alpha?: number; maxOutliers?: number } = {}): GrubbsIteration {
  assertFinite(values);
  const alpha = options.alpha ?? 0.05;
  const maxOutliers = options.maxOutliers ?? 3;
  let remaining = values.map((_, i) => i);
  const steps: GrubbsStep[] = [];
  const outlierIndices: number[] = [];
  while (outlierIndices.length < maxOutliers) {
    const step = grubbsOn(values, remaining, alpha);
    if (!step) break;
    steps.push(step);
    if (!step.rejected) break;
    outlierIndices.push(step.suspectIndex);
    remaining = remaining.filter((i) => i !== step.suspectIndex);
  }
  return { alpha, maxOutliers, steps, outlierIndices };
}
