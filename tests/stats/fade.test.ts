import { describe, expect, it } from "vitest";
import { analyzeFade, type CapacityPoint } from "@/lib/stats/fade";
import { tUpperCritical } from "@/lib/stats/distributions";

const DAY = 86_400_000;
const START = Date.UTC(2026, 0, 1);

// Noise pattern +1, −1, −1, +1 repeated over equally spaced x sums to zero and is orthogonal to x
// within every block of four, so least squares returns the planted line exactly while the
// residual sum of squares is known: n·amplitude². (Analytic construction, no external source.)
const PATTERN = [1, -1, -1, 1];

function plantedSeries(n: number, amplitude: number): CapacityPoint[] {
  return Array.from({ length: n }, (_, i) => ({
    cycle: 50 * i,
    date: new Date(START + 5 * i * DAY).toISOString(),
    capacity_mAh: 2000 - 0.5 * 50 * i + amplitude * (PATTERN[i % 4] as number),
  }));
}

describe("fade per cell on a constructed linear series", () => {
  // 12 points, cycles 0..550, Q = 2000 − 0.5·cycle ± 2 mAh, rated 2000 mAh.
  const points = plantedSeries(12, 2);
  const result = analyzeFade(points, { ratedCapacity_mAh: 2000 });

  it("recovers the planted fade rate with its analytic standard error and t interval", () => {
    if (!result.byCycle.ok) throw new Error(result.byCycle.reason);
    const loss = result.byCycle.lossPer100Cycles_mAh;
    expect(loss.value).toBeCloseTo(50, 9);
    // s² = RSS/(n − 2) = 12·2²/10 = 4.8; Sxx = 50²·Σ(k − 5.5)² = 2500·143; se per 100 cycles = 100·√(s²/Sxx).
    const se = 100 * Math.sqrt(4.8 / (2500 * 143));
    expect(loss.standardError).toBeCloseTo(se, 10);
    // t(0.025, 10) = 2.228 in the NIST/SEMATECH e-Handbook table (§1.3.6.7.2), three decimals.
    expect(loss.high - loss.value).toBeCloseTo(2.228 * se, 3);
    expect(loss.value - loss.low).toBeCloseTo(tUpperCritical(0.025, 10) * se, 10);
    // 50 mAh of a 2000 mAh rating is 2.5 %.
    expect(result.byCycle.lossPer100Cycles_pctRated.value).toBeCloseTo(2.5, 9);
    expect(result.byCycle.intercept_mAh).toBeCloseTo(2000, 9);
  });

  it("projects end of life at 80 % of rated where the line reaches 1600 mAh", () => {
    if (!result.byCycle.ok || !result.byCycle.eol.ok) throw new Error("no projection");
    const eol = result.byCycle.eol;
    // 2000 − 0.5·c = 0.8·2000 → c = 800 (default threshold 0.8, Diao et al. 2019).
    expect(result.eolCapacity_mAh).toBe(1600);
    expect(eol.cycle).toBeCloseTo(800, 9);
    expect(eol.reached).toBe(false);
    expect(eol.interval).not.toBeNull();
    expect(eol.interval?.low).toBeLessThan(800);
    expect(eol.interval?.high).toBeGreaterThan(800);
  });

  it("carries the end-of-life cycle to a date at the planted 10 cycles a day", () => {
    if (!result.eolDate.ok) throw new Error(result.eolDate.reason);
    expect(result.eolDate.basis).toBe("cycle-on-date");
    expect(result.eolDate.cyclesPerDay).toBeCloseTo(10, 9);
    // Cycle 800 at 10 cycles a day from 1 January 2026 is day 80: 22 March 2026.
    expect(result.eolDate.date).toBe("2026-03-22T00:00:00.000Z");
    expect(result.eolDate.interval).not.toBeNull();
  });

  it("computes SOH against rated and against the first measurement", () => {
    const first = result.points[0];
    const fifth = result.points[4];
    // Point 0: 2000 + 2 = 2002 mAh; point 4: 2000 − 100 + 2 = 1902 mAh.
    expect(result.firstCapacity_mAh).toBe(2002);
    expect(first?.sohRated).toBeCloseTo(1.001, 12);
    expect(first?.sohFirst).toBe(1);
    expect(fifth?.sohRated).toBeCloseTo(1902 / 2000, 12);
    expect(fifth?.sohFirst).toBeCloseTo(1902 / 2002, 12);
  });

  it("gives chart lines: fit over the measured span, projection to the threshold", () => {
    const chart = result.chart;
    expect(chart?.axis).toBe("cycle");
    expect(chart?.threshold_mAh).toBe(1600);
    expect(chart?.measured).toHaveLength(12);
    expect(chart?.fitted[0]?.x).toBe(0);
    expect(chart?.fitted[0]?.capacity_mAh).toBeCloseTo(2000, 9);
    expect(chart?.fitted[1]?.x).toBe(550);
    expect(chart?.fitted[1]?.capacity_mAh).toBeCloseTo(1725, 9);
    expect(chart?.projection[1]?.x).toBeCloseTo(800, 9);
    expect(chart?.projection[1]?.capacity_mAh).toBeCloseTo(1600, 9);
  });
});

describe("fade settings and edge cases", () => {
  it("takes the threshold as a setting", () => {
    const r = analyzeFade(plantedSeries(12, 2), { ratedCapacity_mAh: 2000, eolThreshold: 0.7 });
    // 2000 − 0.5·c = 1400 → c = 1200.
    expect(r.byCycle.ok && r.byCycle.eol.ok && r.byCycle.eol.cycle).toBeCloseTo(1200, 9);
  });

  it("orders points by cycle before taking the first measurement", () => {
    const shuffled = [...plantedSeries(8, 0)].reverse();
    const r = analyzeFade(shuffled, { ratedCapacity_mAh: 2000 });
    expect(r.points.map((p) => p.cycle)).toEqual([0, 50, 100, 150, 200, 250, 300, 350]);
    expect(r.firstCapacity_mAh).toBe(2000);
  });

  it("gives a reason instead of a fit with fewer than three points", () => {
    const r = analyzeFade(plantedSeries(2, 0), { ratedCapacity_mAh: 2000 });
    expect(r.byCycle.ok).toBe(false);
    expect(!r.byCycle.ok && r.byCycle.reason).toMatch(/at least 3/);
    expect(r.eolDate.ok).toBe(false);
    expect(r.chart).toBeNull();
    expect(r.points).toHaveLength(2);
  });

  it("gives no projection when capacity is not falling", () => {
    const rising = [0, 100, 200, 300].map((cycle) => ({ cycle, capacity_mAh: 1980 + cycle / 50 }));
    const r = analyzeFade(rising, { ratedCapacity_mAh: 2000 });
    if (!r.byCycle.ok) throw new Error("fit expected");
    expect(r.byCycle.lossPer100Cycles_mAh.value).toBeCloseTo(-2, 9);
    expect(r.byCycle.eol.ok).toBe(false);
    expect(!r.byCycle.eol.ok && r.byCycle.eol.reason).toMatch(/not falling/);
    expect(r.eolDate.ok).toBe(false);
  });

  it("leaves the crossing interval open when the fade rate's interval includes zero", () => {
    // Slope −0.001 mAh/cycle under ±20 mAh pattern noise.
    const noisy = Array.from({ length: 8 }, (_, i) => ({ cycle: 50 * i, capacity_mAh: 2000 - 0.05 * i + 20 * (PATTERN[i % 4] as number) }));
    const r = analyzeFade(noisy, { ratedCapacity_mAh: 2000 });
    if (!r.byCycle.ok || !r.byCycle.eol.ok) throw new Error("projection expected");
    expect(r.byCycle.lossPer100Cycles_mAh.low).toBeLessThan(0);
    expect(r.byCycle.eol.interval).toBeNull();
  });

  it("projects a date from capacity against date when cycles are unknown", () => {
    // Q = 2000 − 2·day, measured every 10 days; 1600 mAh at day 200 = 20 July 2026.
    const dated = Array.from({ length: 10 }, (_, i) => ({ date: new Date(START + 10 * i * DAY).toISOString(), capacity_mAh: 2000 - 20 * i }));
    const r = analyzeFade(dated, { ratedCapacity_mAh: 2000 });
    expect(r.byCycle.ok).toBe(false);
    if (!r.eolDate.ok) throw new Error(r.eolDate.reason);
    expect(r.eolDate.basis).toBe("capacity-on-date");
    expect(r.eolDate.date).toBe("2026-07-20T00:00:00.000Z");
    expect(r.eolDate.lossPerDay_mAh?.value).toBeCloseTo(2, 9);
    expect(r.chart?.axis).toBe("time");
    expect(r.chart?.projection[1]?.capacity_mAh).toBeCloseTo(1600, 6);
  });

  it("marks end of life as reached once a measurement is at the threshold", () => {
    const worn = [0, 100, 200, 300, 400].map((cycle) => ({ cycle, capacity_mAh: 2000 - cycle }));
    const r = analyzeFade(worn, { ratedCapacity_mAh: 2000 });
    expect(r.byCycle.ok && r.byCycle.eol.ok && r.byCycle.eol.reached).toBe(true);
  });

  it("rejects impossible settings", () => {
    expect(() => analyzeFade([], { ratedCapacity_mAh: 0 })).toThrow(RangeError);
    expect(() => analyzeFade([], { ratedCapacity_mAh: 2000, eolThreshold: 1.2 })).toThrow(RangeError);
    expect(() => analyzeFade([{ date: "yesterday", capacity_mAh: 1 }], { ratedCapacity_mAh: 2000 })).toThrow(RangeError);
  });
});
