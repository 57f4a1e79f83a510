/**
 * Safety findings on constructed logs. Limits are facts of the trade (4.2 V charge limit, 3.0 V
 * empty: common practice, no source; 0–45 °C charge window: public LiPo spec via the domain notes).
 */
import { describe, expect, it } from "vitest";
import { protocol, simulate } from "@/tests/support/sim";
import { constructLog } from "@/tests/support/sim/constructed";
import { analyseSamples } from "@/tests/support/sim/run-analyzer";
import { createAnalyzer } from "@/lib/analysis";
import { toBatches } from "@/tests/support/sim";
import type { CellLimits } from "@/lib/analysis/types";

const limits: CellLimits = {
  ratedCapacity_mAh: 2000,
  chargeVoltageLimit_V: 4.2,
  dischargeCutoff_V: 3.0,
  maxChargeC: 1,
  maxDischargeC: 2,
  terminationC: 0.05,
  chargeTemp_C: { min: 0, max: 45 },
  dischargeTemp_C: { min: -20, max: 60 },
};

const find = (out: ReturnType<typeof analyseSamples>, kind: string) => out.safety.filter((f) => f.kind === kind);

describe("safety findings", () => {
  it("reports over-voltage with its start, end, worst value and a caution", () => {
    const log = constructLog(
      [
        { duration_s: 300, i: 1, v: 4.2 },
        { duration_s: 20, i: 1, v: (t) => (t < 10 ? 4.3 : 4.35) },
        { duration_s: 300, i: 1, v: 4.2 },
      ],
      1,
    );
    const out = analyseSamples(log, limits);
    const f = find(out, "over-voltage");
    expect(f).toHaveLength(1);
    expect(f[0]?.time_s).toBe(300);
    expect(f[0]?.end_s).toBe(319);
    expect(f[0]?.value).toBeCloseTo(4.35, 9);
    expect(f[0]?.limit).toBe(4.2);
    expect(f[0]?.severity).toBe("danger");
    expect(f[0]?.caution).toMatch(/data sheet/);
    expect(f[0]?.caution).toMatch(/local codes/);
  });

  it("ignores one- and two-sample spikes", () => {
    const log = constructLog(
      [
        { duration_s: 300, i: 1, v: 4.2 },
        { duration_s: 1, i: 1, v: 4.5 },
        { duration_s: 300, i: 1, v: 4.2 },
        { duration_s: 2, i: 1, v: 4.5 },
        { duration_s: 300, i: 1, v: 4.2 },
      ],
      1,
    );
    expect(find(analyseSamples(log, limits), "over-voltage")).toHaveLength(0);
  });

  it("merges violations a few seconds apart into one finding", () => {
    const log = constructLog(
      [
        { duration_s: 100, i: 1, v: 4.2 },
        { duration_s: 5, i: 1, v: 4.3 },
        { duration_s: 3, i: 1, v: 4.2 },
        { duration_s: 5, i: 1, v: 4.4 },
        { duration_s: 100, i: 1, v: 4.2 },
      ],
      1,
    );
    const f = find(analyseSamples(log, limits), "over-voltage");
    expect(f).toHaveLength(1);
    expect(f[0]?.time_s).toBe(100);
    expect(f[0]?.end_s).toBe(112);
    expect(f[0]?.value).toBeCloseTo(4.4, 9);
  });

  it("reports under-voltage below the cut-off", () => {
    const log = constructLog([{ duration_s: 100, i: -1, v: 3.2 }, { duration_s: 30, i: -1, v: 2.8 }, { duration_s: 60, i: 0, v: 3.1 }], 1);
    const f = find(analyseSamples(log, limits), "under-voltage");
    expect(f).toHaveLength(1);
    expect(f[0]?.time_s).toBe(100);
    expect(f[0]?.value).toBeCloseTo(2.8, 9);
  });

  it("reports charge and discharge over-current against the C-rate limits (1C = rated capacity in mA)", () => {
    // 1C of 2000 mAh is 2 A (common practice, no source): 3 A charge exceeds 1C, 5 A discharge exceeds 2C.
    const log = constructLog(
      [
        { duration_s: 60, i: 0, v: 3.8 },
        { duration_s: 60, i: 3, v: 3.9 },
        { duration_s: 60, i: 0, v: 3.8 },
        { duration_s: 60, i: -5, v: 3.6 },
        { duration_s: 60, i: -3.9, v: 3.6 },
        { duration_s: 60, i: 0, v: 3.8 },
      ],
      1,
    );
    const out = analyseSamples(log, limits);
    const c = find(out, "charge-over-current");
    const d = find(out, "discharge-over-current");
    expect(c).toHaveLength(1);
    expect(c[0]?.time_s).toBe(60);
    expect(c[0]?.value).toBeCloseTo(3, 9);
    expect(c[0]?.limit).toBe(2);
    // 1.5 × the limit exactly is still a warning; above it is danger (our grading).
    expect(c[0]?.severity).toBe("warning");
    expect(d).toHaveLength(1);
    expect(d[0]?.time_s).toBe(180);
    expect(d[0]?.end_s).toBe(239);
    expect(d[0]?.value).toBeCloseTo(5, 9);
    expect(d[0]?.limit).toBe(4);
    expect(d[0]?.severity).toBe("warning");
  });

  it("checks temperature against the charge window only while charging, the discharge window while discharging", () => {
    const log = constructLog(
      [
        { duration_s: 120, i: 0, v: 3.8, temp: 50 },
        { duration_s: 120, i: 1, v: 3.9, temp: (t) => (t < 60 ? 30 : 50) },
        { duration_s: 120, i: -1, v: 3.7, temp: 50 },
        { duration_s: 120, i: -1, v: 3.7, temp: 66 },
      ],
      1,
      true,
    );
    const out = analyseSamples(log, limits);
    const c = find(out, "charge-temperature");
    expect(c).toHaveLength(1);
    expect(c[0]?.time_s).toBe(180);
    expect(c[0]?.value).toBeCloseTo(50, 9);
    expect(c[0]?.limit).toBe(45);
    const d = find(out, "discharge-temperature");
    expect(d).toHaveLength(1);
    expect(d[0]?.time_s).toBe(360);
    expect(d[0]?.value).toBeCloseTo(66, 9);
    // More than 5 °C above the window is danger (our grading).
    expect(d[0]?.severity).toBe("danger");
  });

  it("reports a CV phase that did not reach its termination current", () => {
    const sim = simulate(protocol().ccCharge(0.5, 4.2).cvHold(4.2, 0.05, 200).rest(600).ccDischarge(0.5, 3).build(), { ratedCapacity_mAh: 2000 });
    const a = createAnalyzer({ limits });
    for (const b of toBatches(sim.samples)) a.push(b);
    const { report } = a.finish({ detection: null, findings: [], rows: 0, bytes: 0, path: "test" });
    const f = report.findings.filter((x) => x.kind === "cv-not-terminated");
    expect(f).toHaveLength(1);
    const cvEnd = sim.truth.steps[1]?.end_s ?? 0;
    expect(Math.abs((f[0]?.time_s ?? 0) - cvEnd)).toBeLessThanOrEqual(1);
    expect(f[0]?.limit).toBeCloseTo(0.1, 9);
    expect(f[0]?.value ?? 0).toBeGreaterThan(0.1);
  });

  it("finds nothing on a normal noisy CC-CV cycle inside the limits", () => {
    const sim = simulate(protocol().ccCvCharge(0.5, 4.2, 0.05).rest(600).ccDischarge(0.5, 3.0).rest(600).build(), {
      ratedCapacity_mAh: 2000,
      voltageNoise_V: 0.02,
      currentNoise_A: 0.05,
      seed: 21,
    });
    expect(analyseSamples(sim.samples, limits).safety).toEqual([]);
  });
});
