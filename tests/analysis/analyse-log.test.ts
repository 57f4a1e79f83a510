/**
 * analyzeLog end to end: text through the reader (lib/analysis/read) into the analyser, checked
 * against the simulator's ground truth and against the analyser fed the same samples directly.
 */
import { describe, expect, it } from "vitest";
import { analyzeLog, createAnalyzer } from "@/lib/analysis";
import { protocol, simulate, toBatches, toCsv } from "@/tests/support/sim";

async function* chunks(text: string, size: number): AsyncGenerator<Uint8Array> {
  const bytes = new TextEncoder().encode(text);
  for (let k = 0; k < bytes.length; k += size) yield bytes.subarray(k, k + size);
}

const plan = protocol()
  .repeat(2, (b) => {
    b.ccCvCharge(0.5, 4.2, 0.05).rest(1800).iecDcResistance().rest(600).ccDischarge(0.5, 3.0).rest(600);
  })
  .build();
const limits = { ratedCapacity_mAh: 2000, chargeVoltageLimit_V: 4.2, dischargeCutoff_V: 3.0, terminationC: 0.05 };

describe("analyzeLog", () => {
  const sim = simulate(plan, { ratedCapacity_mAh: 2000, voltageNoise_V: 0.003, currentNoise_A: 0.003, seed: 17 });

  it("reads and analyses a CSV in one pass, matching the ground truth within 0.5 %", async () => {
    const { report, series } = await analyzeLog(chunks(toCsv(sim.samples, { withStepColumn: true }), 50_000), { fileName: "sim.csv", limits });
    expect(report.status).toBe("ok");
    expect(report.read?.rows).toBe(sim.samples.length);
    expect(report.cycles).toHaveLength(2);
    for (let k = 0; k < 2; k++) {
      const t = sim.truth.cycles[k];
      const c = report.cycles[k];
      if (!t || !c || !t.charge || !t.discharge || !c.charge || !c.discharge) throw new Error("missing cycle parts");
      expect(Math.abs(c.charge.mAh - t.charge.mAh) / t.charge.mAh).toBeLessThan(0.005);
      expect(Math.abs(c.discharge.mAh - t.discharge.mAh) / t.discharge.mAh).toBeLessThan(0.005);
      expect(Math.abs(c.discharged_mAh - t.discharged_mAh) / t.discharged_mAh).toBeLessThan(0.005);
      expect(Math.abs((c.charge.transition?.time_s ?? 0) - (t.charge.transition?.time_s ?? 0))).toBeLessThanOrEqual(3);
    }
    // The pulses are not mistaken for a discharge that closes the cycle; they show up as "other",
    // one step per logged step (0.2 It for 10 s, 1 It for 1 s) in each cycle.
    const pulses = report.steps.filter((s) => s.kind === "other");
    expect(pulses).toHaveLength(4);
    expect(pulses.map((p) => Math.round(p.duration_s))).toEqual([10, 1, 10, 1]);
    // With 1 s rows the IEC 61960-3 sequence is still recognised.
    expect(report.dcir.filter((d) => d.method === "IEC 61960-3 DC")).toHaveLength(2);
    expect(report.findings.filter((f) => f.caution !== "")).toEqual([]);
    expect(series.voltage.x.length).toBeLessThanOrEqual(2000);
  });

  it("gives the same report as the analyser fed the rounded samples directly", async () => {
    const csv = toCsv(sim.samples);
    const viaReader = await analyzeLog(chunks(csv, 8192), { limits });
    // Parse the same rounded text back by hand, so both paths see identical numbers.
    const lines = csv.trim().split("\n").slice(1);
    const s = { ...sim.samples, t: new Float64Array(lines.length), v: new Float64Array(lines.length), i: new Float64Array(lines.length), temp: new Float64Array(lines.length), length: lines.length };
    lines.forEach((l, k) => {
      const [a, b, c, d] = l.split(",").map(Number);
      s.t[k] = a ?? NaN;
      s.v[k] = b ?? NaN;
      s.i[k] = c ?? NaN;
      s.temp[k] = d ?? NaN;
    });
    const direct = createAnalyzer({ limits });
    for (const b of toBatches(s)) direct.push(b);
    const d = direct.finish({ detection: null, findings: [], rows: s.length, bytes: 0, path: "test" }).report;
    expect(viaReader.report.totals.charged_mAh).toBeCloseTo(d.totals.charged_mAh, 6);
    expect(viaReader.report.totals.discharged_Wh).toBeCloseTo(d.totals.discharged_Wh, 6);
    expect(viaReader.report.steps.map((x) => x.kind)).toEqual(d.steps.map((x) => x.kind));
  });
});
