/**
 * End to end: every input form of a simulated cycling log, read and analysed by
 * analyzeLog, gives capacities within 0.5 % of the simulator's ground truth
 * (exact integrals of its internal current; tests/support/sim).
 */
import { describe, expect, it } from "vitest";
import { analyzeLog } from "@/lib/analysis";
import { chunked, logForms } from "../support/log-forms";
import { simulate, standardCycles } from "../support/sim";

const sim = simulate(standardCycles(2), { logInterval_s: 2, voltageNoise_V: 0.0005, currentNoise_A: 0.001, seed: 11 });
const truth = sim.truth;

function within(measured: number | null | undefined, expected: number, share = 0.005): void {
  expect(measured).not.toBeNull();
  expect(Math.abs((measured ?? Number.NaN) - expected)).toBeLessThanOrEqual(share * expected);
}

describe("analyzeLog on every input form of a simulated log", () => {
  for (const form of logForms(sim.samples)) {
    it(form.name, async () => {
      const { report } = await analyzeLog(chunked(form.render(), 65536));
      within(report.totals.charged_mAh, truth.totals.charged_mAh);
      within(report.totals.discharged_mAh, truth.totals.discharged_mAh);
      expect(report.per_cycle_discharge_mAh).toHaveLength(truth.cycles.length);
      truth.cycles.forEach((c, k) => within(report.per_cycle_discharge_mAh[k], c.discharged_mAh));
    });
  }
});
