/**
 * Which steps keep their voltage–capacity curve in a long log: the first 100, the last 100 and an
 * evenly spaced middle of at most 200, so a cycle-life run shows its curves across its whole life
 * with bounded memory. Expected step numbers are worked out by hand from that rule.
 */
import { describe, expect, it } from "vitest";
import { PlotCollector } from "@/lib/analysis/plot";

function keptSteps(total: number): number[] {
  const collector = new PlotCollector(NaN);
  const steps = [];
  for (let step = 1; step <= total; step++) {
    collector.onStep({ step, kind: "constant-current discharge", mean_current_A: -1 }, 0, [{ q: [0, -3.6], v: [4.1, 3.0] }], []);
    steps.push({ step, cycle: step, kind: "constant-current discharge" as const, start_s: step });
  }
  return collector.build(steps, []).capacity_curves.map((c) => c.step);
}

describe("curve budget of a long log", () => {
  it("keeps every step while the log has at most 400", () => {
    expect(keptSteps(225)).toEqual(Array.from({ length: 225 }, (_, k) => k + 1));
    expect(keptSteps(400)).toEqual(Array.from({ length: 400 }, (_, k) => k + 1));
  });

  it("thins the middle to every 2nd step once it overflows, keeping both ends whole", () => {
    // 401 steps: 100 first, 100 last, 201 in the middle (steps 101–301) → every 2nd: 101, 103, …, 301.
    const kept = keptSteps(401);
    const middle = Array.from({ length: 101 }, (_, k) => 101 + 2 * k);
    expect(kept).toEqual([...Array.from({ length: 100 }, (_, k) => k + 1), ...middle, ...Array.from({ length: 100 }, (_, k) => 302 + k)]);
  });

  it("spreads at most 200 middle curves over a 10,000-step log, evenly", () => {
    const kept = keptSteps(10_000);
    expect(kept.length).toBeLessThanOrEqual(400);
    expect(kept.slice(0, 100)).toEqual(Array.from({ length: 100 }, (_, k) => k + 1));
    expect(kept.slice(-100)).toEqual(Array.from({ length: 100 }, (_, k) => 9901 + k));
    const middle = kept.slice(100, -100);
    expect(middle.length).toBeGreaterThan(100);
    const gaps = new Set(middle.slice(1).map((s, k) => s - (middle[k] ?? 0)));
    // 9,800 middle steps kept every 64th (9,800 / 64 ≈ 153 ≤ 200, while every 32nd would be 307).
    expect([...gaps]).toEqual([64]);
    expect(middle[0]).toBe(101);
  });
});

describe("points per kept curve", () => {
  it("thins middle curves to 200 points and leaves the ends' curves at up to 400", () => {
    const collector = new PlotCollector(NaN);
    const steps = [];
    const q = Array.from({ length: 1000 }, (_, k) => -k * 0.01);
    const v = Array.from({ length: 1000 }, (_, k) => 4.1 - k * 0.001);
    for (let step = 1; step <= 300; step++) {
      collector.onStep({ step, kind: "constant-current discharge", mean_current_A: -1 }, 0, [{ q, v }], []);
      steps.push({ step, cycle: step, kind: "constant-current discharge" as const, start_s: step });
    }
    const curves = collector.build(steps, []).capacity_curves;
    const points = (step: number) => curves.find((c) => c.step === step)?.capacity_mAh.length;
    expect(points(1)).toBe(400);
    expect(points(150)).toBe(200);
    expect(points(300)).toBe(400);
    // Thinning keeps the curve's end: the step's whole capacity, 999 × 0.01 A·s / 3.6 = 2.775 mAh.
    expect(curves.find((c) => c.step === 150)?.capacity_mAh.at(-1)).toBeCloseTo(9.99 / 3.6, 9);
  });
});
