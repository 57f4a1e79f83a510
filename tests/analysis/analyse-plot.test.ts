/**
 * Plot series: at most 2,000 points per trace (LTTB, Steinarsson 2013, after min/max bucketing),
 * with the samples either side of each step edge and of each CC→CV switch present exactly.
 */
import { describe, expect, it } from "vitest";
import { createAnalyzer, type AnalysisOutput } from "@/lib/analysis";
import { simulate, standardCycles, toBatches, type SampledSeries } from "@/tests/support/sim";

function run(s: SampledSeries): AnalysisOutput {
  const a = createAnalyzer({ limits: { ratedCapacity_mAh: 2000, terminationC: 0.05 } });
  for (const b of toBatches(s, { batchSize: 4096 })) a.push(b);
  return a.finish({ detection: null, findings: [], rows: s.length, bytes: 0, path: "test" });
}

/** True when the trace holds the point (x, y) exactly. */
function holds(trace: { x: number[]; y: number[] }, x: number, y: number): boolean {
  for (let k = 0; k < trace.x.length; k++) if (trace.x[k] === x && trace.y[k] === y) return true;
  return false;
}

describe("plot series", () => {
  const sim = simulate(standardCycles(3), { ratedCapacity_mAh: 2000, voltageNoise_V: 0.005, currentNoise_A: 0.005, seed: 4, thermal: { ambient_C: 23, heatCapacity_J_per_K: 40, conductance_W_per_K: 0.08 } });
  const s = sim.samples;
  const out = run(s);
  const series = out.series;

  it("keeps every trace within 2,000 points although the log has ~52,000 rows", () => {
    expect(s.length).toBeGreaterThan(50000);
    expect(series.voltage.x.length).toBeLessThanOrEqual(2000);
    expect(series.current.x.length).toBeLessThanOrEqual(2000);
    expect(series.temperature?.x.length ?? 0).toBeLessThanOrEqual(2000);
    expect(series.voltage.x.length).toBeGreaterThan(1000);
    for (let k = 1; k < series.voltage.x.length; k++) expect((series.voltage.x[k] ?? 0) >= (series.voltage.x[k - 1] ?? 0)).toBe(true);
    // JSON-serialisable as it is.
    expect(JSON.parse(JSON.stringify(series))).toEqual(series);
  });

  it("holds the samples either side of every step edge and of every switch exactly", () => {
    const times = [...out.report.steps.slice(1).map((st) => st.start_s), ...out.report.cycles.map((c) => c.charge?.transition?.time_s ?? NaN).filter((x) => x === x)];
    expect(times.length).toBeGreaterThan(12);
    for (const edge of times) {
      let b = 0;
      while ((s.t[b] ?? Infinity) < edge) b++;
      const before = b - 1;
      for (const k of [before, b]) {
        expect(holds(series.voltage, s.t[k] ?? NaN, s.v[k] ?? NaN)).toBe(true);
        expect(holds(series.current, s.t[k] ?? NaN, s.i[k] ?? NaN)).toBe(true);
      }
    }
    expect(series.switch_points).toHaveLength(3);
  });

  it("gives voltage against capacity per step, ending at the step's capacity", () => {
    const cc = series.capacity_curves.filter((c) => c.kind === "constant-current discharge");
    expect(cc).toHaveLength(3);
    for (const c of cc) {
      const step = out.report.steps.find((st) => st.step === c.step);
      expect(c.capacity_mAh.length).toBeLessThanOrEqual(400);
      expect(c.capacity_mAh[c.capacity_mAh.length - 1]).toBeCloseTo(step?.discharged_mAh ?? NaN, 6);
      expect(c.voltage_V[0] ?? 0).toBeGreaterThan(c.voltage_V[c.voltage_V.length - 1] ?? 0);
    }
  });

  it("gives dQ/dV of constant-current steps on a 5 mV grid that integrates back to the step capacity", () => {
    const ica = series.incremental_capacity.filter((c) => c.kind === "constant-current discharge");
    expect(ica).toHaveLength(3);
    for (const c of ica) {
      const step = out.report.steps.find((st) => st.step === c.step);
      const dv = (c.voltage_V[1] ?? 0) - (c.voltage_V[0] ?? 0);
      expect(dv).toBeCloseTo(0.005, 9);
      const area = c.dQdV_mAh_per_V.reduce((a, y) => a + y * dv, 0);
      // Smoothing moves charge between bins but keeps the total, except a little at the two ends.
      expect(Math.abs(area - (step?.discharged_mAh ?? 0)) / (step?.discharged_mAh ?? 1)).toBeLessThan(0.02);
      expect(c.c_rate).toBeCloseTo(0.5, 2);
    }
  });
});
