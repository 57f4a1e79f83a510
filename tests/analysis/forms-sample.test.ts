/**
 * readLog gives back the sample series, within the precision it was written
 * with, from every input form in tests/support/log-forms.ts, on both parsing
 * paths and with stream chunks that cut lines, CRLF pairs and characters.
 */
import { describe, expect, it } from "vitest";
import { logForms, readAll, sampleSeries, type LogForm, type ReadBack, type Series } from "../support/log-forms";

const series = sampleSeries();
const forms = logForms(series);

function expectSeries(form: LogForm, got: ReadBack, s: Series): void {
  expect(got.summary.rows).toBe(s.length);
  const t0 = s.t[0]!;
  let worst = { t: 0, v: 0, i: 0, temp: 0 };
  for (let k = 0; k < s.length; k++) {
    worst = {
      t: Math.max(worst.t, Math.abs(got.t[k]! - (s.t[k]! - t0))),
      v: Math.max(worst.v, Math.abs(got.v[k]! - s.v[k]!)),
      i: Math.max(worst.i, Math.abs(got.i[k]! - s.i[k]!)),
      temp: form.withTemperature ? Math.max(worst.temp, Math.abs(got.temp![k]! - s.temp![k]!)) : 0,
    };
  }
  // The first time is rounded too, so a difference of times may be off by two roundings.
  expect(worst.t).toBeLessThanOrEqual(2 * form.tolerance.t);
  expect(worst.v).toBeLessThanOrEqual(form.tolerance.v);
  expect(worst.i).toBeLessThanOrEqual(form.tolerance.i);
  expect(worst.temp).toBeLessThanOrEqual(form.tolerance.temp);
  expect(got.temp !== null).toBe(form.withTemperature);
  expect(got.line.slice(0, 3)).toEqual([form.lineOf(0), form.lineOf(1), form.lineOf(2)]);
  expect(got.line.at(-1)).toBe(form.lineOf(s.length - 1));
}

describe("every input form reads back as the series", () => {
  it("covers enough forms", () => {
    expect(forms.length).toBeGreaterThanOrEqual(30);
  });

  for (const form of forms) {
    it(form.name, async () => {
      const bytes = form.render();
      const got = await readAll(bytes);
      expectSeries(form, got, series);
      const d = got.summary.detection;
      expect({
        delimiter: d.delimiter,
        decimal: d.decimal,
        timeFormat: d.timeFormat,
        currentSign: d.currentSign,
        headerLine: d.headerLine,
      }).toEqual(form.expected);
      expect(d.confidence).toBeGreaterThan(0.5);
      const unexpected = got.summary.findings.filter((f) => !(form.name.startsWith("unit row") && f.kind === "skipped-rows"));
      expect(unexpected).toEqual([]);
      expect(got.summary.bytes).toBe(bytes.length);
    });
  }
});

describe("both paths give identical batches", () => {
  for (const form of forms) {
    it(form.name, async () => {
      const bytes = form.render();
      // Small odd chunks on one side: line, CRLF and UTF-8 boundaries fall inside chunks.
      const fast = await readAll(bytes, { parser: "fast", chunkSize: 997, batchSize: 1000 });
      const papa = await readAll(bytes, { parser: "papaparse", chunkSize: 4096, batchSize: 1000 });
      expect(fast.summary.path).toBe("fast");
      expect(papa.summary.path).toBe("papaparse");
      const { summary: a, ...fastRows } = fast;
      const { summary: b, ...papaRows } = papa;
      expect(fastRows).toEqual(papaRows);
      expect({ ...a, path: null }).toEqual({ ...b, path: null });
      expectSeries(form, fast, series);
    });
  }
});
