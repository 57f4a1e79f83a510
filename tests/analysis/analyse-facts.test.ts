/**
 * Facts of the trade as check values (common practice, no source, unless a source is named).
 */
import { describe, expect, it } from "vitest";
import { chemistryDefaults } from "@/lib/analysis";
import { simulate, standardCycles } from "@/tests/support/sim";
import { constructLog } from "@/tests/support/sim/constructed";
import { analyseSamples } from "@/tests/support/sim/run-analyzer";

describe("facts of the trade", () => {
  it("uses 4.2 V / 3.0 V / 3.7 V for lithium-cobalt-type cells and 3.65 V / 2.5 V / 3.2 V for LFP", () => {
    // 4.2 V charge limit, about 3.0 V empty, 3.7 V nominal: common practice, no source.
    expect(chemistryDefaults.lipo).toMatchObject({ chargeVoltageLimit_V: 4.2, dischargeCutoff_V: 3.0, nominalVoltage_V: 3.7 });
    expect(chemistryDefaults.nmc).toMatchObject({ chargeVoltageLimit_V: 4.2, dischargeCutoff_V: 3.0, nominalVoltage_V: 3.7 });
    // LFP 3.65 V limit (LFP data sheets per the domain notes), 2.5 V cut-off (notes: 2.0–2.5 V), 3.2 V nominal (common practice).
    expect(chemistryDefaults.lfp).toMatchObject({ chargeVoltageLimit_V: 3.65, dischargeCutoff_V: 2.5, nominalVoltage_V: 3.2 });
    // NiMH 1.2 V nominal (common practice).
    expect(chemistryDefaults.nimh.nominalVoltage_V).toBe(1.2);
  });

  it("treats 1C as the rated capacity in mA: 1C on 2000 mAh is 2 A and empties the cell in about an hour", () => {
    const sim = simulate(standardCycles(1, { dischargeC: 1 }), { ratedCapacity_mAh: 2000 });
    const out = analyseSamples(sim.samples, { ratedCapacity_mAh: 2000, terminationC: 0.05 });
    const d = out.cycles[0]?.discharge;
    expect(d?.current_A).toBeCloseTo(-2, 6);
    expect((d?.duration_s ?? 0) / 3600).toBeGreaterThan(0.85);
    expect((d?.duration_s ?? 0) / 3600).toBeLessThan(1.15);
  });

  it("labels a final CV current of 100 mA on a 2000 mAh cell as C/20", () => {
    // C/20 of 2000 mAh = 100 mA (domain notes, "Units and rates").
    const log = constructLog(
      [
        { duration_s: 1200, i: 1, v: (t) => 3.9 + t / 4000 },
        { duration_s: 1800, i: (t) => 0.1 + 0.9 * Math.exp(-t / 300), v: 4.2 },
        { duration_s: 600, i: 0, v: 4.15 },
      ],
      1,
    );
    const out = analyseSamples(log, { ratedCapacity_mAh: 2000, terminationC: 0.05 });
    const cv = out.cycles[0]?.charge?.cv;
    expect(cv?.final_current_label).toBe("C/20");
    // The taper rows run τ = 0..1799 s; the median of the last 9 is the one at τ = 1795 s.
    expect(cv?.final_current_A).toBeCloseTo(0.1 + 0.9 * Math.exp(-1795 / 300), 9);
    expect(cv?.ended_by).toBe("termination-current");
    // The voltage reaches 4.2 V at 1200 s; the current first falls on the row after, so the switch is placed within one row.
    expect(Math.abs((out.cycles[0]?.charge?.transition?.time_s ?? 0) - 1200)).toBeLessThanOrEqual(1);
  });

  it("sees a simulated CC-CV charge switch at about 4.2 V and a discharge end near 3.0 V, mean near 3.7 V", () => {
    const sim = simulate(standardCycles(1), { ratedCapacity_mAh: 2000 });
    const out = analyseSamples(sim.samples, { ratedCapacity_mAh: 2000 });
    expect(out.cycles[0]?.charge?.transition?.voltage_V).toBeCloseTo(4.2, 2);
    const dis = out.steps.find((s) => s.kind === "constant-current discharge");
    expect(dis?.end_voltage_V).toBeCloseTo(3.0, 1);
    expect(Math.abs((out.cycles[0]?.discharge?.mean_voltage_V ?? 0) - 3.7)).toBeLessThan(0.15);
  });
});
