/**
 * Knee point of a capacity-fade curve by the Bacon–Watts model, as used by Fermín-Cueto et al.,
 * "Identification and machine learning prediction of knee-point and knee-onset in capacity
 * degradation curves of lithium-ion cells", Energy and AI 1 (2020) 100006:
 *
 *   y = α0 + α1·(x − x1) + α2·(x − x1)·tanh((x − x1)/γ),   knee at x1.
 *
 * The exact form is from memory (marked so in /work/shared/notes/domain.md). Far from x1 the
 * tanh is ±1, so the curve runs with slope α1 − α2 before the knee and α1 + α2 after it; as γ → 0
 * it is two straight segments joined at x1 (public implementations that follow the paper fix
 * γ = 1e-8, i.e. a sharp joint). Knee-onset comes from the paper's double Bacon–Watts model
 * y = β0 + β1·(x − x0) + β2·(x − x0)·tanh((x − x0)/γ) + β3·(x − x2)·tanh((x − x2)/γ), onset at x0
 * (also from memory), fitted here with a sharp joint.
 *
 * Fitting: for fixed (x1, γ) the model is linear in α0..α2, so a profile search runs a grid over x1
 * for each γ of a small set, solves the linear least squares at each, then refines x1 by
 * golden-section search between the neighbouring grid points of the best one.
 *
 * Significance rule: the knee model is compared with a single straight line by the extra-sum-of-
 * squares F-test, F = ((RSS_line − RSS_knee)/2) / (RSS_knee/(n − 4)), on (2, n − 4) degrees of
 * freedom (α2 and x1 counted as the two extra parameters). Because x1 is searched, the null
 * distribution of this F is not exactly F and the real false-alarm rate is above the nominal level
 * (the change-point problem; Davies, Biometrika 74 (1987) 33), so the default level is a strict
 * 0.01. A knee also requires the fade to speed up: the slope after it must be more negative than
 * before it. `rssRatio` (RSS_knee/RSS_line) is reported for pages that want a stricter rule.
 */
import { fUpperP } from "./distributions";
import { leastSquares } from "./least-squares";

export interface XYPoint {
  x: number;
  y: number;
}

export interface KneeOptions {
  /** Level of the F-test; default 0.01. */
  alpha?: number;
  /** Transition widths γ to try, as fractions of the x range; default [1e-6, 0.01, 0.02, 0.05]. */
  gammas?: readonly number[];
  /** Shortest series to analyse; default (and at least) 10. */
  minPoints?: number;
  /** Grid positions for x1; default 100. */
  gridSize?: number;
}

export interface KneeResult {
  /** x1, in the units of x. */
  knee: number;
  /** Capacity on the fitted curve at the knee. */
  kneeY: number;
  /** Knee-onset x0 from the double Bacon–Watts fit; null when it is not before the knee or the knee is not significant. */
  onset: number | null;
  gamma: number;
  alpha0: number;
  alpha1: number;
  alpha2: number;
  /** α1 − α2: slope well before the knee (per unit of x). */
  slopeBefore: number;
  /** α1 + α2: slope well after the knee. */
  slopeAfter: number;
  rss: number;
  rssLine: number;
  /** rss/rssLine: how much of the straight line's misfit the knee model leaves. */
  rssRatio: number;
  fStatistic: number;
  pValue: number;
  significant: boolean;
  /** The decision rule in words, for the page. */
  rule: string;
  /** The fitted curve at each input x. */
  fitted: XYPoint[];
}

interface Scaled {
  xs: number[];
  ys: number[];
  xMin: number;
  xRange: number;
  yMean: number;
  yScale: number;
}

interface ProfileFit {
  x1: number;
  gamma: number;
  coefficients: number[];
  rss: number;
}

const GOLDEN = (Math.sqrt(5) - 1) / 2;
const REFINE_STEPS = 40;

function scale(points: readonly XYPoint[]): Scaled | null {
  const sorted = [...points].sort((a, b) => a.x - b.x);
  const x0 = sorted[0]?.x as number;
  const xRange = (sorted[sorted.length - 1]?.x as number) - x0;
  if (!(xRange > 0)) return null;
  const yRaw = sorted.map((p) => p.y);
  const yMean = yRaw.reduce((s, v) => s + v, 0) / yRaw.length;
  const yScale = Math.max(...yRaw.map((v) => Math.abs(v - yMean))) || 1;
  return {
    xs: sorted.map((p) => (p.x - x0) / xRange),
    ys: yRaw.map((v) => (v - yMean) / yScale),
    xMin: x0,
    xRange,
    yMean,
    yScale,
  };
}

/** (x − c)·tanh((x − c)/γ), with the sharp limit |x − c| for tiny γ (tanh saturates anyway). */
function bend(x: number, c: number, gamma: number): number {
  const d = x - c;
  return d * Math.tanh(d / gamma);
}

function fitAt(s: Scaled, x1: number, gamma: number): ProfileFit | null {
  const ones = s.xs.map(() => 1);
  const lin = s.xs.map((x) => x - x1);
  const bent = s.xs.map((x) => bend(x, x1, gamma));
  const fit = leastSquares([ones, lin, bent], s.ys);
  return fit ? { x1, gamma, coefficients: fit.coefficients, rss: fit.rss } : null;
}

function better(a: ProfileFit | null, b: ProfileFit | null): ProfileFit | null {
  if (!a) return b;
  if (!b) return a;
  return b.rss < a.rss ? b : a;
}

/** Golden-section search of rss(x1) on [lo, hi] for fixed γ. */
function refine(s: Scaled, lo: number, hi: number, gamma: number, start: ProfileFit): ProfileFit {
  let best = start;
  let a = lo;
  let b = hi;
  let c = b - GOLDEN * (b - a);
  let d = a + GOLDEN * (b - a);
  let fc = fitAt(s, c, gamma);
  let fd = fitAt(s, d, gamma);
  for (let i = 0; i < REFINE_STEPS; i++) {
    if ((fc?.rss ?? Infinity) < (fd?.rss ?? Infinity)) {
      b = d;
      d = c;
      fd = fc;
      c = b - GOLDEN * (b - a);
      fc = fitAt(s, c, gamma);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + GOLDEN * (b - a);
      fd = fitAt(s, d, gamma);
    }
    best = better(better(best, fc), fd) as ProfileFit;
  }
  return best;
}

function gridPositions(s: Scaled, gridSize: number): number[] {
  // Keep at least three points on each side so both segments are determined.
  const lo = s.xs[2] as number;
  const hi = s.xs[s.xs.length - 3] as number;
  if (!(hi > lo)) return [lo];
  const steps = Math.max(2, gridSize);
  return Array.from({ length: steps }, (_, i) => lo + ((hi - lo) * i) / (steps - 1));
}

function profileSearch(s: Scaled, gammas: readonly number[], gridSize: number): ProfileFit | null {
  const grid = gridPositions(s, gridSize);
  let best: ProfileFit | null = null;
  let bestIndex = 0;
  for (const gamma of gammas) {
    grid.forEach((x1, i) => {
      const candidate = fitAt(s, x1, gamma);
      if (candidate && (!best || candidate.rss < best.rss)) {
        best = candidate;
        bestIndex = i;
      }
    });
  }
  const found = best as ProfileFit | null;
  if (!found) return null;
  const lo = grid[Math.max(0, bestIndex - 1)] as number;
  const hi = grid[Math.min(grid.length - 1, bestIndex + 1)] as number;
  return hi > lo ? refine(s, lo, hi, found.gamma, found) : found;
}

function lineRss(s: Scaled): number {
  const fit = leastSquares([s.xs.map(() => 1), s.xs], s.ys);
  return fit ? fit.rss : NaN;
}

/** Sharp double Bacon–Watts; returns x0 of the best (x0 < x2) pair on a coarse grid. */
function onsetSearch(s: Scaled, kneeScaled: number): number | null {
  const grid = gridPositions(s, 40);
  const ones = s.xs.map(() => 1);
  let best: { x0: number; rss: number } | null = null;
  for (let i = 0; i < grid.length; i++) {
    const x0 = grid[i] as number;
    if (x0 >= kneeScaled) break;
    const lin = s.xs.map((x) => x - x0);
    const bent0 = s.xs.map((x) => Math.abs(x - x0));
    for (let j = i + 1; j < grid.length; j++) {
      const x2 = grid[j] as number;
      const fit = leastSquares([ones, lin, bent0, s.xs.map((x) => Math.abs(x - x2))], s.ys);
      if (fit && (!best || fit.rss < best.rss)) best = { x0, rss: fit.rss };
    }
  }
  return best ? best.x0 : null;
}

/**
 * Detects the knee of y(x) (capacity against cycle). Returns null for fewer than `minPoints`
 * points or when all x are equal.
 */
export function detectKnee(points: readonly XYPoint[], options: KneeOptions = {}): KneeResult | null {
  const alpha = options.alpha ?? 0.01;
  const gammas = options.gammas ?? [1e-6, 0.01, 0.02, 0.05];
  const minPoints = Math.max(10, options.minPoints ?? 10);
  if (points.length < minPoints) return null;
  if (points.some((p) => !Number.isFinite(p.x) || !Number.isFinite(p.y))) throw new RangeError("points must be finite numbers");
  const s = scale(points);
  if (!s) return null;
  const fit = profileSearch(s, gammas, options.gridSize ?? 100);
  if (!fit) return null;

  const n = s.xs.length;
  const rssLineScaled = lineRss(s);
  const extra = rssLineScaled - fit.rss;
  let fStatistic: number;
  if (fit.rss > 0) fStatistic = Math.max(0, extra) / 2 / (fit.rss / (n - 4));
  else fStatistic = extra > 0 ? Infinity : 0;
  const pValue = fStatistic === Infinity ? 0 : fUpperP(fStatistic, 2, n - 4);

  const [a0, a1, a2] = fit.coefficients as [number, number, number];
  const slopeFactor = s.yScale / s.xRange;
  const alpha0 = s.yMean + s.yScale * a0;
  const alpha1 = a1 * slopeFactor;
  const alpha2 = a2 * slopeFactor;
  const slopeBefore = alpha1 - alpha2;
  const slopeAfter = alpha1 + alpha2;
  const significant = pValue < alpha && slopeAfter < slopeBefore;

  const knee = s.xMin + fit.x1 * s.xRange;
  const gamma = fit.gamma * s.xRange;
  const curve = (x: number) => alpha0 + alpha1 * (x - knee) + alpha2 * bend(x, knee, gamma);
  const onsetScaled = significant ? onsetSearch(s, fit.x1) : null;
  const rssFactor = s.yScale * s.yScale;
  return {
    knee,
    kneeY: curve(knee),
    onset: onsetScaled === null ? null : s.xMin + onsetScaled * s.xRange,
    gamma,
    alpha0,
    alpha1,
    alpha2,
    slopeBefore,
    slopeAfter,
    rss: fit.rss * rssFactor,
    rssLine: rssLineScaled * rssFactor,
    rssRatio: rssLineScaled > 0 ? fit.rss / rssLineScaled : 1,
    fStatistic,
    pValue,
    significant,
    rule: `knee accepted when the Bacon–Watts fit beats one straight line by an F-test at p < ${alpha} and the slope after the knee is steeper than before it`,
    fitted: [...points].sort((p, q) => p.x - q.x).map((p) => ({ x: p.x, y: curve(p.x) })),
  };
}
