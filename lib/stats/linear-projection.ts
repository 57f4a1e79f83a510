/**
 * A falling straight-line trend and where it reaches a level: the shared core of the per-cycle and
 * per-date fade projections. Least squares from ./line-fit; the crossing interval by Fieller's
 * inversion of the confidence band (see `inverseAtLevel`).
 */
import { fitLine, inverseAtLevel, slopeInterval, type Interval, type LineFit } from "./line-fit";

/** Why a computation gave no answer, in words for the page. */
export interface Unavailable {
  ok: false;
  reason: string;
}

export interface FallingTrend {
  ok: true;
  fit: LineFit;
  slopeInterval: Interval;
  /** Where the fitted line reaches the level, or why it does not. */
  crossing: Crossing | Unavailable;
}

export interface Crossing {
  ok: true;
  x: number;
  /** Null where the slope's interval includes zero (the band never closes on that side). */
  interval: Interval | null;
}

export const MIN_TREND_POINTS = 3;

/** Fits y on x and projects the x at which the line falls to `level`. */
export function projectToLevel(
  xs: readonly number[],
  ys: readonly number[],
  level: number,
  confidence: number,
  minPoints = MIN_TREND_POINTS,
): FallingTrend | Unavailable {
  if (xs.length < Math.max(minPoints, MIN_TREND_POINTS)) {
    return { ok: false, reason: `needs at least ${Math.max(minPoints, MIN_TREND_POINTS)} points, has ${xs.length}` };
  }
  const fit = fitLine(xs, ys);
  if (!fit) return { ok: false, reason: "all points share the same position, so no trend can be fitted" };
  const ci = slopeInterval(fit, confidence);
  if (!(fit.slope < 0)) {
    return { ok: true, fit, slopeInterval: ci, crossing: { ok: false, reason: "capacity is not falling (slope is not negative)" } };
  }
  const inverse = inverseAtLevel(fit, level, confidence);
  if (!inverse) return { ok: true, fit, slopeInterval: ci, crossing: { ok: false, reason: "slope is zero" } };
  return { ok: true, fit, slopeInterval: ci, crossing: { ok: true, x: inverse.x, interval: inverse.interval } };
}
