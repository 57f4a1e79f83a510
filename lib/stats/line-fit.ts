/**
 * Ordinary least-squares straight line with the usual standard errors (any regression text, e.g.
 * NIST/SEMATECH e-Handbook §4.4.4; Draper & Smith, Applied Regression Analysis, ch. 1 and 3).
 * The slope and intercept come from simple-statistics `linearRegression`; the uncertainty terms are
 * the textbook formulas s² = RSS/(n − 2), se(slope) = s/√Sxx, se(intercept) = s·√(1/n + x̄²/Sxx).
 */
import { linearRegression, mean } from "simple-statistics";
import { tIntervalMultiplier } from "./distributions";

export interface LineFit {
  n: number;
  slope: number;
  intercept: number;
  /** Residual standard deviation s = √(RSS/(n − 2)). */
  residualSd: number;
  slopeSe: number;
  interceptSe: number;
  /** Residual degrees of freedom, n − 2. */
  df: number;
  rss: number;
  rSquared: number;
  xMean: number;
  yMean: number;
  /** Σ(x − x̄)². */
  sxx: number;
}

export interface Interval {
  low: number;
  high: number;
}

/**
 * Fits y = intercept + slope·x. Returns null with fewer than three points (no residual degree of
 * freedom for an uncertainty) or when every x is the same.
 */
export function fitLine(xs: readonly number[], ys: readonly number[]): LineFit | null {
  if (xs.length !== ys.length) throw new RangeError("x and y must have the same length");
  const n = xs.length;
  if (n < 3) return null;
  const xMean = mean(xs as number[]);
  const yMean = mean(ys as number[]);
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    sxx += ((xs[i] as number) - xMean) ** 2;
    syy += ((ys[i] as number) - yMean) ** 2;
  }
  if (!(sxx > 0)) return null;
  const { m: slope, b: intercept } = linearRegression(xs.map((x, i) => [x, ys[i] as number]));
  let rss = 0;
  for (let i = 0; i < n; i++) rss += ((ys[i] as number) - (intercept + slope * (xs[i] as number))) ** 2;
  const df = n - 2;
  const residualSd = Math.sqrt(rss / df);
  return {
    n,
    slope,
    intercept,
    residualSd,
    slopeSe: residualSd / Math.sqrt(sxx),
    interceptSe: residualSd * Math.sqrt(1 / n + (xMean * xMean) / sxx),
    df,
    rss,
    // A horizontal exact line explains nothing and leaves nothing: call that R² = 1 rather than 0/0.
    rSquared: syy > 0 ? 1 - rss / syy : 1,
    xMean,
    yMean,
    sxx,
  };
}

/** Two-sided t-based confidence interval for the slope. */
export function slopeInterval(fit: LineFit, confidence = 0.95): Interval {
  const half = tIntervalMultiplier(confidence, fit.df) * fit.slopeSe;
  return { low: fit.slope - half, high: fit.slope + half };
}

/**
 * Where the fitted mean line reaches `level`, with a confidence interval by inverting the line's
 * confidence band (Fieller's method; Draper & Smith §3.2 "inverse regression"): the x with
 * |a + b·x − level| ≤ t·s·√(1/n + (x − x̄)²/Sxx). The interval is bounded only when
 * g = t²·se(b)²/b² < 1, i.e. exactly when the slope's own confidence interval excludes zero;
 * otherwise `interval` is null.
 */
export function inverseAtLevel(
  fit: LineFit,
  level: number,
  confidence = 0.95,
): { x: number; interval: Interval | null } | null {
  if (fit.slope === 0) return null;
  const x = (level - fit.intercept) / fit.slope;
  const t = tIntervalMultiplier(confidence, fit.df);
  const g = (t * fit.slopeSe) ** 2 / fit.slope ** 2;
  if (!(g < 1)) return { x, interval: null };
  const d = x - fit.xMean;
  const half = (t * fit.residualSd) / Math.abs(fit.slope) * Math.sqrt(d * d / fit.sxx + (1 - g) / fit.n);
  const centre = fit.xMean + d / (1 - g);
  const spread = half / (1 - g);
  return { x, interval: { low: centre - spread, high: centre + spread } };
}
