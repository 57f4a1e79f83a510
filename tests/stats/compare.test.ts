import { tTestTwoSample } from "simple-statistics";
import { describe, expect, it } from "vitest";
import { compareBatches, meanInterval, welchTest } from "@/lib/stats/compare";

// R's built-in `sleep` data (Cushny & Peebles 1905, as used by Student 1908): extra hours of sleep
// under two drugs, ten patients each.
const SLEEP_1 = [0.7, -1.6, -0.2, -1.2, -0.1, 3.4, 3.7, 0.8, 0.0, 2.0];
const SLEEP_2 = [1.9, 0.8, 1.1, 0.1, -0.1, 4.4, 5.5, 1.6, 4.6, 3.4];

describe("Welch's t-test", () => {
  it("reproduces R's t.test(extra ~ group, data = sleep)", () => {
    // Published R output: t = −1.8608, df = 17.776, p-value = 0.07939,
    // 95 percent confidence interval −3.3654832 to 0.2054832, means 0.75 and 2.33.
    const r = welchTest(SLEEP_1, SLEEP_2);
    expect(r?.difference).toBeCloseTo(0.75 - 2.33, 12);
    expect(r?.t).toBeCloseTo(-1.8608, 4);
    expect(r?.df).toBeCloseTo(17.776, 3);
    expect(r?.p).toBeCloseTo(0.07939, 5);
    expect(r?.interval.low).toBeCloseTo(-3.3654832, 6);
    expect(r?.interval.high).toBeCloseTo(0.2054832, 6);
  });

  it("has the pooled t statistic of simple-statistics when the group sizes are equal", () => {
    // With n1 = n2 the Welch and pooled standard errors coincide (algebra), so t must agree.
    expect(welchTest(SLEEP_1, SLEEP_2)?.t).toBeCloseTo(tTestTwoSample(SLEEP_1, SLEEP_2, 0) as number, 12);
  });

  it("gives the pooled degrees of freedom n1 + n2 − 2 for equal sizes and variances", () => {
    // Welch–Satterthwaite with s1 = s2 and n1 = n2 = n reduces to 2(n − 1) (algebra).
    const a = [1, 2, 3, 4, 5];
    const b = [11, 12, 13, 14, 15];
    expect(welchTest(a, b)?.df).toBeCloseTo(8, 12);
  });

  it("needs two values per group and some spread", () => {
    expect(welchTest([1], [2, 3])).toBeNull();
    expect(welchTest([2, 2], [2, 2])).toBeNull();
  });
});

describe("mean with confidence interval", () => {
  it("gives x̄ ± t(0.025, n − 1)·s/√n", () => {
    // 1900, 2000, 2100: mean 2000, s = 100; t(0.025, 2) = 4.303 (e-Handbook §1.3.6.7.2, three decimals).
    const m = meanInterval([1900, 2000, 2100]);
    expect(m?.mean).toBe(2000);
    expect(m?.standardError).toBeCloseTo(100 / Math.sqrt(3), 12);
    expect(m?.high).toBeCloseTo(2000 + (4.303 * 100) / Math.sqrt(3), 1);
    expect(m?.low).toBeCloseTo(2000 - (4.303 * 100) / Math.sqrt(3), 1);
    expect(meanInterval([5])).toBeNull();
  });
});

describe("batches side by side", () => {
  it("summarises each batch and compares every pair once", () => {
    const r = compareBatches([
      { id: "L1", values: SLEEP_1 },
      { id: "L2", values: SLEEP_2 },
      { id: "L3", values: [2, 2.5, 3, 3.5] },
    ]);
    expect(r.batches.map((b) => b.id)).toEqual(["L1", "L2", "L3"]);
    expect(r.batches[0]?.mean?.mean).toBeCloseTo(0.75, 12);
    expect(r.batches[1]?.summary?.median).toBeCloseTo(1.75, 12);
    expect(r.pairs.map((p) => `${p.a}-${p.b}`)).toEqual(["L1-L2", "L1-L3", "L2-L3"]);
    expect(r.pairs[0]?.welch?.p).toBeCloseTo(0.07939, 5);
  });
});
