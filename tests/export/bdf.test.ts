/**
 * The Battery Data Format export: labels as the public specification writes them, fixed units, the
 * current's sign, cumulative capacities against an analytic case, and the round trip export →
 * reader → analyser against the original log.
 */
import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { analyzeLog } from "@/lib/analysis";
import { readLog } from "@/lib/analysis/read";
import type { SampleBatch } from "@/lib/analysis/types";
import { bdfFileName, bdfLabels, createBdfWriter } from "@/lib/export/battery-data-format";
import { logStartUnixS } from "@/lib/export/bdf-start-time";
import { bdfStream } from "@/lib/export/bdf-stream";
import { streamInPieces } from "../support/byte-stream";
import { protocol, simulate, toCsv } from "../support/sim";

/** One batch from plain arrays (the reader's shape: step/cycle/temp null when the log has none). */
function batchOf(c: { t: number[]; v: number[]; i: number[]; temp?: number[]; step?: number[]; cycle?: number[] }): SampleBatch {
  const f = (xs: number[] | undefined) => (xs ? Float64Array.from(xs) : null);
  return {
    length: c.t.length,
    line: Int32Array.from(c.t.map((_, k) => k + 2)),
    t: Float64Array.from(c.t),
    v: Float64Array.from(c.v),
    i: Float64Array.from(c.i),
    temp: f(c.temp),
    step: f(c.step),
    cycle: f(c.cycle),
  };
}

function parse(text: string): { header: string[]; rows: Record<string, string>[] } {
  const result = Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true });
  return { header: result.meta.fields ?? [], rows: result.data };
}

async function* bytesOf(text: string): AsyncIterable<Uint8Array> {
  yield new TextEncoder().encode(text);
}

async function samplesOf(text: string) {
  const out = { t: [] as number[], v: [] as number[], i: [] as number[], temp: [] as number[], step: [] as number[] };
  const summary = await readLog(bytesOf(text), (b) => {
    for (let k = 0; k < b.length; k++) {
      out.t.push(b.t[k]!);
      out.v.push(b.v[k]!);
      out.i.push(b.i[k]!);
      if (b.temp) out.temp.push(b.temp[k]!);
      if (b.step) out.step.push(b.step[k]!);
    }
  });
  return { ...out, summary };
}

/** Indices where a step sequence changes value: the same steps whatever the numbering. */
function stepEdges(steps: number[]): number[] {
  return steps.flatMap((s, k) => (k > 0 && s !== steps[k - 1] ? [k] : []));
}

describe("the BDF header", () => {
  it("uses the specification's preferred labels, required ones first", () => {
    // Labels copied from the BDF README's tables (required, recommended, optional quantities).
    const text = createBdfWriter({ startUnixS: 1_780_000_000, ambientTempC: 23 }).write(
      batchOf({ t: [0], v: [3.7], i: [0.5], temp: [25], step: [1], cycle: [1] }),
    );
    expect(text.split("\n")[0]).toBe(
      "Test Time / s,Voltage / V,Current / A,Unix Time / s,Cycle Count / 1,Step Count / 1,Ambient Temperature / degC,Surface Temperature T1 / degC,Charging Capacity / Ah,Discharging Capacity / Ah",
    );
  });

  it("leaves out what the log does not have, and keeps every row as wide as the header", () => {
    const writer = createBdfWriter();
    const text = writer.write(batchOf({ t: [0, 1, 2], v: [3.7, 3.71, 3.72], i: [0.5, 0.5, 0.5] })) + writer.end();
    const { header, rows } = parse(text);
    expect(header).toEqual([bdfLabels.testTime, bdfLabels.voltage, bdfLabels.current, bdfLabels.chargingCapacity, bdfLabels.dischargingCapacity]);
    for (const line of text.trim().split("\n")) expect(line.split(",")).toHaveLength(header.length);
    expect(rows).toHaveLength(3);
  });

  it("still writes the header for a log with no samples", () => {
    expect(createBdfWriter().end()).toBe("Test Time / s,Voltage / V,Current / A,Charging Capacity / Ah,Discharging Capacity / Ah\n");
  });
});

describe("values, units and sign", () => {
  // Constant current, analytic: Q = I·t, and Ah = A·s / 3600 (mAh = A·s/3.6, domain notes).
  const charge = 0.5; // A
  const discharge = -0.25; // A
  const t: number[] = [];
  const i: number[] = [];
  for (let s = 0; s <= 3600; s += 10) {
    t.push(s);
    i.push(charge);
  }
  for (let s = 3610; s <= 3610 + 7200; s += 10) {
    t.push(s);
    i.push(discharge);
  }
  const v = t.map((s) => (s <= 3600 ? 3.6 + (0.6 * s) / 3600 : 4.1 - (1.0 * (s - 3610)) / 7200));
  const writer = createBdfWriter();
  const { rows } = parse(writer.write(batchOf({ t: t.slice(0, 200), v: v.slice(0, 200), i: i.slice(0, 200) })) + writer.write(batchOf({ t: t.slice(200), v: v.slice(200), i: i.slice(200) })) + writer.end());
  const at = (s: number) => rows.find((r) => Number(r[bdfLabels.testTime]) === s)!;

  it("writes current positive while charging, in amperes, as the reader delivers it", () => {
    expect(Number(at(100)[bdfLabels.current])).toBe(0.5);
    expect(Number(at(5000)[bdfLabels.current])).toBe(-0.25);
    expect(Number(at(3600)[bdfLabels.voltage])).toBeCloseTo(4.2, 9);
  });

  it("accumulates charging and discharging capacity as I·t/3600 Ah, across batch boundaries", () => {
    // 0.5 A for 1800 s = 0.25 Ah; for 3600 s = 0.5 Ah.
    expect(Number(at(1800)[bdfLabels.chargingCapacity])).toBeCloseTo((0.5 * 1800) / 3600, 9);
    expect(Number(at(3600)[bdfLabels.chargingCapacity])).toBeCloseTo((0.5 * 3600) / 3600, 9);
    expect(Number(at(3600)[bdfLabels.dischargingCapacity])).toBe(0);
    const last = rows[rows.length - 1]!;
    // The 10 s from 3600 s to 3610 s ramps from +0.5 A to −0.25 A: trapezoid parts 0.5·0.5·10 in and 0.5·0.25·10 out.
    expect(Number(last[bdfLabels.chargingCapacity])).toBeCloseTo((0.5 * 3600 + 2.5) / 3600, 9);
    expect(Number(last[bdfLabels.dischargingCapacity])).toBeCloseTo((0.25 * 7200 + 1.25) / 3600, 9);
  });

  it("counts steps monotonically even when the log's step numbers restart each cycle", () => {
    const w = createBdfWriter();
    const { rows: r } = parse(w.write(batchOf({ t: [0, 1, 2, 3, 4, 5], v: [3.7, 3.7, 3.7, 3.7, 3.7, 3.7], i: [1, 1, 0, 1, 1, 0], step: [1, 1, 2, 1, 1, 2], cycle: [1, 1, 1, 2, 2, 2] })));
    expect(r.map((x) => x[bdfLabels.stepCount])).toEqual(["1", "1", "2", "3", "3", "4"]);
    expect(r.map((x) => x[bdfLabels.cycleCount])).toEqual(["1", "1", "1", "2", "2", "2"]);
  });

  it("writes Unix time as the log's absolute start plus test time", () => {
    const w = createBdfWriter({ startUnixS: 1_780_000_000.25 });
    const { rows: r } = parse(w.write(batchOf({ t: [0, 10.5], v: [3.7, 3.71], i: [0.5, 0.5] })));
    expect(r.map((x) => Number(x[bdfLabels.unixTime]))).toEqual([1_780_000_000.25, 1_780_000_010.75]);
  });
});

describe("the log's absolute start", () => {
  it("is read from a first timestamp that names its zone", () => {
    const log = "time,voltage_V,current_A\n2026-06-01T08:00:00.500Z,3.70,0.5\n2026-06-01T08:00:10.500Z,3.71,0.5\n";
    // 2026-06-01T08:00:00Z = 1780300800 s (Date.UTC, ECMAScript epoch arithmetic).
    expect(logStartUnixS(new TextEncoder().encode(log))).toBe(Date.UTC(2026, 5, 1, 8, 0, 0) / 1000 + 0.5);
  });

  it("is unknown for a civil time without a zone, or elapsed time", () => {
    expect(logStartUnixS(new TextEncoder().encode("time,voltage_V,current_A\n2026-06-01 08:00:00,3.70,0.5\n2026-06-01 08:00:10,3.71,0.5\n"))).toBeNull();
    expect(logStartUnixS(new TextEncoder().encode("time_s,voltage_V,current_A\n0,3.70,0.5\n10,3.71,0.5\n"))).toBeNull();
  });
});

describe("round trip: export, then read and analyse the BDF file like any log", () => {
  // An invented capacity check, two cycles, from the project's simulator: CC-CV at 0.5C to 4.2 V,
  // C/20 end, 0.5C discharge to 3.0 V (polymer-cell limits: common practice, no source).
  const plan = protocol().ccCvCharge(0.5, 4.2, 0.05).rest(600).ccDischarge(0.5, 3.0).rest(300).ccCvCharge(0.5, 4.2, 0.05).rest(600).ccDischarge(0.5, 3.0).build();
  const { samples } = simulate(plan, { ratedCapacity_mAh: 1000, initialSoc: 0.02, logInterval_s: 5, voltageNoise_V: 0.001, currentNoise_A: 0.001, seed: 7 });
  const original = toCsv(samples, { withStepColumn: true });

  async function exported(): Promise<string> {
    return new Response(bdfStream(streamInPieces(original, 7001), { read: { fileName: "cap.csv" } })).text();
  }

  it("is detected as a log with BDF's columns and units", async () => {
    const bdf = await exported();
    const { summary } = await samplesOf(bdf);
    expect(summary.detection.columns.time).toMatchObject({ name: bdfLabels.testTime, unit: "s" });
    expect(summary.detection.columns.voltage).toMatchObject({ name: bdfLabels.voltage, unit: "V" });
    expect(summary.detection.columns.current).toMatchObject({ name: bdfLabels.current, unit: "A" });
    expect(summary.detection.columns.temperature).toMatchObject({ name: bdfLabels.surfaceTemperature });
    expect(summary.detection.columns.step).toMatchObject({ name: bdfLabels.stepCount });
    expect(summary.detection.currentSign).toBe("positive-charges");
  });

  it("gives back the same samples within the written precision", async () => {
    const before = await samplesOf(original);
    const after = await samplesOf(await exported());
    expect(after.t.length).toBe(before.t.length);
    expect(before.t.length).toBeGreaterThan(1000);
    let worst = { t: 0, v: 0, i: 0, temp: 0 };
    for (let k = 0; k < before.t.length; k++) {
      worst = {
        t: Math.max(worst.t, Math.abs(after.t[k]! - before.t[k]!)),
        v: Math.max(worst.v, Math.abs(after.v[k]! - before.v[k]!)),
        i: Math.max(worst.i, Math.abs(after.i[k]! - before.i[k]!)),
        temp: Math.max(worst.temp, Math.abs(after.temp[k]! - before.temp[k]!)),
      };
    }
    // Half a unit in the last written place: 1e-6 s, V, A; 1e-3 °C.
    expect(worst.t).toBeLessThanOrEqual(5e-7 + 1e-9);
    expect(worst.v).toBeLessThanOrEqual(5e-7 + 1e-12);
    expect(worst.i).toBeLessThanOrEqual(5e-7 + 1e-12);
    expect(worst.temp).toBeLessThanOrEqual(5e-4 + 1e-9);
    expect(stepEdges(after.step)).toEqual(stepEdges(before.step));
  });

  it("analyses to the same charged and discharged capacity (within 0.1 %), which its own capacity columns also state", async () => {
    const bdf = await exported();
    const a = (await analyzeLog(bytesOf(original))).report.totals;
    const b = (await analyzeLog(bytesOf(bdf))).report.totals;
    expect(a.charged_mAh).toBeGreaterThan(500);
    expect(a.discharged_mAh).toBeGreaterThan(500);
    expect(Math.abs(b.charged_mAh - a.charged_mAh) / a.charged_mAh).toBeLessThan(0.001);
    expect(Math.abs(b.discharged_mAh - a.discharged_mAh) / a.discharged_mAh).toBeLessThan(0.001);
    const { rows } = parse(bdf);
    const last = rows[rows.length - 1]!;
    expect(Math.abs(Number(last[bdfLabels.chargingCapacity]) * 1000 - a.charged_mAh) / a.charged_mAh).toBeLessThan(0.001);
    expect(Math.abs(Number(last[bdfLabels.dischargingCapacity]) * 1000 - a.discharged_mAh) / a.discharged_mAh).toBeLessThan(0.001);
  });
});

describe("backpressure", () => {
  it("reads the log only as far as the consumer has taken the export, and stops the source when it cancels", async () => {
    // A long log made on demand: 2e6 rows (about 50 MB) that are never all in memory.
    const rows = 2_000_000;
    let row = 0;
    let pulledBytes = 0;
    let cancelled = false;
    const encoder = new TextEncoder();
    const source = new ReadableStream<Uint8Array>({
      pull(c) {
        if (row === 0) c.enqueue(encoder.encode("time_s,voltage_V,current_A\n"));
        const lines: string[] = [];
        for (let k = 0; k < 2000 && row < rows; k++, row++) lines.push(`${row},${(3.7 + (row % 1000) * 1e-4).toFixed(4)},0.5`);
        const chunk = encoder.encode(lines.join("\n") + "\n");
        pulledBytes += chunk.length;
        c.enqueue(chunk);
        if (row >= rows) c.close();
      },
      cancel() {
        cancelled = true;
      },
    });
    const reader = bdfStream(source).getReader();
    const first = await reader.read();
    expect(first.done).toBe(false);
    // Let any read-ahead run on before measuring how much of the log was taken.
    for (let k = 0; k < 50; k++) await new Promise((resolve) => setTimeout(resolve, 0));
    // The reader's head (1 MiB) plus a few 8192-row batches of about 25 bytes a row, far short of the file.
    expect(pulledBytes).toBeLessThan(4 * 1024 * 1024);
    expect(row).toBeLessThan(rows / 10);
    await reader.cancel();
    expect(cancelled).toBe(true);
  });
});

describe("the download's file name", () => {
  it("is the serial, the original name without its text extension, and .bdf.csv", () => {
    expect(bdfFileName("KP-0001", "bench3 run.csv")).toBe("KP-0001-bench3 run.bdf.csv");
    expect(bdfFileName("KP-0001", "old.bdf.csv")).toBe("KP-0001-old.bdf.csv");
    expect(bdfFileName("KP-0001", "log")).toBe("KP-0001-log.bdf.csv");
  });
});
