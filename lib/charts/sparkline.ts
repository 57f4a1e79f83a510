/**
 * A sparkline as an SVG path: small enough to draw one per row of a list, crisp in print, and
 * rendered on the server. Long traces are thinned by keeping each bucket's minimum and maximum
 * (in x order), so a short spike still shows at thumbnail size.
 */

export interface SparklineBox {
  width: number;
  height: number;
  /** Inner margin, so a line at the extremes is not clipped by its own stroke. */
  pad?: number;
}

interface Point {
  x: number;
  y: number;
}

function points(x: readonly (number | null)[], y: readonly (number | null)[]): Point[] {
  const out: Point[] = [];
  const n = Math.min(x.length, y.length);
  for (let k = 0; k < n; k++) {
    const px = x[k];
    const py = y[k];
    if (typeof px === "number" && typeof py === "number" && Number.isFinite(px) && Number.isFinite(py)) out.push({ x: px, y: py });
  }
  return out.sort((a, b) => a.x - b.x);
}

/** At most `buckets` × 2 points: the lowest and the highest of each bucket of equal width in x, in x order. */
export function thinMinMax(pts: readonly Point[], buckets: number): Point[] {
  if (pts.length <= buckets * 2) return [...pts];
  const first = pts[0] as Point;
  const last = pts[pts.length - 1] as Point;
  const span = last.x - first.x || 1;
  const out: Point[] = [];
  let k = 0;
  for (let b = 0; b < buckets; b++) {
    const end = first.x + ((b + 1) / buckets) * span;
    let lo: Point | null = null;
    let hi: Point | null = null;
    while (k < pts.length && ((pts[k] as Point).x < end || b === buckets - 1)) {
      const p = pts[k] as Point;
      if (!lo || p.y < lo.y) lo = p;
      if (!hi || p.y > hi.y) hi = p;
      k++;
    }
    if (lo && hi) out.push(...(lo === hi ? [lo] : lo.x <= hi.x ? [lo, hi] : [hi, lo]));
  }
  return out;
}

/**
 * The path ("M x y L x y …") of the trace scaled into the box: x from the left edge to the right,
 * the lowest y at the bottom. Empty text when the trace has no finite point.
 */
export function sparklinePath(x: readonly (number | null)[], y: readonly (number | null)[], box: SparklineBox, buckets = 60): string {
  const pts = thinMinMax(points(x, y), buckets);
  if (pts.length === 0) return "";
  const pad = box.pad ?? 1;
  const xs = pts.map((p) => p.x);
  const ys = pts.map((p) => p.y);
  const x0 = Math.min(...xs);
  const x1 = Math.max(...xs);
  const y0 = Math.min(...ys);
  const y1 = Math.max(...ys);
  const w = box.width - 2 * pad;
  const h = box.height - 2 * pad;
  // A flat or single-point trace sits in the middle rather than dividing by zero.
  const sx = (v: number) => pad + (x1 > x0 ? ((v - x0) / (x1 - x0)) * w : w / 2);
  const sy = (v: number) => pad + (y1 > y0 ? (1 - (v - y0) / (y1 - y0)) * h : h / 2);
  const r = (v: number) => Math.round(v * 100) / 100;
  return pts.map((p, i) => `${i === 0 ? "M" : "L"}${r(sx(p.x))} ${r(sy(p.y))}`).join(" ");
}
