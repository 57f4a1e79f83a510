/**
 * Batches side by side: each batch's distribution summary and mean with a t-based confidence
 * interval (x̄ ± t·s/√n, n − 1 degrees of freedom), and Welch's unequal-variance t-test for each
 * pair (Welch, Biometrika 34 (1947) 28; degrees of freedom by Welch–Satterthwaite,
 * Satterthwaite, Biometrics Bulletin 2 (1946) 110; NIST/SEMATECH e-Handbook §7.3.1):
 *   t = (x̄1 − x̄2)/√(s1²/n1 + s2²/n2),
 *   ν = (s1²/n1 + s2²/n2)² / ((s1²/n1)²/(n1 − 1) + (s2²/n2)²/(n2 − 1)),
 * two-sided p = 2·P(T_ν > |t|). This is R's default `t.test(x, y)`.
 */
import { mean, sampleVariance } from "simple-statistics";
import { tIntervalMultiplier, tTwoSidedP } from "./distributions";
import { summarize, type SampleSummary } from "./describe";
import { type Interval } from "./line-fit";

export interface MeanInterval extends Interval {
  n: number;
  mean: number;
  standardError: number;
  df: number;
  confidence: number;
}

/** Mean with its confidence interval; null with fewer than two values. */
export function meanInterval(values: readonly number[], confidence = 0.95): MeanInterval | null {
  const s = summarize(values);
  if (!s || s.sd === null) return null;
  const se = s.sd / Math.sqrt(s.n);
  const half = tIntervalMultiplier(confidence, s.n - 1) * se;
  return { n: s.n, mean: s.mean, standardError: se, df: s.n - 1, confidence, low: s.mean - half, high: s.mean + half };
}

export interface WelchResult {
  /** x̄a − x̄b. */
  difference: number;
  t: number;
  df: number;
  p: number;
  /** Confidence interval of the difference at the requested level. */
  interval: Interval;
}

/** Welch's t-test of a against b; null when either has fewer than two values or both have no spread. */
export function welchTest(a: readonly number[], b: readonly number[], confidence = 0.95): WelchResult | null {
  if (a.length < 2 || b.length < 2) return null;
  const va = sampleVariance(a as number[]) / a.length;
  const vb = sampleVariance(b as number[]) / b.length;
  const se2 = va + vb;
  if (!(se2 > 0)) return null;
  const difference = mean(a as number[]) - mean(b as number[]);
  const se = Math.sqrt(se2);
  const t = difference / se;
  const df = (se2 * se2) / ((va * va) / (a.length - 1) + (vb * vb) / (b.length - 1));
  const half = tIntervalMultiplier(confidence, df) * se;
  return { difference, t, df, p: tTwoSidedP(t, df), interval: { low: difference - half, high: difference + half } };
}

export interface BatchSample {
  id: string;
  values: readonly number[];
}

export interface BatchComparison {
  confidence: number;
  batches: { id: string; summary: SampleSummary | null; mean: MeanInterval | null }[];
  pairs: { a: string; b: string; welch: WelchResult | null }[];
}

/** Every batch summarised, and every pair (in input order) compared by Welch's test. */
export function compareBatches(batches: readonly BatchSample[], confidence = 0.95): BatchComparison {
  const pairs: BatchComparison["pairs"] = [];
  for (let i = 0; i < batches.length; i++) {
    for (let j = i + 1; j < batches.length; j++) {
      const a = batches[i] as BatchSample;
      const b = batches[j] as BatchSample;
      pairs.push({ a: a.id, b: b.id, welch: welchTest(a.values, b.values, confidence) });
    }
  }
  return {
    confidence,
    batches: batches.map((b) => ({ id: b.id, summary: summarize(b.values), mean: meanInterval(b.values, confidence) })),
    pairs,
  };
}
