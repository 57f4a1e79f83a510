/**
 * Trapezoidal charge and energy against analytic integrals (domain notes, "Analytic checks").
 */
import { describe, expect, it } from "vitest";
import { constructLog } from "@/tests/support/sim/constructed";
import { analyseSamples } from "@/tests/support/sim/run-analyzer";
import { createAnalyzer } from "@/lib/analysis";
import { toBatches } from "@/tests/support/sim";

const emptyRead = { detection: null, findings: [], rows: 0, bytes: 0, path: "test" };

describe("integration of current and power", () => {
  it("gives I·t/3.6 mAh exactly for a constant current (analytic)", () => {
    // 1.25 A for 7200 s = 9000 A·s = 2500 mAh; at a constant 3.9 V that is 9.75 Wh.
    const log = constructLog([{ duration_s: 7200, i: 1.25, v: 3.9 }], 1);
    const out = analyseSamples(log, { ratedCapacity_mAh: 2500 });
    const charged = out.steps.reduce((a, s) => a + s.charged_mAh, 0);
    const wh = out.steps.reduce((a, s) => a + s.charged_Wh, 0);
    expect(charged).toBeCloseTo((1.25 * 7200) / 3.6, 9);
    expect(wh).toBeCloseTo((1.25 * 7200 * 3.9) / 3600, 9);
    expect(out.steps[0]?.kind).toBe("constant-current charge");
  });

  it("gives a discharge of I·t/3.6 mAh at uneven (jittered) intervals", () => {
    const log = constructLog([{ duration_s: 3600, i: -2, v: 3.7 }], 0.5);
    // Move every other timestamp by 0.2 s: a constant current stays exact under the trapezoid rule.
    for (let k = 1; k < log.length - 1; k += 2) log.t[k] = (log.t[k] ?? 0) + 0.2;
    const out = analyseSamples(log, {});
    const discharged = out.steps.reduce((a, s) => a + s.discharged_mAh, 0);
    expect(discharged).toBeCloseTo((2 * 3600) / 3.6, 9);
  });

  it("integrates an exponential taper I0·e^(−t/τ) within the trapezoid error bound (closed form)", () => {
    // ∫0^T I0 e^(−t/τ) dt = I0·τ·(1 − e^(−T/τ)); the composite trapezoid error is at most
    // T·h²·max|f''|/12 = T·h²·I0/(12τ²) (standard numerical analysis result).
    const I0 = 1.5;
    const tau = 600;
    const T = 3600;
    const h = 1;
    const log = constructLog([{ duration_s: T, i: (t) => I0 * Math.exp(-t / tau), v: 4.2 }], h);
    const out = analyseSamples(log, { ratedCapacity_mAh: 3000 });
    const exact = (I0 * tau * (1 - Math.exp(-T / tau))) / 3.6;
    const bound = (T * h * h * I0) / (12 * tau * tau) / 3.6;
    const got = out.steps.reduce((a, s) => a + s.charged_mAh, 0);
    expect(Math.abs(got - exact)).toBeLessThanOrEqual(bound);
    // The bound is tight enough to matter: the error is not zero.
    expect(Math.abs(got - exact)).toBeGreaterThan(bound / 100);
  });

  it("gives the same totals however the samples are batched", () => {
    const log = constructLog(
      [
        { duration_s: 1800, i: 1, v: (t) => 3.6 + t / 18000 },
        { duration_s: 600, i: 0, v: 3.75 },
        { duration_s: 1800, i: -1, v: (t) => 3.75 - t / 18000 },
      ],
      1,
    );
    const totals = [1, 7, 65536].map((size) => {
      const a = createAnalyzer({ limits: { ratedCapacity_mAh: 2000 } });
      for (const b of toBatches(log, { batchSize: size })) a.push(b);
      return a.finish(emptyRead).report.totals;
    });
    expect(totals[1]).toEqual(totals[0]);
    expect(totals[2]).toEqual(totals[0]);
    // By hand with the trapezoid rule: rows at 0..1799 s carry 1 A, the row at 1800 s is the rest,
    // so the charge is 1799 A·s plus half of the last interval, 0.5 A·s; the discharge rows 2400..4200 s
    // give 1800 A·s plus half of the interval into it.
    expect(totals[0]?.charged_mAh).toBeCloseTo(1799.5 / 3.6, 9);
    expect(totals[0]?.discharged_mAh).toBeCloseTo(1800.5 / 3.6, 9);
    expect(totals[0]?.coulombic_efficiency).toBeCloseTo(1800.5 / 1799.5, 12);
  });
});
