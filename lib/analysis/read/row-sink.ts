/**
 * Where both parsing paths deliver rows. Converts units, settles the current
 * sign (holding the first rows back until it is known, then replaying them),
 * checks plausibility and time order, gathers data-quality findings and fills
 * batches. Rows arrive as plain numbers: no object per row.
 */
import type { Finding, SampleBatch, currentSigns } from "../types";
import { Batcher } from "./batcher";
import { listedBadLines, probeRows, signMaxRows } from "./limits";
import type { ReadPlan } from "./plan";
import { checkPlausible } from "./plausibility";
import { QualityLog, type SkipReason } from "./quality";
import { reject } from "./reject";
import { SignVote } from "./sign-vote";

type CurrentSign = (typeof currentSigns)[number];

export interface SinkResult {
  rows: number;
  findings: Finding[];
  sign: CurrentSign;
  signConfidence: number;
}

/** Rows held back at the start, as growable columns. */
class HeldRows {
  n = 0;
  line = new Int32Array(1024);
  t = new Float64Array(1024);
  v = new Float64Array(1024);
  i = new Float64Array(1024);
  temp = new Float64Array(1024);
  step = new Float64Array(1024);
  cycle = new Float64Array(1024);
  dir = new Float64Array(1024);
  record = new Float64Array(1024);

  push(line: number, t: number, v: number, i: number, temp: number, step: number, cycle: number, dir: number, record: number): void {
    if (this.n === this.line.length) this.grow();
    const k = this.n++;
    this.line[k] = line;
    this.t[k] = t;
    this.v[k] = v;
    this.i[k] = i;
    this.temp[k] = temp;
    this.step[k] = step;
    this.cycle[k] = cycle;
    this.dir[k] = dir;
    this.record[k] = record;
  }

  private grow(): void {
    const size = this.line.length * 2;
    const widen = (a: Float64Array) => {
      const b = new Float64Array(size);
      b.set(a);
      return b;
    };
    const lines = new Int32Array(size);
    lines.set(this.line);
    this.line = lines;
    this.t = widen(this.t);
    this.v = widen(this.v);
    this.i = widen(this.i);
    this.temp = widen(this.temp);
    this.step = widen(this.step);
    this.cycle = widen(this.cycle);
    this.dir = widen(this.dir);
    this.record = widen(this.record);
  }
}

interface BadColumn {
  count: number;
  lines: number[];
}

export class RowSink {
  private readonly plan: ReadPlan;
  private readonly batcher: Batcher;
  private readonly quality = new QualityLog();
  private readonly vote = new SignVote();
  private held: HeldRows | null = new HeldRows();
  private sign: CurrentSign | null;
  private signConfidence = 1;

  private started = false;
  private wholeOrigin = 0;
  private fracOrigin = 0;
  private previousT = Number.NaN;
  private previousLine = 0;
  private lastDirection = 0;
  private delivered = 0;
  private readonly bad = new Map<number, BadColumn>();

  constructor(plan: ReadPlan, onBatch: (batch: SampleBatch) => void, batchSize: number) {
    this.plan = plan;
    this.sign = plan.sign === "decide" ? null : plan.sign;
    this.batcher = new Batcher(
      batchSize,
      { temp: plan.fields.temperature >= 0, step: plan.fields.step >= 0, cycle: plan.fields.cycle >= 0 },
      onBatch,
    );
  }

  /**
   * One data row. Time arrives as a whole part and a fraction (timestamps keep
   * sub-second precision that way); direction is +1/-1/0 from a mode column,
   * NaN when the mode cell is empty (the previous direction holds).
   */
  row(line: number, tWhole: number, tFrac: number, v: number, i: number, temp: number, step: number, cycle: number, direction: number, record: number): void {
    const plan = this.plan;
    if (!this.started) {
      this.started = true;
      this.wholeOrigin = tWhole;
      this.fracOrigin = tFrac;
    }
    const t = ((tWhole - this.wholeOrigin + (tFrac - this.fracOrigin)) * plan.timeMul) / plan.timeDiv;
    const volts = v / plan.voltDiv;
    const amps = i / plan.ampDiv;
    let celsius = temp;
    if (plan.tempUnit === "K") celsius = temp - 273.15;
    else if (plan.tempUnit === "degF") celsius = ((temp - 32) * 5) / 9;
    if (!Number.isNaN(direction)) this.lastDirection = direction;
    const dir = this.lastDirection;

    const held = this.held;
    if (held === null) {
      this.emit(line, t, volts, this.signed(amps, dir), celsius, step, cycle, record);
      return;
    }
    held.push(line, t, volts, amps, celsius, step, cycle, dir, record);
    if (this.sign === null) this.vote.add(volts, amps, plan.fields.mode >= 0 ? dir : Number.NaN);
    if ((held.n & 1023) !== 0) return;
    if (this.sign === null) {
      const verdict = held.n >= signMaxRows ? this.vote.final() : this.vote.early();
      if (verdict) {
        this.sign = verdict.sign;
        this.signConfidence = verdict.confidence;
      }
    }
    if (this.sign !== null && held.n >= probeRows) this.release();
  }

  private signed(amps: number, dir: number): number {
    if (this.sign === "negative-charges") return -amps;
    if (this.sign === "magnitude-with-mode") return dir * Math.abs(amps);
    return amps;
  }

  /** Decides what is still open on the held rows, checks them, and replays them in order. */
  private release(): void {
    const held = this.held;
    if (held === null) return;
    if (this.sign === null) {
      const verdict = this.vote.final();
      this.sign = verdict.sign;
      this.signConfidence = verdict.confidence;
    }
    if (this.plan.sign === "magnitude-with-mode") this.signConfidence = this.plan.detection.columns.mode?.confidence ?? 1;
    checkPlausible(this.plan, held);
    this.held = null;
    for (let k = 0; k < held.n; k++)
      this.emit(held.line[k]!, held.t[k]!, held.v[k]!, this.signed(held.i[k]!, held.dir[k]!), held.temp[k]!, held.step[k]!, held.cycle[k]!, held.record[k]!);
  }

  private emit(line: number, t: number, v: number, i: number, temp: number, step: number, cycle: number, record: number): void {
    if (this.bad.size > 0) return; // the file will be rejected: stop feeding the analysis
    const dt = t - this.previousT;
    if (dt < 0)
      reject(
        "time-backwards",
        `Time goes backwards on line ${line}: ${t} s after ${this.previousT} s on line ${this.previousLine}.`,
        { line, column: this.plan.fields.time + 1 },
      );
    if (dt === 0) this.quality.duplicate(t, line);
    else if (dt > 0) this.quality.interval(dt, t, line);
    if (this.plan.fields.record >= 0) this.quality.record(record, t, line);
    this.previousT = t;
    this.previousLine = line;
    this.delivered++;
    this.batcher.push(line, t, v, i, temp, step, cycle);
  }

  /** A required cell on `line` (zero-based field) is empty or not a number. */
  nonNumeric(line: number, field: number): void {
    let entry = this.bad.get(field);
    if (entry === undefined) {
      entry = { count: 0, lines: [] };
      this.bad.set(field, entry);
    }
    entry.count++;
    if (entry.lines.length < listedBadLines) entry.lines.push(line);
  }

  unknownMode(line: number, field: number, text: string): never {
    reject(
      "bad-column-map",
      `Line ${line}: the mode column ${field + 1} ("${this.plan.header[field] ?? ""}") says "${text}", which is not a charge, discharge or rest word. Map the current sign by hand.`,
      { line, column: field + 1 },
    );
  }

  skipped(reason: SkipReason, line: number): void {
    this.quality.skipped(reason, line, Number.isNaN(this.previousT) ? 0 : this.previousT);
  }

  finish(): SinkResult {
    if (this.held !== null) this.release();
    if (this.bad.size > 0) this.rejectNonNumeric();
    this.batcher.flush();
    if (this.delivered === 0)
      reject("no-data-rows", `No data rows follow the header on line ${this.plan.headerLine}.`, { line: this.plan.headerLine });
    return { rows: this.delivered, findings: this.quality.findings(this.delivered), sign: this.sign ?? "positive-charges", signConfidence: this.signConfidence };
  }

  private rejectNonNumeric(): never {
    const entries = [...this.bad.entries()].sort((a, b) => (a[1].lines[0] ?? 0) - (b[1].lines[0] ?? 0));
    const describe = ([field, e]: [number, BadColumn]) => {
      const where = e.lines.length === 1 && e.count === 1 ? `on line ${e.lines[0]}` : `first on line${e.lines.length > 1 ? "s" : ""} ${e.lines.join(", ")}`;
      return `Column ${field + 1} (${this.plan.header[field] ?? "?"}) has ${e.count} non-numeric value${e.count === 1 ? "" : "s"}, ${where}`;
    };
    const [first, ...others] = entries;
    const message = [describe(first!), ...others.map(describe)].join("; ") + ".";
    reject("non-numeric", message, { line: first![1].lines[0], column: first![0] + 1 });
  }
}
