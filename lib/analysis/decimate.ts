/**
 * Bounded downsampling for plots.
 * Stage 1 (streaming, ours): min/max bucketing with adaptive doubling — every bucket keeps its
 * lowest and highest point; when 8,192 buckets are full, neighbours merge and buckets hold twice
 * as many samples. Memory is fixed (~16k candidate points per trace) however long the log is.
 * Stage 2: Largest-Triangle-Three-Buckets (S. Steinarsson, "Downsampling Time Series for Visual
 * Representation", MSc thesis, University of Iceland, 2013), implementation from the npm package
 * `downsample`, down to the point budget of the trace.
 */
import { LTTB } from "downsample";

const maxBuckets = 8192;

export class MinMaxDecimator {
  private readonly tMin = new Float64Array(maxBuckets);
  private readonly yMin = new Float64Array(maxBuckets);
  private readonly tMax = new Float64Array(maxBuckets);
  private readonly yMax = new Float64Array(maxBuckets);
  private buckets = 0;
  private width = 1;
  private open = 0;
  private oTmin = 0;
  private oYmin = Infinity;
  private oTmax = 0;
  private oYmax = -Infinity;

  /** Adds (t[j], y[j]); indices rather than values cross the call, so nothing is boxed. */
  addAt(tColumn: Float64Array, yColumn: Float64Array, j: number): void {
    const t = tColumn[j] ?? 0;
    const y = yColumn[j] ?? NaN;
    if (!(y === y)) return;
    if (y < this.oYmin) {
      this.oYmin = y;
      this.oTmin = t;
    }
    if (y > this.oYmax) {
      this.oYmax = y;
      this.oTmax = t;
    }
    if (++this.open === this.width) this.flushOpen();
  }

  private flushOpen(): void {
    const b = this.buckets;
    this.tMin[b] = this.oTmin;
    this.yMin[b] = this.oYmin;
    this.tMax[b] = this.oTmax;
    this.yMax[b] = this.oYmax;
    this.buckets = b + 1;
    this.open = 0;
    this.oYmin = Infinity;
    this.oYmax = -Infinity;
    if (this.buckets === maxBuckets) this.compact();
  }

  private compact(): void {
    const half = maxBuckets >> 1;
    for (let k = 0; k < half; k++) {
      const a = 2 * k;
      const b = a + 1;
      const minFromA = (this.yMin[a] ?? 0) <= (this.yMin[b] ?? 0);
      const maxFromA = (this.yMax[a] ?? 0) >= (this.yMax[b] ?? 0);
      const tmin = minFromA ? this.tMin[a] : this.tMin[b];
      const ymin = minFromA ? this.yMin[a] : this.yMin[b];
      const tmax = maxFromA ? this.tMax[a] : this.tMax[b];
      const ymax = maxFromA ? this.yMax[a] : this.yMax[b];
      this.tMin[k] = tmin ?? 0;
      this.yMin[k] = ymin ?? 0;
      this.tMax[k] = tmax ?? 0;
      this.yMax[k] = ymax ?? 0;
    }
    this.buckets = half;
    this.width *= 2;
  }

  /** The candidate points in time order. */
  points(): [number, number][] {
    const out: [number, number][] = [];
    const push = (tA: number, yA: number, tB: number, yB: number): void => {
      if (tA <= tB) {
        out.push([tA, yA]);
        if (tB !== tA) out.push([tB, yB]);
      } else {
        out.push([tB, yB], [tA, yA]);
      }
    };
    for (let k = 0; k < this.buckets; k++) push(this.tMin[k] ?? 0, this.yMin[k] ?? 0, this.tMax[k] ?? 0, this.yMax[k] ?? 0);
    if (this.open > 0) push(this.oTmin, this.oYmin, this.oTmax, this.oYmax);
    return out;
  }
}

/**
 * Reduces `points` (x ascending) with LTTB to `budget − exact.length` points, then adds the exact
 * points (step edges, switch points) and sorts; the result has at most `budget` points.
 */
export function reduceWithExact(points: [number, number][], exact: [number, number][], budget: number): { x: number[]; y: number[] } {
  const room = Math.max(3, budget - exact.length);
  const reduced = points.length > room ? (LTTB(points, room) as [number, number][]) : points;
  const all = reduced.concat(exact).sort((p, q) => p[0] - q[0]);
  const x: number[] = [];
  const y: number[] = [];
  for (const [px, py] of all) {
    const lastX = x[x.length - 1];
    const lastY = y[y.length - 1];
    if (lastX === px && lastY === py) continue;
    x.push(px);
    y.push(py);
  }
  // Exact points may coincide in time with reduced ones at other values; keep the budget strictly.
  while (x.length > budget) {
    x.splice(1, 1);
    y.splice(1, 1);
  }
  return { x, y };
}
