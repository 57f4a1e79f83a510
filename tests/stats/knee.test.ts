import { describe, expect, it } from "vitest";
import { detectKnee, type XYPoint } from "@/lib/stats/knee";

// Deterministic noise: a linear congruential generator (the C standard's example constants), so the
// constructed series and therefore the results are the same on every run.
function noise(seed: number): () => number {
  let state = seed;
  return () => {
    state = (state * 1103515245 + 12345) % 2147483648;
    return state / 2147483648 - 0.5;
  };
}

/** Two straight segments joined at `knee` (analytic ground truth): slopes in mAh per cycle. */
function hinge(knee: number, before: number, after: number, amplitude: number, seed = 11): XYPoint[] {
  const next = noise(seed);
  const points: XYPoint[] = [];
  for (let cycle = 0; cycle <= 1000; cycle += 10) {
    const y = cycle < knee ? 2000 + before * cycle : 2000 + before * knee + after * (cycle - knee);
    points.push({ x: cycle, y: y + amplitude * next() });
  }
  return points;
}

describe("Bacon–Watts knee detection on constructed series", () => {
  it("finds the joint of a noiseless two-segment curve to within one cycle", () => {
    const r = detectKnee(hinge(600, -0.2, -1.5, 0));
    expect(r?.knee).toBeGreaterThan(599);
    expect(r?.knee).toBeLessThan(601);
    expect(r?.slopeBefore).toBeCloseTo(-0.2, 4);
    expect(r?.slopeAfter).toBeCloseTo(-1.5, 4);
    expect(r?.significant).toBe(true);
    // The sharp Bacon–Watts curve is the hinge itself.
    const worst = Math.max(...(r?.fitted ?? []).map((p) => Math.abs(p.y - (p.x < 600 ? 2000 - 0.2 * p.x : 1880 - 1.5 * (p.x - 600)))));
    expect(worst).toBeLessThan(1e-3);
  });

  it("finds the knee within 20 cycles under ±2 mAh noise and calls it significant", () => {
    const r = detectKnee(hinge(600, -0.2, -1.5, 4));
    expect(Math.abs((r?.knee ?? 0) - 600)).toBeLessThanOrEqual(20);
    expect(r?.significant).toBe(true);
    expect(r?.pValue).toBeLessThan(0.01);
    expect(r?.slopeAfter).toBeLessThan(r?.slopeBefore ?? 0);
    expect(r?.onset === null || (r?.onset ?? Infinity) <= (r?.knee ?? 0)).toBe(true);
  });

  it("locates a smooth tanh knee at its centre within 30 cycles", () => {
    // y = 2000 − 0.7·(x − 450) − 0.5·(x − 450)·tanh((x − 450)/40): slopes −0.2 before, −1.2 after.
    const next = noise(5);
    const points = Array.from({ length: 91 }, (_, i) => {
      const x = 10 * i;
      const d = x - 450;
      return { x, y: 2000 - 0.7 * d - 0.5 * d * Math.tanh(d / 40) + 2 * next() };
    });
    const r = detectKnee(points);
    expect(Math.abs((r?.knee ?? 0) - 450)).toBeLessThanOrEqual(30);
    expect(r?.significant).toBe(true);
  });

  it("finds no significant knee on a straight line with the same noise", () => {
    const next = noise(11);
    const line = Array.from({ length: 101 }, (_, i) => ({ x: 10 * i, y: 2000 - 0.3 * 10 * i + 4 * next() }));
    const r = detectKnee(line);
    expect(r).not.toBeNull();
    expect(r?.significant).toBe(false);
    expect(r?.onset).toBeNull();
  });

  it("finds no knee on a noiseless straight line (the knee model cannot do better)", () => {
    const line = Array.from({ length: 30 }, (_, i) => ({ x: i, y: 100 - 0.5 * i }));
    expect(detectKnee(line)?.significant).toBe(false);
  });

  it("does not call a slowing fade a knee", () => {
    // Steep first, then flatter: the F-test alone would accept it, the direction rule does not.
    const r = detectKnee(hinge(400, -1.5, -0.2, 2));
    expect(r?.pValue).toBeLessThan(0.01);
    expect(r?.significant).toBe(false);
  });

  it("returns null for series shorter than ten points or without x spread", () => {
    expect(detectKnee(hinge(600, -0.2, -1.5, 0).slice(0, 9))).toBeNull();
    expect(detectKnee(Array.from({ length: 12 }, (_, i) => ({ x: 5, y: i })))).toBeNull();
  });

  it("reports the fitted curve at every input x, sorted", () => {
    const points = [...hinge(600, -0.2, -1.5, 2)].reverse();
    const r = detectKnee(points);
    expect(r?.fitted).toHaveLength(points.length);
    expect(r?.fitted[0]?.x).toBe(0);
    expect(r?.rss).toBeLessThan(r?.rssLine ?? 0);
    expect(r?.rssRatio).toBeCloseTo((r?.rss ?? NaN) / (r?.rssLine ?? NaN), 9);
  });
});
