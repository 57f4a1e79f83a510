/**
 * Where both parsing paths deliver rows. Converts units, settles the current
 * sign (holding the first rows back until it is known, then replaying them),
 * checks plausibility and time order, gathers data-quality findings and fills
 * batches. A path writes a row into `input` (slots in row-slots.ts) and calls
 * commit(line): nothing is allocated per row.
 */
import type { Finding, SampleBatch, currentSigns } from "../types";
import { Batcher } from "./batcher";
import { listedBadLines, probeRows, signMaxRows } from "./limits";
import type { ReadPlan } from "./plan";
import { checkPlausible } from "./plausibility";
import { QualityLog, type SkipReason } from "./quality";
import { reject } from "./reject";
import * as slots from "./row-slots";
import { SignVote } from "./sign-vote";

// Module-local copies of imported bindings: a CommonJS build (tsx: the CLI and the bench) reaches
// imports through getters, which costs more than the parsing itself in per-row code.
const { inCurrent, inCycle, inDirection, inputSlots, inRecord, inStep, inTemperature, inTimeFrac, inTimeWhole, inVoltage, rowCycle, rowDirection, rowI, rowRecord, rowSlots, rowStep, rowT, rowTemp, rowV } = slots;

type CurrentSign = (typeof currentSigns)[number];

export interface SinkResult {
  rows: number;
  findings: Finding[];
  sign: CurrentSign;
  signConfidence: number;
}

/** Rows held back at the start: one growable column per row slot. */
class HeldRows {
  n = 0;
  line = new Int32Array(1024);
  columns: Float64Array[] = Array.from({ length: rowSlots }, () => new Float64Array(1024));

  push(line: number, row: Float64Array): void {
    if (this.n === this.line.length) this.grow();
    const k = this.n++;
    this.line[k] = line;
    for (let s = 0; s < rowSlots; s++) this.columns[s]![k] = row[s]!;
  }

  load(k: number, row: Float64Array): void {
    for (let s = 0; s < rowSlots; s++) row[s] = this.columns[s]![k]!;
  }

  private grow(): void {
    const size = this.line.length * 2;
    const lines = new Int32Array(size);
    lines.set(this.line);
    this.line = lines;
    this.columns = this.columns.map((c) => {
      const wider = new Float64Array(size);
      wider.set(c);
      return wider;
    });
  }
}

interface BadColumn {
  count: number;
  lines: number[];
}

const probe = probeRows;
const signLimit = signMaxRows;

export class RowSink {
  /** The row a parsing path is filling (see row-slots.ts). */
  readonly input = new Float64Array(inputSlots);
  private readonly row = new Float64Array(rowSlots);
  private readonly plan: ReadPlan;
  private readonly batcher: Batcher;
  private readonly quality = new QualityLog();
  private readonly vote = new SignVote();
  private held: HeldRows | null = new HeldRows();
  private sign: CurrentSign | null;
  private signConfidence = 1;

  private readonly timeMul: number;
  private readonly timeDiv: number;
  private readonly timeIsSeconds: boolean;
  private readonly voltDiv: number;
  private readonly ampDiv: number;
  private readonly tempScale: number;
  private readonly tempOffset: number;
  private readonly hasMode: boolean;
  private readonly hasRecord: boolean;
  /** 1 positive-charges, -1 negative-charges, 0 magnitude with mode; set when the sign is known. */
  private signFactor = 1;

  /** [0] whole and [1] fractional part of the first row's time. */
  private readonly origin = new Float64Array(2);
  private started = false;
  private previousT = Number.NaN;
  private previousLine = 0;
  private lastDirection = 0;
  private delivered = 0;
  private readonly bad = new Map<number, BadColumn>();
  /** A required cell was bad: the file will be rejected at the end. */
  private failing = false;

  constructor(plan: ReadPlan, onBatch: (batch: SampleBatch) => void, batchSize: number) {
    this.plan = plan;
    this.sign = plan.sign === "decide" ? null : plan.sign;
    if (this.sign !== null) this.signFactor = this.factorOf(this.sign);
    this.timeMul = plan.timeMul;
    this.timeDiv = plan.timeDiv;
    this.timeIsSeconds = plan.timeMul === 1 && plan.timeDiv === 1;
    this.voltDiv = plan.voltDiv;
    this.ampDiv = plan.ampDiv;
    // °C = raw * scale + offset. Kelvin: T - 273.15; Fahrenheit: (T - 32) * 5/9.
    this.tempScale = plan.tempUnit === "degF" ? 5 / 9 : 1;
    this.tempOffset = plan.tempUnit === "K" ? -273.15 : plan.tempUnit === "degF" ? (-32 * 5) / 9 : 0;
    this.hasMode = plan.fields.mode >= 0;
    this.hasRecord = plan.fields.record >= 0;
    this.batcher = new Batcher(
      batchSize,
      { temp: plan.fields.temperature >= 0, step: plan.fields.step >= 0, cycle: plan.fields.cycle >= 0 },
      onBatch,
    );
  }

  private factorOf(sign: CurrentSign): number {
    return sign === "negative-charges" ? -1 : sign === "magnitude-with-mode" ? 0 : 1;
  }

  /** Takes the row in `input`. Time arrives as a whole part and a fraction so timestamps keep sub-second precision. */
  commit(line: number): void {
    const input = this.input;
    const row = this.row;
    if (!this.started) {
      this.started = true;
      this.origin[0] = input[inTimeWhole]!;
      this.origin[1] = input[inTimeFrac]!;
    }
    const elapsed = input[inTimeWhole]! - this.origin[0]! + (input[inTimeFrac]! - this.origin[1]!);
    // Skipping a division by 1 changes nothing but the time it takes.
    row[rowT] = this.timeIsSeconds ? elapsed : (elapsed * this.timeMul) / this.timeDiv;
    row[rowV] = this.voltDiv === 1 ? input[inVoltage]! : input[inVoltage]! / this.voltDiv;
    row[rowI] = this.ampDiv === 1 ? input[inCurrent]! : input[inCurrent]! / this.ampDiv;
    row[rowTemp] = input[inTemperature]! * this.tempScale + this.tempOffset;
    row[rowStep] = input[inStep]!;
    row[rowCycle] = input[inCycle]!;
    const direction = input[inDirection]!;
    if (direction === direction) this.lastDirection = direction; // not NaN: an empty mode cell keeps the last one
    row[rowDirection] = this.lastDirection;
    row[rowRecord] = input[inRecord]!;

    const held = this.held;
    if (held === null) {
      this.applySign(row);
      this.emit(line);
      return;
    }
    held.push(line, row);
    if (this.sign === null) this.vote.add(row[rowV]!, row[rowI]!, this.hasMode ? this.lastDirection : Number.NaN);
    if ((held.n & 1023) !== 0) return;
    if (this.sign === null) {
      const verdict = held.n >= signLimit ? this.vote.final() : this.vote.early();
      if (verdict) this.settleSign(verdict.sign, verdict.confidence);
    }
    if (this.sign !== null && held.n >= probe) this.release();
  }

  private settleSign(sign: CurrentSign, confidence: number): void {
    this.sign = sign;
    this.signConfidence = confidence;
    this.signFactor = this.factorOf(sign);
  }

  private applySign(row: Float64Array): void {
    const f = this.signFactor;
    if (f === 0) row[rowI] = row[rowDirection]! * Math.abs(row[rowI]!);
    else if (f < 0) row[rowI] = -row[rowI]!;
  }

  /** Decides what is still open on the held rows, checks them, and replays them in order. */
  private release(): void {
    const held = this.held;
    if (held === null) return;
    if (this.sign === null) {
      const verdict = this.vote.final();
      this.settleSign(verdict.sign, verdict.confidence);
    }
    if (this.plan.sign === "magnitude-with-mode") this.signConfidence = this.plan.detection.columns.mode?.confidence ?? 1;
    checkPlausible(this.plan, {
      n: held.n,
      line: held.line,
      v: held.columns[rowV]!,
      i: held.columns[rowI]!,
      temp: held.columns[rowTemp]!,
    });
    this.held = null;
    const row = this.row;
    for (let k = 0; k < held.n; k++) {
      held.load(k, row);
      this.applySign(row);
      this.emit(held.line[k]!);
    }
  }

  private emit(line: number): void {
    if (this.failing) return; // the file will be rejected: stop feeding the analysis
    const row = this.row;
    const t = row[rowT]!;
    const dt = t - this.previousT;
    const q = this.quality.input;
    q[0] = dt;
    q[1] = t;
    if (dt > 0) this.quality.interval(line);
    else if (dt === 0) this.quality.duplicate(line);
    else if (dt < 0)
      reject("time-backwards", `Time goes backwards on line ${line}: ${t} s after ${this.previousT} s on line ${this.previousLine}.`, {
        line,
        column: this.plan.fields.time + 1,
      });
    if (this.hasRecord) {
      q[2] = row[rowRecord]!;
      this.quality.record(line);
    }
    this.previousT = t;
    this.previousLine = line;
    this.delivered++;
    this.batcher.push(line, row);
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
    this.failing = true;
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
    if (this.failing) this.rejectNonNumeric();
    this.batcher.flush();
    if (this.delivered === 0)
      reject("no-data-rows", `No data rows follow the header on line ${this.plan.headerLine}.`, { line: this.plan.headerLine });
    return { rows: this.delivered, findings: this.quality.findings(this.delivered), sign: this.sign ?? "positive-charges", signConfidence: this.signConfidence };
  }

  private rejectNonNumeric(): never {
    const entries = [...this.bad.entries()].sort((a, b) => (a[1].lines[0] ?? 0) - (b[1].lines[0] ?? 0));
    const describe = ([field, e]: [number, BadColumn]) => {
      const where = e.count === 1 ? `on line ${e.lines[0]}` : `first on line${e.lines.length > 1 ? "s" : ""} ${e.lines.join(", ")}`;
      return `Column ${field + 1} (${this.plan.header[field] ?? "?"}) has ${e.count} non-numeric value${e.count === 1 ? "" : "s"}, ${where}`;
    };
    const [first, ...others] = entries;
    const message = [describe(first!), ...others.map(describe)].join("; ") + ".";
    reject("non-numeric", message, { line: first![1].lines[0], column: first![0] + 1 });
  }
}
