/** Fills reusable columnar batches and hands each one on when full. */
import type { SampleBatch } from "../types";

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

  push(line: number, t: number, v: number, i: number, temp: number, step: number, cycle: number): void {
    const b = this.batch;
    const k = b.length;
    b.line[k] = line;
    b.t[k] = t;
    b.v[k] = v;
    b.i[k] = i;
    if (b.temp) b.temp[k] = temp;
    if (b.step) b.step[k] = step;
    if (b.cycle) b.cycle[k] = cycle;
    b.length = k + 1;
    if (b.length === this.size) this.flush();
  }

  flush(): void {
    if (this.batch.length === 0) return;
    this.onBatch(this.batch);
    this.batch.length = 0;
  }
}
