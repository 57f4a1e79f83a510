/**
 * A capacity histogram (lib/stats/histogram.ts) as chart data: bars at the bin centres, and the
 * x range widened to show the spec limits even when every cell is well inside them.
 */
import type { Histogram } from "@/lib/stats/histogram";

export interface HistogramBars {
  /** Bin centres, mAh. */
  x: number[];
  counts: number[];
  binWidth: number;
  range: { min: number; max: number };
  lsl: number | null;
  usl: number | null;
}

export function histogramBars(h: Histogram): HistogramBars {
  const x = h.bins.map((b) => (b.from + b.to) / 2);
  const first = h.bins[0];
  const last = h.bins[h.bins.length - 1];
  const lo = Math.min(first?.from ?? 0, h.lsl ?? Infinity);
  const hi = Math.max(last?.to ?? 0, h.usl ?? -Infinity);
  // Half a bin of margin each side, so a limit on the outermost edge is not drawn on the frame.
  return { x, counts: h.bins.map((b) => b.count), binWidth: h.binWidth, range: { min: lo - h.binWidth / 2, max: hi + h.binWidth / 2 }, lsl: h.lsl, usl: h.usl };
}
