/**
 * readLog gives back the sample series, within the precision it was written
 * with, from every input form in tests/support/log-forms.ts, on both parsing
 * paths and with stream chunks that cut lines, CRLF pairs and characters.
 */
import { describe, expect, it } from "vitest";
import { logForms, readAll, readErrors, sampleSeries, type LogForm, type ReadBack, type Series } from "../support/log-forms";

const series = sampleSeries();
const forms = logForms(series);

function expectSeries(form: LogForm, got: ReadBack, s: Series): void {
  const e = readErrors(form, got, s);
  expect(e.rows).toBe(s.length);
  // The first time is rounded too, so a difference of times may be off by two roundings.
  expect(e.t).toBeLessThanOrEqual(2 * form.tolerance.t);
  expect(e.v).toBeLessThanOrEqual(form.tolerance.v);
  expect(e.i).toBeLessThanOrEqual(form.tolerance.i);
  expect(e.temp).toBeLessThanOrEqual(form.tolerance.temp);
  expect(got.temp !== null).toBe(form.withTemperature);
  expect(e.lines.read).toEqual(e.lines.written);
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
      expect(got.summary.path).toBe(form.autoPath);
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
