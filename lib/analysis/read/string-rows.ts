/**
 * Reads one row given as text cells: every row of the papaparse path, and the
 * odd lines of the fast path (a bad or missing cell, a repeated header), so
 * both paths treat odd lines alike.
 */
import { classifyMode } from "./mode-words";
import type { ReadPlan } from "./plan";
import type { RowSink } from "./row-sink";
import { inCurrent, inCycle, inDirection, inRecord, inStep, inTemperature, inTimeFrac, inTimeWhole, inVoltage } from "./row-slots";
import { filledWidth } from "./sniff";
import { isBlankText, parseHmsText, parseNumberText, parseTimestampText } from "./text-values";

function sameCells(cells: readonly string[], reference: readonly string[]): boolean {
  const n = filledWidth(cells);
  if (n !== filledWidth(reference)) return false;
  for (let k = 0; k < n; k++) if ((cells[k] ?? "").trim() !== (reference[k] ?? "").trim()) return false;
  return true;
}

export type StringRowReader = (line: number, cells: readonly string[], isLastLine: boolean) => void;

export function createStringRowReader(plan: ReadPlan, sink: RowSink): StringRowReader {
  const decimal = plan.decimal === 44 ? "," : ".";
  const f = plan.fields;
  const unitCells = plan.unitRow?.cells ?? null;
  const needed = Math.max(f.time, f.voltage, f.current) + 1;
  const optional = (index: number, cells: readonly string[]) => (index < 0 ? Number.NaN : parseNumberText(cells[index] ?? "", decimal));

  return (line, cells, isLastLine) => {
    if (filledWidth(cells) === 0) return;
    if (sameCells(cells, plan.header)) return sink.skipped("repeated header", line);
    if (unitCells !== null && sameCells(cells, unitCells)) return sink.skipped("unit row", line);
    const first = (cells[0] ?? "").trim();
    if (first.startsWith("#") || first.startsWith("//")) return sink.skipped("comment", line);
    if (isLastLine && filledWidth(cells) < needed) return sink.skipped("cut-off last line", line);

    const input = sink.input;
    let ok = true;
    const timeCell = cells[f.time] ?? "";
    input[inTimeFrac] = 0;
    let tWhole = Number.NaN;
    if (plan.timeFormat === "elapsed") tWhole = parseNumberText(timeCell, decimal);
    else if (plan.timeFormat === "hms") tWhole = parseHmsText(timeCell);
    else {
      const ts = parseTimestampText(timeCell);
      if (ts !== null) {
        tWhole = ts.whole;
        input[inTimeFrac] = ts.frac;
      }
    }
    input[inTimeWhole] = tWhole;
    if (Number.isNaN(tWhole)) {
      sink.nonNumeric(line, f.time);
      ok = false;
    }
    for (const [field, slot] of [
      [f.voltage, inVoltage],
      [f.current, inCurrent],
    ] as const) {
      input[slot] = parseNumberText(cells[field] ?? "", decimal);
      if (Number.isNaN(input[slot])) {
        sink.nonNumeric(line, field);
        ok = false;
      }
    }
    input[inDirection] = Number.NaN;
    if (f.mode >= 0) {
      const text = (cells[f.mode] ?? "").trim();
      if (!isBlankText(text)) {
        input[inDirection] = classifyMode(text);
        if (Number.isNaN(input[inDirection])) sink.unknownMode(line, f.mode, text);
      }
    }
    if (!ok) return;
    input[inTemperature] = optional(f.temperature, cells);
    input[inStep] = optional(f.step, cells);
    input[inCycle] = optional(f.cycle, cells);
    input[inRecord] = optional(f.record, cells);
    sink.commit(line);
  };
}
