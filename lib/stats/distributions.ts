/**
 * Student-t and F distribution functions, delegated to jstat (jstat 1.9.6: incomplete-beta based
 * `studentt.cdf/inv` and `centralF.cdf`). Checked against the NIST/SEMATECH e-Handbook table of
 * upper critical values of the t distribution (§1.3.6.7.2) in tests/stats/distributions.test.ts.
 */
import jStat from "jstat";

function assertDf(df: number): void {
  if (!(df > 0) || !Number.isFinite(df)) throw new RangeError(`degrees of freedom must be positive, got ${df}`);
}

/** P(T ≤ t) for Student's t with `df` degrees of freedom. */
export function tCdf(t: number, df: number): number {
  assertDf(df);
  return jStat.studentt.cdf(t, df);
}

/**
 * Upper critical value: the t with P(T > t) = `upperTail` (the convention of the handbook's table,
 * §1.3.6.7.2). `upperTail` 0.025 with df 10 gives 2.228.
 */
export function tUpperCritical(upperTail: number, df: number): number {
  assertDf(df);
  if (!(upperTail > 0 && upperTail < 1)) throw new RangeError(`tail probability must be in (0, 1), got ${upperTail}`);
  return jStat.studentt.inv(1 - upperTail, df);
}

/** Multiplier for a two-sided interval at `confidence` (0.95 → t at upper tail 0.025). */
export function tIntervalMultiplier(confidence: number, df: number): number {
  if (!(confidence > 0 && confidence < 1)) throw new RangeError(`confidence must be in (0, 1), got ${confidence}`);
  return tUpperCritical((1 - confidence) / 2, df);
}

/**
 * Two-sided p-value 2·P(T > |t|). Computed from the lower tail at −|t| so that small p-values
 * keep their precision instead of vanishing in 1 − cdf.
 */
export function tTwoSidedP(t: number, df: number): number {
  if (Number.isNaN(t)) return NaN;
  return Math.min(1, 2 * tCdf(-Math.abs(t), df));
}

/** Upper-tail probability P(F > f) for the F distribution with (df1, df2) degrees of freedom. */
export function fUpperP(f: number, df1: number, df2: number): number {
  assertDf(df1);
  assertDf(df2);
  if (!(f > 0)) return 1;
  return 1 - jStat.centralF.cdf(f, df1, df2);
}
