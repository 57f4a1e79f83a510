/**
 * Least-squares straight-line fits over a span of the ring (ordinary least squares, normal
 * equations; textbook). With a hinge time τ, the regressor is x = max(0, t − τ): a constant
 * before τ and a straight line after it; τ before the first sample gives a plain line in time.
 */
import { ringMask, type SampleRing } from "./ring";

const MASK = ringMask;

/** Residual sum of squares of the current over samples a..z fitted as α + β·max(0, t − τ). */
export function hingeSse(r: SampleRing, a: number, z: number, tau: number): number {
  let n = 0;
  let sx = 0;
  let sxx = 0;
  let sy = 0;
  let sxy = 0;
  let syy = 0;
  for (let j = a; j <= z; j++) {
    const t = r.t[j & MASK] ?? 0;
    const y = r.i[j & MASK] ?? 0;
    const x = t > tau ? t - tau : 0;
    n += 1;
    sx += x;
    sxx += x * x;
    sy += y;
    sxy += x * y;
    syy += y * y;
  }
  const det = n * sxx - sx * sx;
  if (!(det > 0)) return NaN;
  const slope = (n * sxy - sx * sy) / det;
  const icept = (sy - slope * sx) / n;
  return Math.max(0, syy - icept * sy - slope * sxy);
}
