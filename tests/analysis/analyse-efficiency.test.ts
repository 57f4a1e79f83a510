import { describe, expect, it } from "vitest";
import { analyseSamples } from "../support/sim/run-analyzer";
import { protocol, simulate } from "../support/sim";
import { assembleReport } from "@/lib/analysis/report";

/*
 * Coulombic efficiency is Q_discharge / Q_charge of the same cycle (domain notes, "Analysis
 * methods"). A capacity check first empties the cell (IEC 61960-3 §7.2 as summarised in the
 * domain notes, from memory): that first discharge has no charge of its own and must not count.
 */
describe("whole-log efficiencies", () => {
  it("count only cycles that have both a charge and a discharge", () => {
    const plan = protocol().ccDischarge(0.2, 3.0).rest(600).ccCvCharge(0.5, 4.2, 0.05).rest(600).ccDischarge(0.2, 3.0).build();
    const { samples, truth } = simulate(plan, { ratedCapacity_mAh: 1000, initialSoc: 0.5, logInterval_s: 10, thermal: false });
    const limits = { ratedCapacity_mAh: 1000, chargeVoltageLimit_V: 4.2, dischargeCutoff_V: 3.0, terminationC: 0.05 };
    const report = assembleReport(analyseSamples(samples, limits), null, limits);
    const complete = truth.cycles.find((c) => c.charge && c.discharge);
    if (!complete) throw new Error("the protocol has a complete cycle");
    const expected = complete.discharged_mAh / complete.charged_mAh;
    expect(report.totals.discharged_mAh).toBeGreaterThan(report.totals.charged_mAh);
    expect(report.totals.coulombic_efficiency).toBeLessThanOrEqual(1);
    expect(report.totals.coulombic_efficiency).toBeCloseTo(expected, 2);
  });
});
