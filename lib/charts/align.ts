/**
 * uPlot draws every series of a chart against one shared, ascending x array ("aligned data").
 * Traces sampled at different x (voltage and current decimated apart, several runs' curves) are
 * merged onto the union of their x values, with null where a trace has no sample; the chart
 * then spans those gaps (`spanGaps`) so each trace still reads as one line.
 */

export interface Trace {
  x: readonly number[];
  y: readonly (number | null)[];
}

export interface Aligned {
  x: number[];
  ys: (number | null)[][];
}

const finite = (v: number | null | undefined): v is number => typeof v === "number" && Number.isFinite(v);

/**
 * Merges traces onto one ascending x array. Points with a non-finite x are dropped; non-finite y
 * become null. When a trace repeats an x, its last value there wins (a logger's duplicate row).
 */
export function alignTraces(traces: readonly Trace[]): Aligned {
  const all: number[] = [];
  for (const t of traces) for (const x of t.x) if (finite(x)) all.push(x);
  all.sort((a, b) => a - b);
  const x: number[] = [];
  for (const v of all) if (x.length === 0 || x[x.length - 1] !== v) x.push(v);
  const position = new Map<number, number>();
  x.forEach((v, i) => position.set(v, i));
  const ys = traces.map((t) => {
    const out: (number | null)[] = new Array<number | null>(x.length).fill(null);
    const n = Math.min(t.x.length, t.y.length);
    for (let k = 0; k < n; k++) {
      const at = position.get(t.x[k] as number);
      if (at === undefined) continue;
      const y = t.y[k];
      out[at] = finite(y) ? y : null;
    }
    return out;
  });
  return { x, ys };
}

/**
 * The value of a series nearest to index `idx` (the cursor's position on the shared x): the value
 * there, or the closest non-null one on either side, preferring the earlier on a tie. Null when
 * the series has no value at all.
 */
export function nearestValue(ys: readonly (number | null | undefined)[], idx: number): { index: number; value: number } | null {
  if (ys.length === 0) return null;
  const start = Math.max(0, Math.min(ys.length - 1, Math.round(idx)));
  for (let d = 0; d < ys.length; d++) {
    const before = ys[start - d];
    if (start - d >= 0 && finite(before)) return { index: start - d, value: before };
    const after = ys[start + d];
    if (start + d < ys.length && finite(after)) return { index: start + d, value: after };
    if (start - d < 0 && start + d >= ys.length) break;
  }
  return null;
}
