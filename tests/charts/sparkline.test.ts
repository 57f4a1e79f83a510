import { describe, expect, it } from "vitest";
import { sparklinePath, thinMinMax } from "@/lib/charts/sparkline";

describe("sparklinePath", () => {
  it("maps the lowest value to the bottom edge and the first and last x to the sides", () => {
    // SVG's y axis points down (SVG 1.1, §7.3 initial coordinate system): the highest value is at y = 0.
    expect(sparklinePath([0, 1, 2], [3.0, 4.2, 3.0], { width: 100, height: 50, pad: 0 })).toBe("M0 50 L50 0 L100 50");
    expect(sparklinePath([0, 10], [1, 2], { width: 20, height: 10, pad: 2 })).toBe("M2 8 L18 2");
  });

  it("skips null points, sorts by x and draws a flat trace mid-height", () => {
    expect(sparklinePath([2, null, 0], [5, 9, 5], { width: 10, height: 10, pad: 0 })).toBe("M0 5 L10 5");
    expect(sparklinePath([], [], { width: 10, height: 10 })).toBe("");
  });
});

describe("thinMinMax", () => {
  it("keeps a one-sample spike among many thousand points", () => {
    const n = 20000;
    const pts = Array.from({ length: n }, (_, k) => ({ x: k, y: k === 12345 ? 9 : Math.sin(k / 500) }));
    const thin = thinMinMax(pts, 50);
    expect(thin.length).toBeLessThanOrEqual(100);
    expect(Math.max(...thin.map((p) => p.y))).toBe(9);
    expect(thin.some((p) => p.x === 12345)).toBe(true);
    const xs = thin.map((p) => p.x);
    expect([...xs].sort((a, b) => a - b)).toEqual(xs);
    expect(xs[0]).toBe(0);
  });

  it("returns short traces unchanged", () => {
    const pts = [{ x: 0, y: 1 }, { x: 1, y: 2 }];
    expect(thinMinMax(pts, 10)).toEqual(pts);
  });
});
