import { describe, expect, it } from "vitest";
import { openCircuitVoltage, protocol, simulate, standardCycles } from "@/tests/support/sim";

describe("simulator (Thevenin model, Chen & Rincón-Mora 2006 coefficients)", () => {
  it("reproduces the published open-circuit voltage polynomial at its end points", () => {
    // Voc(SOC) = −1.031·e^(−35·SOC) + 3.685 + 0.2156·SOC − 0.1178·SOC² + 0.3201·SOC³ (Chen & Rincón-Mora 2006, as in the domain notes)
    expect(openCircuitVoltage(1)).toBeCloseTo(-1.031 * Math.exp(-35) + 3.685 + 0.2156 - 0.1178 + 0.3201, 12);
    expect(openCircuitVoltage(0)).toBeCloseTo(3.685 - 1.031, 12);
    // A full cell rests below the 4.2 V charge limit and an empty one below 3.7 V nominal (common practice, no source).
    expect(openCircuitVoltage(1)).toBeLessThan(4.2);
    expect(openCircuitVoltage(0.02)).toBeLessThan(3.7);
  });

  it("gives I·t/3.6 mAh for a constant-current step (analytic, domain notes)", () => {
    const r = simulate(protocol().pulse(0.5, 1800).build(), { ratedCapacity_mAh: 2000 });
    const s = r.truth.steps[0];
    // 0.5C of 2000 mAh is 1 A (1C = rated capacity in mA, common practice, no source); 1 A for 1800 s = 500 mAh.
    expect(s?.charged_mAh).toBeCloseTo(500, 9);
    expect(r.samples.length).toBe(1801);
  });

  it("holds the CV voltage and ends the hold at the termination current", () => {
    const r = simulate(standardCycles(1), { ratedCapacity_mAh: 2000 });
    const charge = r.truth.cycles[0]?.charge;
    expect(charge?.transition?.voltage_V).toBeCloseTo(4.2, 9);
    expect(charge?.cvEndedBy).toBe("current");
    // C/20 of 2000 mAh = 100 mA (termination current, domain notes).
    expect(charge?.finalCvCurrent_A).toBeGreaterThan(0.095);
    expect(charge?.finalCvCurrent_A).toBeLessThanOrEqual(0.1);
    const s = r.samples;
    for (let k = 0; k < s.length; k++) {
      if (s.step[k] === 2) expect(Math.abs((s.v[k] ?? 0) - 4.2)).toBeLessThan(1e-6);
    }
    // The whole log's charge is conserved between steps and cycles.
    const sum = r.truth.steps.reduce((a, x) => a + x.charged_mAh, 0);
    expect(r.truth.totals.charged_mAh).toBeCloseTo(sum, 9);
  });

  it("adds seeded noise of the requested size and fades capacity linearly", () => {
    const a = simulate(protocol().rest(2000).build(), { currentNoise_A: 0.05, voltageNoise_V: 0.02, seed: 7 });
    const b = simulate(protocol().rest(2000).build(), { currentNoise_A: 0.05, voltageNoise_V: 0.02, seed: 7 });
    expect(Array.from(a.samples.i)).toEqual(Array.from(b.samples.i));
    let ss = 0;
    for (let k = 0; k < a.samples.length; k++) ss += (a.samples.i[k] ?? 0) ** 2;
    expect(Math.sqrt(ss / a.samples.length)).toBeGreaterThan(0.045);
    expect(Math.sqrt(ss / a.samples.length)).toBeLessThan(0.055);
    const faded = simulate(standardCycles(3), { fadePerCycle: 0.1 });
    const d = faded.truth.cycles.map((c) => c.discharge?.mAh ?? 0);
    expect(d[2] ?? 0).toBeLessThan((d[0] ?? 0) * 0.85);
  });

  it("drops rows and leaves gaps where asked, with truthful timestamps", () => {
    const r = simulate(protocol().rest(3600).build(), { dropProbability: 0.1, gaps: [{ start_s: 1000, duration_s: 300 }], jitter: 0.3, seed: 3 });
    const s = r.samples;
    expect(s.length).toBeLessThan(0.93 * 3600);
    expect(s.length).toBeGreaterThan(0.85 * 3600 - 300);
    for (let k = 1; k < s.length; k++) {
      expect((s.t[k] ?? 0) > (s.t[k - 1] ?? 0)).toBe(true);
      expect((s.t[k] ?? 0) >= 1000 && (s.t[k] ?? 0) < 1300).toBe(false);
    }
  });
});
