/**
 * Data-quality findings gathered while rows stream past, in bounded memory:
 * logging gaps, duplicate timestamps, rows missing by the record numbers, and
 * rows skipped (repeated headers, unit rows, comments, a cut-off last line).
 *
 * A gap is an interval much longer than the intervals both before it (median of
 * the last 16) and after it (median of the next 4): a change of logging rate,
 * such as slower logging during a rest, is longer than the past but not than
 * the future, and is not reported.
 */
import type { Finding } from "../types";
import { gapFactor as gapFactorSetting, maxListedGaps } from "./limits";

// A local copy: module imports may be getters in a CommonJS build, and this is read per row.
const gapFactor = gapFactorSetting;

export type SkipReason = "repeated header" | "unit row" | "comment" | "cut-off last line";

const ringSize = 16; // a power of two: the ring index wraps with a mask
const lookAhead = 4;

const scratch = new Float64Array(ringSize);

/** Median of the first n values (n <= 16), by insertion sort in a scratch buffer: no allocation. */
function medianOfFirst(values: Float64Array, n: number): number {
  for (let k = 0; k < n; k++) {
    const x = values[k]!;
    let j = k - 1;
    while (j >= 0 && scratch[j]! > x) {
      scratch[j + 1] = scratch[j]!;
      j--;
    }
    scratch[j + 1] = x;
  }
  const mid = n >> 1;
  return n % 2 ? scratch[mid]! : (scratch[mid - 1]! + scratch[mid]!) / 2;
}

function seconds(x: number): string {
  return x >= 100 ? `${Math.round(x)} s` : `${Math.round(x * 1000) / 1000} s`;
}

function plural(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}

interface PendingGap {
  dt: number;
  before: number;
  line: number;
  start: number;
  end: number;
}

export class QualityLog {
  private readonly ring = new Float64Array(ringSize);
  private ringCount = 0;
  private ringNext = 0;
  private reference = Number.NaN;
  private pending: PendingGap | null = null;
  private readonly after = new Float64Array(lookAhead);
  private afterCount = 0;
  private readonly gaps: Finding[] = [];
  private moreGaps = 0;
  private longestUnlisted = 0;

  private duplicates = 0;
  private duplicateLine = 0;
  private duplicateTime = 0;

  private previousRecord = Number.NaN;
  private dropped = 0;
  private droppedLine = 0;
  private droppedTime = 0;

  private readonly skips = new Map<SkipReason, { count: number; line: number; time: number }>();

  /** Written by the caller before each call: [0] the interval dt, [1] the row's time t, [2] its record number. */
  readonly input = new Float64Array(3);

  /** The interval in `input`, ending at the row on `line`. */
  interval(line: number): void {
    const dt = this.input[0]!;
    if (this.pending !== null) {
      this.after[this.afterCount++] = dt;
      if (this.afterCount === lookAhead) this.settle();
    }
    if (!Number.isNaN(this.reference) && dt > gapFactor * this.reference && this.pending === null) {
      const t = this.input[1]!;
      this.pending = { dt, before: this.reference, line, start: t - dt, end: t };
      this.afterCount = 0;
      return;
    }
    this.remember(dt);
  }

  private remember(dt: number): void {
    this.ring[this.ringNext] = dt;
    this.ringNext = (this.ringNext + 1) & (ringSize - 1);
    if (this.ringCount < ringSize) this.ringCount++;
    // Recomputed every ring's worth (and while filling), so the cost per row stays O(1).
    if (this.ringNext === 0 || this.ringCount < ringSize) this.reference = this.ringCount >= 4 ? medianOfFirst(this.ring, this.ringCount) : Number.NaN;
  }

  private settle(): void {
    const gap = this.pending;
    if (gap === null) return;
    this.pending = null;
    const ahead = this.afterCount > 0 ? medianOfFirst(this.after, this.afterCount) : 0;
    if (gap.dt > gapFactor * ahead) this.reportGap(gap);
    else this.remember(gap.dt);
  }

  private reportGap(gap: PendingGap): void {
    if (this.gaps.length >= maxListedGaps) {
      this.moreGaps++;
      this.longestUnlisted = Math.max(this.longestUnlisted, gap.dt);
      return;
    }
    this.gaps.push({
      kind: "logging-gap",
      severity: gap.dt > 100 * gap.before ? "warning" : "info",
      time_s: gap.start,
      end_s: gap.end,
      line: gap.line,
      value: gap.dt,
      limit: gapFactor * gap.before,
      unit: "s",
      message: `No samples for ${seconds(gap.dt)} between ${seconds(gap.start)} and ${seconds(gap.end)} (before line ${gap.line}); rows around it are about ${seconds(gap.before)} apart.`,
      caution: "",
    });
  }

  /** The row on `line` repeats the time before it. */
  duplicate(line: number): void {
    if (this.duplicates++ === 0) {
      this.duplicateLine = line;
      this.duplicateTime = this.input[1]!;
    }
  }

  /** The record number in input[2] of the row on `line`. */
  record(line: number): void {
    const r = this.input[2]!;
    const t = this.input[1]!;
    if (Number.isNaN(r)) return;
    const step = r - this.previousRecord;
    if (step > 1 && Number.isInteger(step)) {
      if (this.dropped === 0) {
        this.droppedLine = line;
        this.droppedTime = t;
      }
      this.dropped += step - 1;
    }
    this.previousRecord = r;
  }

  skipped(reason: SkipReason, line: number, t: number): void {
    const entry = this.skips.get(reason);
    if (entry) entry.count++;
    else this.skips.set(reason, { count: 1, line, time: t });
  }

  findings(rows: number): Finding[] {
    this.settle();
    const out: Finding[] = [...this.gaps];
    if (this.moreGaps > 0)
      out.push({
        kind: "logging-gap",
        severity: "info",
        time_s: this.gaps.at(-1)?.time_s ?? 0,
        value: this.longestUnlisted,
        limit: null,
        unit: "s",
        message: `${plural(this.moreGaps, "more logging gap")} after these, the longest ${seconds(this.longestUnlisted)}.`,
        caution: "",
      });
    const counted = (kind: "duplicate-timestamp" | "dropped-rows", count: number, line: number, time: number, message: string): Finding => ({
      kind,
      severity: rows > 0 && count / rows > 0.01 ? "warning" : "info",
      time_s: time,
      line,
      value: count,
      limit: null,
      unit: "rows",
      message,
      caution: "",
    });
    if (this.duplicates > 0)
      out.push(
        counted(
          "duplicate-timestamp",
          this.duplicates,
          this.duplicateLine,
          this.duplicateTime,
          `${plural(this.duplicates, "row repeats", "rows repeat")} the time of the row before, first on line ${this.duplicateLine}.`,
        ),
      );
    if (this.dropped > 0)
      out.push(
        counted(
          "dropped-rows",
          this.dropped,
          this.droppedLine,
          this.droppedTime,
          `The record numbers skip ${plural(this.dropped, "row")}, first just before line ${this.droppedLine}.`,
        ),
      );
    for (const [reason, entry] of this.skips)
      out.push({
        kind: "skipped-rows",
        severity: "info",
        time_s: entry.time,
        line: entry.line,
        value: entry.count,
        limit: null,
        unit: "rows",
        message: `Skipped ${plural(entry.count, reason === "repeated header" ? "repeated header line" : reason === "unit row" ? "unit row" : reason === "comment" ? "comment line" : "cut-off last line")}${entry.count > 1 ? ", first" : ""} on line ${entry.line}.`,
        caution: "",
      });
    return out;
  }
}
