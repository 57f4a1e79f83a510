/**
 * Detection details, the column map override, data-quality findings and the
 * upload preview.
 */
import { describe, expect, it } from "vitest";
import { classifyMode, previewLog, readLog, splitHeader } from "@/lib/analysis/read";
import { AnalysisRejected, columnMapSchema, type ColumnMap } from "@/lib/analysis/types";
import { readAll, sampleSeries, logForms } from "../support/log-forms";

const bytes = (text: string) => new TextEncoder().encode(text);

function csv(header: string, rows: number, cell: (k: number) => string, delimiter = ","): Uint8Array {
  const lines = [header];
  for (let k = 0; k < rows; k++) lines.push(cell(k));
  return bytes(lines.join("\n").replace(/,/g, delimiter) + "\n");
}

/** A charging ramp: voltage rises with positive current (common practice, no source). */
const ramp = (k: number) => `${k},${(3.6 + k * 0.0005).toFixed(4)},1.000`;

describe("unit markers in headers", () => {
  const cases: [string, string | null][] = [
    ["Voltage (V)", "V"],
    ["Spannung [mV]", "mV"],
    ["Strom_A", "A"],
    ["I/mA", "mA"],
    ["Current mA", "mA"],
    ["Test Time / s", "s"],
    ["Zeit in h", "h"],
    ["Time (min)", "min"],
    ["t_ms", "ms"],
    ["Elapsed (hh:mm:ss)", "hms"],
    ["Temp °C", "degC"],
    ["Temperature (ºC)", "degC"],
    ["Temperatur [Â°C]", "degC"],
    ["Cell Temperature / degC", "degC"],
    ["Capacity (Ah)", "charge"],
    ["Voltage", null],
  ];
  for (const [header, unit] of cases)
    it(header, () => {
      expect(splitHeader(header).unit?.unit ?? null).toBe(unit);
    });
});

describe("mode words", () => {
  // Ordinary words for charge / discharge / rest in seven languages, and one-letter codes.
  const words: [string, number][] = [
    ["Charge", 1], ["CC Charge", 1], ["CCCV_Chg", 1], ["Discharge", -1], ["CC_DChg", -1], ["Rest", 0], ["Pause", 0],
    ["Laden", 1], ["Entladen", -1], ["Ruhe", 0],
    ["Décharge", -1], ["Repos", 0],
    ["Carga", 1], ["Descarga", -1], ["Reposo", 0], ["Descanso", 0],
    ["Carica", 1], ["Scarica", -1], ["Riposo", 0],
    ["Opladen", 1], ["Ontladen", -1], ["Rust", 0],
    ["Repouso", 0],
    ["C", 1], ["D", -1], ["R", 0],
  ];
  for (const [word, direction] of words)
    it(word, () => {
      expect(classifyMode(word)).toBe(direction);
    });
  it("leaves other words unrecognised", () => {
    for (const word of ["Formation", "Step 3", "12", ""]) expect(Number.isNaN(classifyMode(word)), word).toBe(true);
  });
});

describe("column detection", () => {
  it("is confident with word and unit, less with a single letter, and finds step and cycle columns", async () => {
    const sure = await readAll(csv("Cycle,Step,Time (s),Voltage (V),Current (A)", 50, (k) => `1,2,${ramp(k)}`));
    const d = sure.summary.detection;
    expect(d.columns.cycle?.index).toBe(0);
    expect(d.columns.step?.index).toBe(1);
    expect(d.columns.time?.confidence).toBeGreaterThanOrEqual(0.9);
    expect(d.confidence).toBeGreaterThanOrEqual(0.8);
    expect(sure.step?.[0]).toBe(2);
    expect(sure.cycle?.[0]).toBe(1);

    const unsure = await readAll(csv("t,U,I", 50, ramp));
    expect(unsure.summary.detection.columns.voltage?.index).toBe(1);
    expect(unsure.summary.detection.confidence).toBeLessThan(0.8);
  });

  it("prefers the test clock to the step clock and ignores capacity, energy and power", async () => {
    const got = await readAll(
      csv("Step Time (s),Charge Capacity (Ah),Energy (Wh),Voltage (V),Power (W),Current (A),Test Time (s)", 30, (k) => `${k % 7},0.1,0.2,${(3.6 + k * 0.001).toFixed(3)},3.7,1.0,${k}`),
    );
    const c = got.summary.detection.columns;
    expect([c.time?.index, c.voltage?.index, c.current?.index]).toEqual([6, 3, 5]);
  });

  it("takes the cell's temperature over the ambient one, and the ambient one when it is alone", async () => {
    // Labels from the Battery Data Format README (Battery Data Alliance): ambient before surface.
    const both = await readAll(
      csv("Test Time / s,Voltage / V,Current / A,Ambient Temperature / degC,Surface Temperature T1 / degC", 30, (k) => `${ramp(k)},23.0,${(25 + k * 0.01).toFixed(2)}`),
    );
    expect(both.summary.detection.columns.temperature?.index).toBe(4);
    const alone = await readAll(csv("Test Time / s,Voltage / V,Current / A,Ambient Temperature / degC", 30, (k) => `${ramp(k)},23.0`));
    expect(alone.summary.detection.columns.temperature?.index).toBe(3);
  });

  it("decides from the voltage response that negative current charges, even after a long rest", async () => {
    const rows = (k: number) => (k < 3000 ? `${k},3.6000,0.000` : `${k},${(3.6 + (k - 3000) * 0.0002).toFixed(4)},-1.000`);
    const got = await readAll(csv("Time (s),Voltage (V),Current (A)", 6000, rows));
    expect(got.summary.detection.currentSign).toBe("negative-charges");
    expect(got.i.at(-1)).toBe(1);
    expect(got.summary.detection.columns.current?.confidence).toBeGreaterThanOrEqual(0.9);
  });

  it("reports low confidence in the sign when the log shows no current at all", async () => {
    const got = await readAll(csv("Time (s),Voltage (V),Current (A)", 100, (k) => `${k},3.6,0`));
    expect(got.summary.detection.confidence).toBeLessThan(0.5);
  });

  it("reads the sign from a mode column even when the current is already signed", async () => {
    const rows = (k: number) => `${k},${(3.9 - k * 0.001).toFixed(4)},${k < 50 ? "1.0" : "-1.0"},${k < 50 ? "Discharge" : "Charge"}`;
    const got = await readAll(csv("Time (s),Voltage (V),Current (A),State", 100, rows));
    expect(got.summary.detection.currentSign).toBe("negative-charges");
    expect(got.i[0]).toBe(-1);
  });
});

describe("an explicit column map", () => {
  const text = csv("A,B,C,D", 40, (k) => `${k * 1000},${(3600 + k).toFixed(1)},${(500).toFixed(1)},${k}`);
  const map: ColumnMap = columnMapSchema.parse({
    time: { index: 0, unit: "ms" },
    voltage: { index: 1, unit: "mV" },
    current: { index: 2, unit: "mA", sign: "positive-charges" },
  });

  it("reads a file detection cannot", async () => {
    await expect(readAll(text)).rejects.toBeInstanceOf(AnalysisRejected);
    const got = await readAll(text, { columnMap: map });
    expect(got.t[3]).toBe(3);
    expect(got.v[0]).toBe(3.6);
    expect(got.i[0]).toBe(0.5);
    expect(got.summary.detection.confidence).toBe(1);
    expect(got.summary.detection.columnMap.voltage).toMatchObject({ index: 1, unit: "mV" });
  });

  it("overrides detection field by field and keeps the rest detected", async () => {
    const form = logForms(sampleSeries()).find((f) => f.name === "comma, LF")!;
    const detected = await readAll(form.render());
    // Keep the detected columns but say the current is written with the opposite sign.
    const flipped = { ...detected.summary.detection.columnMap, current: { ...detected.summary.detection.columnMap.current, sign: "negative-charges" as const } };
    const got = await readAll(form.render(), { columnMap: flipped });
    expect(got.i.map((x) => -x)).toEqual(detected.i);
    expect(got.temp).toEqual(detected.temp);
  });

  it("follows a saved column's name when the column has moved", async () => {
    const saved = { ...map, voltage: { index: 1, name: "B", unit: "mV" as const } };
    const moved = csv("X,A,B,C,D", 40, (k) => `0,${k * 1000},${(3600 + k).toFixed(1)},500.0,${k}`);
    const got = await readAll(moved, { columnMap: { ...saved, time: { index: 1, name: "A", unit: "ms" }, current: { index: 2, name: "C", unit: "mA" } } });
    expect(got.v[0]).toBe(3.6);
    expect(got.summary.detection.columns.voltage?.index).toBe(2);
  });

  it("is rejected with a located error when it does not fit the file", async () => {
    const wide = { ...map, voltage: { index: 9, unit: "V" as const } };
    await expect(readAll(text, { columnMap: wide })).rejects.toMatchObject({ detail: { code: "bad-column-map", line: 1, column: 10 } });
    const invalid = { ...map, delimiter: "|" } as unknown as ColumnMap;
    await expect(readAll(text, { columnMap: invalid })).rejects.toMatchObject({ detail: { code: "bad-column-map" } });
  });
});

describe("data-quality findings", () => {
  it("reports a logging gap but not a slower logging rate", async () => {
    // Rows 1 s apart, a 120 s hole after row 100, then rows 10 s apart from row 200 on.
    let t = 0;
    const times: number[] = [];
    for (let k = 0; k < 400; k++) {
      times.push(t);
      t += k === 100 ? 120 : k >= 200 ? 10 : 1;
    }
    const got = await readAll(csv("Time (s),Voltage (V),Current (A)", times.length, (k) => `${times[k]},${(3.6 + k * 0.001).toFixed(3)},1.0`));
    const gaps = got.summary.findings.filter((f) => f.kind === "logging-gap");
    expect(gaps).toHaveLength(1);
    expect(gaps[0]).toMatchObject({ line: 103, value: 120, time_s: 100, end_s: 220, caution: "" });
    expect(["info", "warning"]).toContain(gaps[0]!.severity);
  });

  it("reports duplicate timestamps, dropped rows by record number, and skipped rows", async () => {
    const lines = ["Record;Time (s);Voltage (V);Current (A)"];
    let record = 1;
    for (let k = 0; k < 60; k++) {
      if (k === 30) lines.push("Record;Time (s);Voltage (V);Current (A)");
      if (k === 40) lines.push("# operator paused the channel");
      record += k === 20 ? 3 : 1; // two rows missing before row 20
      lines.push(`${record};${k === 10 ? 9 : k};3,${600 + k};1,0`);
    }
    lines.push("61;60;3,6"); // cut off
    const got = await readAll(bytes(lines.join("\n")));
    const byKind = (kind: string) => got.summary.findings.filter((f) => f.kind === kind);
    expect(byKind("duplicate-timestamp")[0]).toMatchObject({ value: 1, line: 12 });
    expect(byKind("dropped-rows")[0]).toMatchObject({ value: 2, line: 22 });
    expect(byKind("skipped-rows").map((f) => [f.value, f.line])).toEqual([
      [1, 32],
      [1, 43],
      [1, 64],
    ]);
    expect(got.summary.findings).toHaveLength(5);
    expect(got.summary.findings.every((f) => f.caution === "" && f.severity !== "danger")).toBe(true);
    expect(got.summary.rows).toBe(60);
  });
});

describe("streaming", () => {
  it("delivers full batches of batchSize in file order, from one-byte chunks too", async () => {
    const text = csv("Time (s),Voltage (V),Current (A)", 2500, ramp);
    const sizes: number[] = [];
    async function* oneByte() {
      for (let k = 0; k < text.length; k++) yield text.subarray(k, k + 1);
    }
    const lines: number[] = [];
    const summary = await readLog(
      oneByte(),
      (b) => {
        sizes.push(b.length);
        lines.push(b.line[0]!, b.line[b.length - 1]!);
      },
      { batchSize: 1000 },
    );
    expect(sizes).toEqual([1000, 1000, 500]);
    expect(lines).toEqual([2, 1001, 1002, 2001, 2002, 2501]);
    expect(summary).toMatchObject({ rows: 2500, bytes: text.length, path: "fast" });
  });
});

describe("previewLog", () => {
  it("gives the detection, header and first rows as text", () => {
    const head = bytes("Operator: J. Doe\nZeit (s);Spannung (V);Strom (A)\n0;3,6;1,0\n1;3,61;1,0\n2;3,62;1,0\n3;3,63;1,0\n4;3,6");
    const p = previewLog(head, { maxRows: 3 });
    expect(p.error).toBeNull();
    expect(p.header).toEqual(["Zeit (s)", "Spannung (V)", "Strom (A)"]);
    expect(p.rows).toEqual([
      ["0", "3,6", "1,0"],
      ["1", "3,61", "1,0"],
      ["2", "3,62", "1,0"],
    ]);
    expect(p.detection).toMatchObject({ delimiter: ";", decimal: ",", headerLine: 2, preamble: ["Operator: J. Doe"] });
  });

  it("returns a located error instead of throwing, keeping what was detected", () => {
    const p = previewLog(bytes("Time (s),Voltage (V),Current (A)\n0,3.6,1\n1,x,1\n2,3.62,1\n"));
    expect(p.error).toMatchObject({ code: "non-numeric", line: 3, column: 2 });
    expect(p.detection?.columns.voltage?.index).toBe(1);
    expect(p.header).toHaveLength(3);
  });
});
