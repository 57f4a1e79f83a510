/** Turns simulator output into what the analyser consumes: SampleBatches, or a CSV text for the CLI. */
import type { SampleBatch } from "@/lib/analysis/types";
import type { SampledSeries } from "./simulate";

export interface BatchOptions {
  batchSize?: number;
  /** Include the step and cycle columns a cycler would write. */
  withStepColumn?: boolean;
  withCycleColumn?: boolean;
  /** Physical line of the first data row (header on line 1 by default). */
  firstLine?: number;
}

/** Yields batches that reuse one set of buffers, as the reader does. */
export function* toBatches(s: SampledSeries, options: BatchOptions = {}): Generator<SampleBatch> {
  const size = options.batchSize ?? 65536;
  const firstLine = options.firstLine ?? 2;
  const batch: SampleBatch = {
    length: 0,
    line: new Int32Array(size),
    t: new Float64Array(size),
    v: new Float64Array(size),
    i: new Float64Array(size),
    temp: s.temp ? new Float64Array(size) : null,
    step: options.withStepColumn ? new Float64Array(size) : null,
    cycle: options.withCycleColumn ? new Float64Array(size) : null,
  };
  for (let start = 0; start < s.length; start += size) {
    const n = Math.min(size, s.length - start);
    for (let k = 0; k < n; k++) {
      const j = start + k;
      batch.line[k] = firstLine + j;
      batch.t[k] = s.t[j] ?? NaN;
      batch.v[k] = s.v[j] ?? NaN;
      batch.i[k] = s.i[j] ?? NaN;
      if (batch.temp && s.temp) batch.temp[k] = s.temp[j] ?? NaN;
      if (batch.step) batch.step[k] = s.step[j] ?? NaN;
      if (batch.cycle) batch.cycle[k] = s.cycle[j] ?? NaN;
    }
    batch.length = n;
    yield batch;
  }
}

/** A plain comma-separated log with our own headings, for CLI tests. */
export function toCsv(s: SampledSeries, options: { withStepColumn?: boolean; currentIn_mA?: boolean } = {}): string {
  const head = ["time_s", "voltage_V", options.currentIn_mA ? "current_mA" : "current_A"];
  if (s.temp) head.push("temperature_degC");
  if (options.withStepColumn) head.push("step");
  const lines = [head.join(",")];
  for (let j = 0; j < s.length; j++) {
    const current = (s.i[j] ?? 0) * (options.currentIn_mA ? 1000 : 1);
    const row = [(s.t[j] ?? 0).toFixed(3), (s.v[j] ?? 0).toFixed(5), current.toFixed(options.currentIn_mA ? 3 : 6)];
    if (s.temp) row.push((s.temp[j] ?? 0).toFixed(3));
    if (options.withStepColumn) row.push(String(s.step[j] ?? ""));
    lines.push(row.join(","));
  }
  return lines.join("\n") + "\n";
}
