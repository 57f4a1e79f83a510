/**
 * The fast path: splits lines with the native byte search, parses the mapped
 * cells straight from bytes and hands numbers to the sink. Lines it cannot
 * read as plain numbers go to the string reader, which also decides whether
 * they are skipped or wrong.
 */
import Papa from "papaparse";
import { maxLineBytes } from "./limits";
import { classifyMode } from "./mode-words";
import type { ReadPlan } from "./plan";
import * as fields from "./fast-fields";
import { reject } from "./reject";
import type { RowSink } from "./row-sink";
import * as slots from "./row-slots";
import type { StringRowReader } from "./string-rows";

// Module-local copies of imported bindings: a CommonJS build (tsx: the CLI and the bench) reaches
// imports through getters, which costs more than the parsing itself in per-row code.
const { cursor: cur, fieldEmpty, fieldOk, parsed: out, parseHmsField: parseHms, quickNumberField: parseNumber } = fields;
const { parseTimestampField: parseTimestamp, skipField: skip, textFieldBounds: textBounds } = fields;
const lineLimit = maxLineBytes;
const { inCurrent, inCycle, inDirection, inRecord, inStep, inTemperature, inTimeFrac, inTimeWhole, inVoltage } = slots;

// Roles in this order: required numbers first, so `role <= roleCurrent` means required.
const roleNone = 0;
const roleTime = 1;
const roleVoltage = 2;
const roleCurrent = 3;
const roleTemperature = 4;
const roleStep = 5;
const roleCycle = 6;
const roleRecord = 7;
const roleMode = 8;
/** The sink input slot each numeric role fills. */
const slotOf: readonly number[] = [-1, inTimeWhole, inVoltage, inCurrent, inTemperature, inStep, inCycle, inRecord];

export interface LineParser {
  push(chunk: Uint8Array): void;
  end(): void;
}

/** `newline` is 10 for LF and CRLF files, 13 for the rare file with lone CR line ends. */
export function createFastParser(plan: ReadPlan, sink: RowSink, readCells: StringRowReader, encoding: string, newline: number): LineParser {
  const f = plan.fields;
  const lastField = Math.max(f.time, f.voltage, f.current, f.temperature, f.step, f.cycle, f.record, f.mode);
  const roles = new Uint8Array(lastField + 1);
  const assign = (index: number, role: number) => {
    if (index >= 0) roles[index] = role;
  };
  assign(f.time, roleTime);
  assign(f.voltage, roleVoltage);
  assign(f.current, roleCurrent);
  assign(f.temperature, roleTemperature);
  assign(f.step, roleStep);
  assign(f.cycle, roleCycle);
  assign(f.record, roleRecord);
  assign(f.mode, roleMode);

  const delimiter = plan.delimiter;
  const decimal = plan.decimal;
  const delimiterText = String.fromCharCode(delimiter) as "," | ";" | "\t";
  const timeFormat = plan.timeFormat === "elapsed" ? 0 : plan.timeFormat === "hms" ? 1 : 2;
  const decoder = new TextDecoder(encoding);
  const skipUntil = plan.headerLine;
  const unitLine = plan.unitRow?.line ?? -1;

  // The mode cell rarely changes: compare its bytes with the last one seen.
  let modeBytes = new Uint8Array(64);
  let modeLength = -1;
  let modeDirection = Number.NaN;

  let lineNumber = 1;
  let carry = new Uint8Array(4096);
  let carryLength = 0;

  const oddLine = (buf: Uint8Array, start: number, end: number, line: number, isLast: boolean) => {
    const text = decoder.decode(buf.subarray(start, end));
    const parsed = Papa.parse<string[]>(text, { delimiter: delimiterText, newline: "\n", quoteChar: '"' });
    readCells(line, parsed.data[0] ?? [""], isLast);
  };

  const modeOf = (buf: Uint8Array, start: number, stop: number, line: number, field: number): number => {
    const length = stop - start;
    if (length === modeLength) {
      let same = true;
      for (let k = 0; k < length; k++)
        if (modeBytes[k] !== buf[start + k]) {
          same = false;
          break;
        }
      if (same) return modeDirection;
    }
    const text = decoder.decode(buf.subarray(start, stop));
    const direction = classifyMode(text);
    if (Number.isNaN(direction)) sink.unknownMode(line, field, text);
    if (length > modeBytes.length) modeBytes = new Uint8Array(length * 2);
    modeBytes.set(buf.subarray(start, stop));
    modeLength = length;
    modeDirection = direction;
    return direction;
  };

  const processLine = (buf: Uint8Array, start: number, rawEnd: number, isLast: boolean) => {
    const line = lineNumber++;
    let end = rawEnd;
    if (newline === 10 && end > start && buf[end - 1] === 13) end--;
    if (line <= skipUntil) return;
    if (line === unitLine) return sink.skipped("unit row", line);
    if (end === start) return;

    const input = sink.input;
    input[inTimeFrac] = 0;
    input[inTemperature] = Number.NaN;
    input[inStep] = Number.NaN;
    input[inCycle] = Number.NaN;
    input[inDirection] = Number.NaN;
    input[inRecord] = Number.NaN;
    let odd = false;
    let p = start;
    for (let field = 0; field <= lastField; field++) {
      if (p > end) {
        // The line ended before this field.
        if (roles[field]! >= roleTime && roles[field]! <= roleCurrent) odd = true;
        break;
      }
      const role = roles[field]!;
      if (role === roleNone) cur.pos = skip(buf, p, end, delimiter);
      else if (role === roleMode) {
        const from = textBounds(buf, p, end, delimiter);
        if (cur.status !== fieldEmpty) input[inDirection] = modeOf(buf, from, cur.stop, line, field);
      } else {
        const status =
          role !== roleTime || timeFormat === 0
            ? parseNumber(buf, p, end, delimiter, decimal)
            : timeFormat === 1
              ? parseHms(buf, p, end, delimiter)
              : parseTimestamp(buf, p, end, delimiter);
        if (status === fieldOk) {
          input[slotOf[role]!] = out[0]!;
          if (role === roleTime && timeFormat === 2) input[inTimeFrac] = out[1]!;
        } else if (role <= roleCurrent) {
          odd = true;
          break;
        } else input[slotOf[role]!] = Number.NaN; // optional numbers: a bad cell is simply missing, as in the string reader
      }
      p = cur.pos + 1;
    }
    if (odd) return oddLine(buf, start, end, line, isLast);
    sink.commit(line);
  };

  const appendCarry = (chunk: Uint8Array, from: number, to: number) => {
    const length = carryLength + (to - from);
    if (length > lineLimit) reject("line-too-long", `Line ${lineNumber} is longer than ${lineLimit} bytes; a log line is much shorter.`, { line: lineNumber });
    if (length > carry.length) {
      const wider = new Uint8Array(Math.min(lineLimit + 1, length * 2));
      wider.set(carry.subarray(0, carryLength));
      carry = wider;
    }
    carry.set(chunk.subarray(from, to), carryLength);
    carryLength = length;
  };

  return {
    push(chunk) {
      let pos = 0;
      if (carryLength > 0) {
        const nl = chunk.indexOf(newline);
        if (nl < 0) {
          appendCarry(chunk, 0, chunk.length);
          return;
        }
        appendCarry(chunk, 0, nl);
        const length = carryLength;
        carryLength = 0;
        processLine(carry, 0, length, false);
        pos = nl + 1;
      }
      for (;;) {
        const nl = chunk.indexOf(newline, pos);
        if (nl < 0) break;
        if (nl - pos > lineLimit) reject("line-too-long", `Line ${lineNumber} is longer than ${lineLimit} bytes; a log line is much shorter.`, { line: lineNumber });
        processLine(chunk, pos, nl, false);
        pos = nl + 1;
      }
      if (pos < chunk.length) appendCarry(chunk, pos, chunk.length);
    },
    end() {
      if (carryLength > 0) {
        const length = carryLength;
        carryLength = 0;
        processLine(carry, 0, length, true);
      }
    },
  };
}
