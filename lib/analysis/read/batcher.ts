/** Fills reusable columnar batches and hands each one on when full. */
import type { SampleBatch } from "../types";
import * as slots from "./row-slots";

// Module-local copies of imported bindings: a CommonJS build (tsx: the CLI and the bench) reaches
// imports through getters, which costs more than the parsing itself in per-row code.
const { rowCycle, rowI, rowStep, rowT, rowTemp, rowV } = slots;

export class Batcher {
  private readonly batch: SampleBatch;
  private readonly size: number;

  constructor(
    size: number,
    columns: { temp: boolean; step: boolean; cycle: boolean },
    private readonly onBatch: (batch: SampleBatch) => void,
  ) {
    this.size = size;
    this.batch = {
      length: 0,
      line: new Int32Array(size),
      t: new Float64Array(size),
      v: new Float64Array(size),
      i: new Float64Array(size),
      temp: columns.temp ? new Float64Array(size) : null,
      step: columns.step ? new Float64Array(size) : null,
      cycle: columns.cycle ? new Float64Array(size) : null,
    };
  }

  /** Appends the converted row in `row` (see row-slots.ts). */
  push(line: number, row: Float64Array): void {
    const b = this.batch;
    const k = b.length;
    b.line[k] = line;
    b.t[k] = row[rowT]!;
    b.v[k] = row[rowV]!;
    b.i[k] = row[rowI]!;
    if (b.temp) b.temp[k] = row[rowTemp]!;
    if (b.step) b.step[k] = row[rowStep]!;
    if (b.cycle) b.cycle[k] = row[rowCycle]!;
    b.length = k + 1;
    if (b.length === this.size) this.flush();
  }

  flush(): void {
    if (this.batch.length === 0) return;
    this.onBatch(this.batch);
    this.batch.length = 0;
  }
}
