/**
 * DC internal resistance per IEC 61960-3 §7.7 (domain notes, from memory):
 * I1 = 0.2 It for 10 s, then I2 = 1 It for 1 s; R_dc = (U1 − U2) / (I2 − I1).
 */
import { describe, expect, it } from "vitest";
import { protocol, simulate } from "@/tests/support/sim";
import { constructLog } from "@/tests/support/sim/constructed";
import { analyseSamples } from "@/tests/support/sim/run-analyzer";

// A purely ohmic cell: U = E − R·|I| while discharging, so the formula must return R exactly.
const E = 3.85;
const R = 0.045; // 45 mΩ, our invented value
const It = 2.6; // It = C/1 h for a 2600 mAh cell (IEC 61434, via the domain notes)

function ohmicPulseLog(dt: number) {
  return constructLog(
    [
      { duration_s: 60, i: 0, v: E },
      { duration_s: 10, i: -0.2 * It, v: (_t, i) => E + R * i },
      { duration_s: 1, i: -It, v: (_t, i) => E + R * i },
      { duration_s: 60, i: 0, v: E },
    ],
    dt,
  );
}

describe("DC internal resistance", () => {
  it("applies the IEC 61960-3 two-level formula to a constructed pulse with a known resistance", () => {
    const out = analyseSamples(ohmicPulseLog(0.1), { ratedCapacity_mAh: 2600 });
    const iec = out.resistance.iec;
    expect(iec).toHaveLength(1);
    const r = iec[0];
    if (!r) throw new Error("no IEC result");
    expect(r.resistance_mOhm).toBeCloseTo(45, 6);
    expect(r.i1_A).toBeCloseTo(0.2 * It, 9);
    expect(r.i2_A).toBeCloseTo(It, 9);
    // U1 is read at the end of the 10 s level, U2 at the end of the 1 s level.
    expect(r.u1_time_s).toBeCloseTo(69.9, 6);
    expect(r.u2_time_s).toBeCloseTo(70.9, 6);
    expect(r.time_s).toBeCloseTo(70, 6);
    expect((r.u1_V - r.u2_V) / (r.i2_A - r.i1_A)).toBeCloseTo(R, 9);
  });

  it("recognises the sequence without a rated capacity from the 1:5 current ratio", () => {
    const out = analyseSamples(ohmicPulseLog(0.1), {});
    expect(out.resistance.iec[0]?.resistance_mOhm).toBeCloseTo(45, 6);
  });

  it("does not call other pulses an IEC sequence", () => {
    const log = constructLog(
      [
        { duration_s: 60, i: 0, v: E },
        { duration_s: 30, i: -0.2 * It, v: (_t, i) => E + R * i },
        { duration_s: 1, i: -It, v: (_t, i) => E + R * i },
        { duration_s: 60, i: 0, v: E },
      ],
      0.1,
    );
    expect(analyseSamples(log, { ratedCapacity_mAh: 2600 }).resistance.iec).toHaveLength(0);
  });

  it("estimates the resistance at every sharp current step from the voltage either side", () => {
    const out = analyseSamples(ohmicPulseLog(0.1), { ratedCapacity_mAh: 2600 });
    const edges = out.resistance.edges;
    expect(edges.length).toBe(3);
    for (const e of edges) expect(e.resistance_mOhm).toBeCloseTo(45, 6);
  });

  it("matches the simulator's noise-free U1, U2 within 1 % at 0.1 s logging", () => {
    const sim = simulate(protocol().rest(600).iecDcResistance().rest(600).build(), { ratedCapacity_mAh: 2000, logInterval_s: 0.1, initialSoc: 0.6 });
    const truth = sim.truth.currentSteps.find((s) => Math.abs(s.i1_A + 0.4) < 1e-9 && Math.abs(s.i2_A + 2) < 1e-9);
    const got = analyseSamples(sim.samples, { ratedCapacity_mAh: 2000 }).resistance.iec[0];
    if (!truth || !got) throw new Error("missing");
    expect(Math.abs(got.resistance_mOhm - truth.resistance_ohm * 1000) / (truth.resistance_ohm * 1000)).toBeLessThan(0.01);
  });
});
