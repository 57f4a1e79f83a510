import { interquartileRange, max, mean, min, quantile, sampleStandardDeviation, zScore } from "simple-statistics";
import { describe, expect, it } from "vitest";
import { analyzeBatch } from "@/lib/stats/batch";
import { capabilityIndices, verdictFor } from "@/lib/stats/capability";
import { summarize, zScores } from "@/lib/stats/describe";
import { freedmanDiaconisWidth, histogram, sturgesBinCount } from "@/lib/stats/histogram";
import { grubbsCritical, grubbsIterated, grubbsTest, tukeyFences } from "@/lib/stats/outliers";

const CAPACITIES = [2012, 1998, 2005, 2021, 1987, 2003, 2010, 1995, 2008, 2001, 1990, 2016];

describe("sample summary against simple-statistics", () => {
  it("matches mean, sample SD, extremes and type-7 quartiles", () => {
    const s = summarize(CAPACITIES);
    expect(s?.n).toBe(12);
    expect(s?.mean).toBeCloseTo(mean(CAPACITIES), 12);
    expect(s?.sd).toBeCloseTo(sampleStandardDeviation(CAPACITIES), 12);
    expect(s?.cv_pct).toBeCloseTo((100 * sampleStandardDeviation(CAPACITIES)) / mean(CAPACITIES), 12);
    expect(s?.min).toBe(min(CAPACITIES));
    expect(s?.max).toBe(max(CAPACITIES));
    expect(s?.q1).toBeCloseTo(quantile(CAPACITIES, 0.25), 12);
    expect(s?.q3).toBeCloseTo(quantile(CAPACITIES, 0.75), 12);
  });

  it("gives z-scores −1, 0, 1 for data with known mean 2000 and SD 100", () => {
    // 1900, 2000, 2100: mean 2000, sample SD √((100² + 0 + 100²)/2) = 100 (analytic).
    expect(zScores([1900, 2000, 2100])).toEqual([-1, 0, 1]);
    const z = zScores(CAPACITIES);
    z.forEach((v, i) => expect(v).toBeCloseTo(zScore(CAPACITIES[i] as number, mean(CAPACITIES), sampleStandardDeviation(CAPACITIES)), 12));
    expect(zScores([5])).toEqual([null]);
  });
});

describe("capability (NIST/SEMATECH e-Handbook §6.1.6)", () => {
  it("reproduces the handbook example: USL 20, LSL 8, mean 16, s 2 → Cp 1.0, Cpk 0.6667", () => {
    const c = capabilityIndices(16, 2, { lsl: 8, usl: 20 });
    expect(c?.cp).toBeCloseTo(1.0, 10);
    expect(c?.cpk).toBeCloseTo(0.6667, 4);
    expect(c?.index).toBe("Cpk");
    expect(c?.verdict).toBe("not capable");
  });

  it("uses the one-sided Cpl = (μ − LSL)/(3σ) when only a lower limit exists", () => {
    // (16 − 8)/(3·2) = 1.3333.
    const c = capabilityIndices(16, 2, { lsl: 8 });
    expect(c?.cp).toBeNull();
    expect(c?.cpk).toBeNull();
    expect(c?.index).toBe("Cpl");
    expect(c?.value).toBeCloseTo(4 / 3, 12);
    expect(c?.verdict).toBe("capable");
    expect(capabilityIndices(16, 2, { usl: 19 })?.index).toBe("Cpu");
  });

  it("applies the verdict bands < 1, 1–1.33, ≥ 1.33", () => {
    expect(verdictFor(0.99)).toBe("not capable");
    expect(verdictFor(1)).toBe("marginal");
    expect(verdictFor(1.329)).toBe("marginal");
    expect(verdictFor(1.33)).toBe("capable");
  });

  it("gives nothing without limits or spread, and rejects crossed limits", () => {
    expect(capabilityIndices(16, 2, {})).toBeNull();
    expect(capabilityIndices(16, 0, { lsl: 8 })).toBeNull();
    expect(() => capabilityIndices(16, 2, { lsl: 20, usl: 8 })).toThrow(RangeError);
  });
});

describe("Tukey fences (e-Handbook §7.1.6)", () => {
  it("puts fences at Q1 − 1.5·IQR, Q3 + 1.5·IQR and 3·IQR with type-7 quartiles", () => {
    // 13 sorted values: type 7 places Q1 at index (13 − 1)·0.25 = 3 → 3 and Q3 at index 9 → 9,
    // so IQR = 6, inner fences −6 and 18, outer fences −15 and 27 (analytic).
    const data = [-20, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 20, 40];
    const f = tukeyFences(data);
    expect(f?.q1).toBe(3);
    expect(f?.q3).toBe(9);
    expect(f?.iqr).toBeCloseTo(interquartileRange(data) as number, 12);
    expect([f?.lowerInner, f?.upperInner, f?.lowerOuter, f?.upperOuter]).toEqual([-6, 18, -15, 27]);
    expect(f?.classes[0]).toBe("extreme low");
    expect(f?.classes[11]).toBe("mild high");
    expect(f?.classes[12]).toBe("extreme high");
    expect(f?.classes.filter((c) => c === "inside")).toHaveLength(10);
    expect(f?.quantileMethod).toMatch(/type 7/);
  });
});

describe("Grubbs test (e-Handbook §1.3.5.17)", () => {
  // The handbook's example: 8 mass-spectrometer measurements (Tietjen and Moore), G = 2.4687 for
  // 245.57; two-sided 5 % critical value 2.1266 for N = 8, so the value is rejected.
  const NIST = [199.31, 199.53, 200.19, 200.82, 201.92, 201.95, 202.18, 245.57];

  it("reproduces the handbook example", () => {
    const r = grubbsTest(NIST);
    // G = 2.46876…: the handbook prints 2.4687 (cut at four decimals), @stdlib's Grubbs prints 2.4688.
    expect(Math.abs((r?.g ?? 0) - 2.4687)).toBeLessThan(1e-4);
    expect(r?.critical).toBeCloseTo(2.1266, 4);
    expect(r?.suspectValue).toBe(245.57);
    expect(r?.suspectIndex).toBe(7);
    expect(r?.rejected).toBe(true);
  });

  it("matches the one-sided 5 % table at two-sided α = 0.10", () => {
    // One-sided 5 % Grubbs critical values (Grubbs 1969 tables, as reproduced in public code):
    // N = 7: 1.9381, N = 8: 2.0317, N = 15: 2.4090. The two-sided rule at α uses α/(2N), so
    // two-sided α = 0.10 is the one-sided 5 % test.
    expect(grubbsCritical(7, 0.1)).toBeCloseTo(1.9381, 4);
    expect(grubbsCritical(8, 0.1)).toBeCloseTo(2.0317, 4);
    expect(grubbsCritical(15, 0.1)).toBeCloseTo(2.409, 3);
  });

  it("iterates one value at a time and stops at the first non-rejection", () => {
    const r = grubbsIterated(NIST);
    expect(r.outlierIndices).toEqual([7]);
    expect(r.steps).toHaveLength(2);
    expect(r.steps[1]?.n).toBe(7);
    expect(r.steps[1]?.rejected).toBe(false);
  });

  it("finds two planted outliers in symmetric data and respects the cap", () => {
    // Symmetric data about 2000 (±1..±5 mAh) with 2100 and 1880 planted (constructed; no source).
    const base = [1995, 1996, 1997, 1998, 1999, 2000, 2001, 2002, 2003, 2004, 2005, 2000, 2000];
    const data = [...base, 2100, 1880];
    const r = grubbsIterated(data);
    expect(r.outlierIndices).toEqual([14, 13]);
    expect(grubbsIterated(data, { maxOutliers: 1 }).outlierIndices).toEqual([14]);
    // The symmetric core alone has no outlier.
    expect(grubbsTest(base)?.rejected).toBe(false);
  });

  it("needs three values and some spread", () => {
    expect(grubbsTest([1, 2])).toBeNull();
    expect(grubbsTest([4, 4, 4, 4])).toBeNull();
    expect(() => grubbsCritical(2)).toThrow(RangeError);
  });
});

describe("histogram", () => {
  it("uses the Freedman–Diaconis width 2·IQR·n^(−1/3) and counts every value", () => {
    const h = histogram(CAPACITIES);
    const width = (2 * (interquartileRange(CAPACITIES) as number)) / Math.cbrt(CAPACITIES.length);
    expect(h?.rule).toBe("freedman-diaconis");
    expect(h?.binWidth).toBeCloseTo(width, 12);
    expect(freedmanDiaconisWidth(CAPACITIES)).toBeCloseTo(width, 12);
    expect(h?.bins.reduce((s, b) => s + b.count, 0)).toBe(CAPACITIES.length);
  });

  it("spans the specification limits", () => {
    const h = histogram(CAPACITIES, { spec: { lsl: 1900, usl: 2100 } });
    expect(h?.bins[0]?.from).toBeLessThanOrEqual(1900);
    expect(h?.bins[h.bins.length - 1]?.to).toBeGreaterThan(2100);
    expect([h?.lsl, h?.usl]).toEqual([1900, 2100]);
  });

  it("counts Sturges bins as ⌈log2 n⌉ + 1 and falls back to it when the IQR is zero", () => {
    expect(sturgesBinCount(16)).toBe(5);
    expect(sturgesBinCount(100)).toBe(8);
    const h = histogram([1, 2, 2, 2, 2, 2, 2, 3]);
    expect(h?.rule).toBe("sturges");
    expect(h?.bins.reduce((s, b) => s + b.count, 0)).toBe(8);
  });

  it("caps the number of bins", () => {
    const h = histogram(CAPACITIES, { spec: { lsl: 0 }, maxBins: 20 });
    expect(h?.bins.length).toBeLessThanOrEqual(21);
  });
});

describe("batch report", () => {
  it("flags a planted low cell and reports one-sided capability against rated capacity", () => {
    const cells = [...CAPACITIES, 1850].map((capacity_mAh, i) => ({ serial: `K-${String(i + 1).padStart(3, "0")}`, capacity_mAh }));
    const r = analyzeBatch(cells, { spec: { lsl: 1950 } });
    expect(r.summary?.n).toBe(13);
    expect(r.capability?.index).toBe("Cpl");
    expect(r.grubbs?.outlierSerials).toEqual(["K-013"]);
    const low = r.cells.find((c) => c.serial === "K-013");
    expect(low?.belowLsl).toBe(true);
    expect(low?.grubbsOutlier).toBe(true);
    expect(low?.fence).toBe("extreme low");
    expect(low?.z).toBeLessThan(-3);
    expect(r.cells.filter((c) => c.grubbsOutlier)).toHaveLength(1);
    expect(r.histogram?.lsl).toBe(1950);
  });

  it("handles an empty batch without throwing", () => {
    const r = analyzeBatch([]);
    expect(r.summary).toBeNull();
    expect(r.capability).toBeNull();
    expect(r.grubbs).toBeNull();
    expect(r.histogram).toBeNull();
  });
});
