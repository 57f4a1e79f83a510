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
import {
  cursor,
  fieldEmpty,
  parseHmsField,
  parseNumberField,
  parseTimestampField,
  skipField,
  textFieldBounds,
} from "./fast-fields";
import { reject } from "./reject";
import type { RowSink } from "./row-sink";
import type { StringRowReader } from "./string-rows";

const roleNone = 0;
const roleTime = 1;
const roleVoltage = 2;
const roleCurrent = 3;
const roleTemperature = 4;
const roleStep = 5;
const roleCycle = 6;
const roleRecord = 7;
const roleMode = 8;

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

  /** Temperature, step, cycle, record of the current line, in role order. */
  const extra = new Float64Array(4);
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

    let tWhole = Number.NaN;
    let tFrac = 0;
    let v = Number.NaN;
    let i = Number.NaN;
    extra.fill(Number.NaN);
    let direction = Number.NaN;
    let odd = false;
    let p = start;
    for (let field = 0; field <= lastField; field++) {
      if (p > end) {
        // The line ended before this field.
        if (roles[field]! >= roleTime && roles[field]! <= roleCurrent) odd = true;
        break;
      }
      switch (roles[field]) {
        case roleNone:
          cursor.pos = skipField(buf, p, end, delimiter);
          break;
        case roleTime:
          if (timeFormat === 0) tWhole = parseNumberField(buf, p, end, delimiter, decimal);
          else if (timeFormat === 1) tWhole = parseHmsField(buf, p, end, delimiter);
          else {
            tWhole = parseTimestampField(buf, p, end, delimiter);
            tFrac = cursor.frac;
          }
          if (cursor.status !== 0) odd = true;
          break;
        case roleVoltage:
          v = parseNumberField(buf, p, end, delimiter, decimal);
          if (cursor.status !== 0) odd = true;
          break;
        case roleCurrent:
          i = parseNumberField(buf, p, end, delimiter, decimal);
          if (cursor.status !== 0) odd = true;
          break;
        case roleTemperature:
        case roleStep:
        case roleCycle:
        case roleRecord:
          // Optional numbers: a bad cell is simply missing (NaN), as in the string reader.
          extra[roles[field]! - roleTemperature] = parseNumberField(buf, p, end, delimiter, decimal);
          break;
        case roleMode: {
          const from = textFieldBounds(buf, p, end, delimiter);
          if (cursor.status !== fieldEmpty) direction = modeOf(buf, from, cursor.stop, line, field);
          break;
        }
      }
      if (odd) break;
      p = cursor.pos + 1;
    }
    if (odd) return oddLine(buf, start, end, line, isLast);
    sink.row(line, tWhole, tFrac, v, i, extra[0]!, extra[1]!, extra[2]!, direction, extra[3]!);
  };

  const appendCarry = (chunk: Uint8Array, from: number, to: number) => {
    const length = carryLength + (to - from);
    if (length > maxLineBytes) reject("line-too-long", `Line ${lineNumber} is longer than ${maxLineBytes} bytes; a log line is much shorter.`, { line: lineNumber });
    if (length > carry.length) {
      const wider = new Uint8Array(Math.min(maxLineBytes + 1, length * 2));
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
        if (nl - pos > maxLineBytes) reject("line-too-long", `Line ${lineNumber} is longer than ${maxLineBytes} bytes; a log line is much shorter.`, { line: lineNumber });
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
