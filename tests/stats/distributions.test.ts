import { describe, expect, it } from "vitest";
import { fUpperP, tCdf, tIntervalMultiplier, tTwoSidedP, tUpperCritical } from "@/lib/stats/distributions";

// Upper critical values of Student's t, NIST/SEMATECH e-Handbook §1.3.6.7.2 ("Critical values of
// the Student's t distribution"), as reproduced in a public copy of the table (three decimals):
// [df, upper tail probability, value].
const HANDBOOK_T_TABLE: [number, number, number][] = [
  [1, 0.025, 12.706],
  [2, 0.025, 4.303],
  [5, 0.025, 2.571],
  [6, 0.025, 2.447],
  [10, 0.025, 2.228],
  [10, 0.05, 1.812],
  [10, 0.01, 2.764],
  [20, 0.005, 2.845],
  [30, 0.025, 2.042],
  [100, 0.025, 1.984],
  [3, 0.001, 10.215],
];

describe("Student t (jstat) against the e-Handbook table", () => {
  it.each(HANDBOOK_T_TABLE)("df %d, upper tail %d → %d", (df, tail, value) => {
    // The table prints three decimals, so agreement is to half a unit in the last place.
    expect(Math.abs(tUpperCritical(tail, df) - value)).toBeLessThanOrEqual(0.0005 + 1e-9);
  });

  // jstat's incomplete-beta routines agree with themselves to about 1e-8, hence 7 decimals below.
  it("inverts its own distribution function", () => {
    for (const df of [1, 3, 7.5, 40]) {
      for (const p of [0.001, 0.025, 0.3]) {
        expect(tCdf(tUpperCritical(p, df), df)).toBeCloseTo(1 - p, 7);
      }
    }
  });

  it("gives two-sided p = 0.05 at the 97.5 % point and 1 at t = 0", () => {
    // Definition of the two-sided p-value; 2.228 is the handbook's t(0.025, 10).
    expect(tTwoSidedP(tUpperCritical(0.025, 10), 10)).toBeCloseTo(0.05, 7);
    expect(tTwoSidedP(-2.228, 10)).toBeCloseTo(0.05, 3);
    expect(tTwoSidedP(0, 5)).toBe(1);
  });

  it("uses the 0.025 upper point for a 95 % interval", () => {
    expect(tIntervalMultiplier(0.95, 10)).toBeCloseTo(tUpperCritical(0.025, 10), 12);
    expect(() => tIntervalMultiplier(1.2, 10)).toThrow(RangeError);
  });
});

describe("F distribution (jstat)", () => {
  it("matches t² for one numerator degree of freedom", () => {
    // Analytic identity: F(1, ν) is the square of t(ν), so P(F > t²) is the two-sided t p-value.
    for (const [t, df] of [[1.3, 8], [2.5, 20], [0.4, 3]] as const) {
      expect(fUpperP(t * t, 1, df)).toBeCloseTo(tTwoSidedP(t, df), 7);
    }
  });

  it("puts 5 % above F(2, 10) = 4.103", () => {
    // Upper 5 % point of F with (2, 10) degrees of freedom: 4.103 (standard F tables, e.g.
    // e-Handbook §1.3.6.7.3; value from memory). Three decimals, so p is 0.05 to about ±0.0001.
    expect(fUpperP(4.103, 2, 10)).toBeCloseTo(0.05, 3);
    expect(fUpperP(0, 2, 10)).toBe(1);
  });
});
