/**
 * Histogram bins for a batch chart whose range also covers the specification limits.
 * Bin width by the Freedman–Diaconis rule h = 2·IQR·n^(−1/3) (Freedman & Diaconis, Z. Wahrsch.
 * verw. Gebiete 57 (1981) 453), falling back to Sturges' rule k = ⌈log2 n⌉ + 1 bins over the data
 * range (Sturges, JASA 21 (1926) 65) when the IQR is zero; or Sturges on request.
 */
import { interquartileRange } from "simple-statistics";
import { assertFinite } from "./describe";
import { type SpecLimits } from "./capability";

export type BinRule = "freedman-diaconis" | "sturges";

export interface HistogramBin {
  /** Inclusive lower edge. */
  from: number;
  /** Exclusive upper edge, inclusive for the last bin. */
  to: number;
  count: number;
}

export interface Histogram {
  rule: BinRule;
  binWidth: number;
  bins: HistogramBin[];
  lsl: number | null;
  usl: number | null;
}

export interface HistogramOptions {
  rule?: BinRule;
  spec?: SpecLimits;
  /** Widen bins so that no more than this many are drawn; default 60. */
  maxBins?: number;
}

export function sturgesBinCount(n: number): number {
  return Math.ceil(Math.log2(n)) + 1;
}

export function freedmanDiaconisWidth(values: readonly number[]): number {
  return (2 * (interquartileRange(values as number[]) as number)) / Math.cbrt(values.length);
}

/** Histogram of `values`; null for an empty sample. */
export function histogram(values: readonly number[], options: HistogramOptions = {}): Histogram | null {
  assertFinite(values);
  if (values.length === 0) return null;
  const lsl = options.spec?.lsl ?? null;
  const usl = options.spec?.usl ?? null;
  const maxBins = options.maxBins ?? 60;
  const dataMin = Math.min(...values);
  const dataMax = Math.max(...values);
  let rule: BinRule = options.rule ?? "freedman-diaconis";
  let width = rule === "freedman-diaconis" ? freedmanDiaconisWidth(values) : 0;
  if (!(width > 0)) {
    rule = "sturges";
    width = (dataMax - dataMin) / sturgesBinCount(values.length);
  }
  const lo = Math.min(dataMin, lsl ?? dataMin);
  const hi = Math.max(dataMax, usl ?? dataMax);
  // All values equal and no limits elsewhere: one bin of unit width around them.
  if (!(width > 0)) width = hi > lo ? (hi - lo) / sturgesBinCount(values.length) : 1;
  if ((hi - lo) / width > maxBins) width = (hi - lo) / maxBins;
  const start = Math.floor(lo / width) * width;
  const count = Math.max(1, Math.floor((hi - start) / width) + 1);
  const bins: HistogramBin[] = Array.from({ length: count }, (_, i) => ({ from: start + i * width, to: start + (i + 1) * width, count: 0 }));
  for (const v of values) {
    const i = Math.max(0, Math.min(count - 1, Math.floor((v - start) / width)));
    (bins[i] as HistogramBin).count += 1;
  }
  return { rule, binWidth: width, bins, lsl, usl };
}
