import uPlot from "uplot";
import { describe, expect, it } from "vitest";
import { alignTraces, nearestValue } from "@/lib/charts/align";

/** uPlot's own outer join (npm reference library), its missing values written as null. */
function uplotJoin(traces: { x: number[]; y: number[] }[]): { x: number[]; ys: (number | null)[][] } {
  const joined = uPlot.join(traces.map((t) => [t.x, t.y]));
  const [x, ...ys] = joined as unknown as (number | null | undefined)[][];
  return { x: (x ?? []) as number[], ys: ys.map((y) => y.map((v) => (v === undefined ? null : v))) };
}

describe("alignTraces", () => {
  it("puts two traces on the union of their x with null where one has no sample", () => {
    const aligned = alignTraces([
      { x: [0, 2, 4], y: [3.7, 3.8, 3.9] },
      { x: [1, 2, 3], y: [0.5, 0.5, 0.4] },
    ]);
    expect(aligned.x).toEqual([0, 1, 2, 3, 4]);
    expect(aligned.ys).toEqual([
      [3.7, null, 3.8, null, 3.9],
      [null, 0.5, 0.5, 0.4, null],
    ]);
  });

  it("agrees with uPlot.join on sorted traces of different lengths", () => {
    let seed = 7;
    const rand = () => ((seed = (seed * 48271) % 2147483647) / 2147483647);
    const trace = (n: number) => {
      const x = [...new Set(Array.from({ length: n }, () => Math.round(rand() * 500)))].sort((a, b) => a - b);
      return { x, y: x.map(() => Math.round(rand() * 1000) / 100) };
    };
    const traces = [trace(40), trace(120), trace(7)];
    expect(alignTraces(traces)).toEqual(uplotJoin(traces));
  });

  it("sorts unsorted input, lets the last of repeated x win, drops non-finite x and nulls non-finite y", () => {
    const aligned = alignTraces([{ x: [5, 1, 5, Number.NaN, 3], y: [1, 2, 9, 4, Number.NaN] }]);
    expect(aligned.x).toEqual([1, 3, 5]);
    expect(aligned.ys).toEqual([[2, null, 9]]);
  });

  it("keeps every series the length of x", () => {
    const aligned = alignTraces([{ x: [0, 1], y: [1, 2] }, { x: [], y: [] }]);
    expect(aligned.ys.map((y) => y.length)).toEqual([2, 2]);
  });
});

describe("nearestValue", () => {
  it("returns the value at the index, else the closest one, the earlier on a tie", () => {
    const ys = [null, 1, null, null, 4, null];
    expect(nearestValue(ys, 1)).toEqual({ index: 1, value: 1 });
    expect(nearestValue(ys, 3)).toEqual({ index: 4, value: 4 });
    expect(nearestValue(ys, 2)).toEqual({ index: 1, value: 1 });
    expect(nearestValue(ys, 99)).toEqual({ index: 4, value: 4 });
    expect(nearestValue([null, null], 0)).toBeNull();
    expect(nearestValue([], 0)).toBeNull();
  });
});
