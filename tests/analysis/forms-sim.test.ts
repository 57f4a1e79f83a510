/**
 * The input forms over the cell simulator's output (tests/support/sim): a
 * noisy, temperature-logging CC-CV cycling log reads back within the written
 * precision from every form, on both paths alike.
 */
import { describe, expect, it } from "vitest";
import { logForms, readAll, readErrors } from "../support/log-forms";
import { simulate, standardCycles } from "../support/sim";

const sim = simulate(standardCycles(2), { logInterval_s: 5, voltageNoise_V: 0.001, currentNoise_A: 0.002, seed: 7 });
const forms = logForms(sim.samples);

describe("simulated cycling log in every input form", () => {
  it("is long enough to hold both cycles", () => {
    expect(sim.samples.length).toBeGreaterThan(5000);
    expect(sim.samples.temp).not.toBeNull();
  });

  for (const form of forms) {
    it(form.name, async () => {
      const bytes = form.render();
      const fast = await readAll(bytes, { parser: "fast" });
      const papa = await readAll(bytes, { parser: "papaparse", chunkSize: 3001 });
      const e = readErrors(form, fast, sim.samples);
      expect(e.rows).toBe(sim.samples.length);
      expect(e.t).toBeLessThanOrEqual(2 * form.tolerance.t);
      expect(e.v).toBeLessThanOrEqual(form.tolerance.v);
      expect(e.i).toBeLessThanOrEqual(form.tolerance.i);
      expect(e.temp).toBeLessThanOrEqual(form.tolerance.temp);
      expect(e.lines.read).toEqual(e.lines.written);
      expect(fast.summary.detection.currentSign).toBe(form.expected.currentSign);
      expect([papa.t, papa.v, papa.i, papa.temp]).toEqual([fast.t, fast.v, fast.i, fast.temp]);
    });
  }
});
