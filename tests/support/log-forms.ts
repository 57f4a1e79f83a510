/**
 * Writes one sample series out in every input form the reader accepts
 * (delimiters, decimal comma, BOM, CRLF, metadata lines, quoting, record
 * numbers, blank lines, trailing delimiters, unit prefixes, time formats,
 * current sign conventions, header languages, encodings), so tests can check
 * that readLog gives the series back from each of them.
 *
 * The header words are ordinary words of each language for time, voltage,
 * current and temperature, not any instrument's column names.
 */
import { readLog, type ReadOptions, type ReadSummary } from "@/lib/analysis/read";
import type { Detection } from "@/lib/analysis/types";

export interface Series {
  length: number;
  /** Seconds. */
  t: ArrayLike<number>;
  /** Volts. */
  v: ArrayLike<number>;
  /** Amperes, positive while charging. */
  i: ArrayLike<number>;
  /** °C, or absent. */
  temp?: ArrayLike<number> | null;
}

export interface FormExpectation {
  delimiter: Detection["delimiter"];
  decimal: Detection["decimal"];
  timeFormat: Detection["timeFormat"];
  currentSign: Detection["currentSign"];
  headerLine: number;
}

export interface LogForm {
  name: string;
  expected: FormExpectation;
  /** Largest error the written precision allows, per quantity (SI units). */
  tolerance: { t: number; v: number; i: number; temp: number };
  withTemperature: boolean;
  /** The path readLog's "auto" choice should take: papaparse only for quoting the fast path leaves to it. */
  autoPath: "fast" | "papaparse";
  /** Physical line of data row k. */
  lineOf: (k: number) => number;
  /** The file's bytes (rendered on demand: a long series makes big files). */
  render: () => Uint8Array;
}

type Delimiter = FormExpectation["delimiter"];

interface Column {
  header: string;
  unit?: string;
  cell: (k: number) => string;
  /** Numbers get the form's decimal mark; text (timestamps, words) does not. */
  numeric: boolean;
}

interface Spec {
  name: string;
  delimiter: Delimiter;
  decimal: "." | ",";
  newline?: "\n" | "\r\n" | "\r";
  bom?: boolean;
  encoding?: "utf-8" | "latin1" | "utf-16le";
  preamble?: string[];
  quoteAll?: boolean;
  trailingDelimiter?: boolean;
  /** A blank line after every n data rows. */
  blankEvery?: number;
  unitRow?: boolean;
  columns: Column[];
  timeFormat: FormExpectation["timeFormat"];
  currentSign: FormExpectation["currentSign"];
  tolerance: LogForm["tolerance"];
  withTemperature: boolean;
}

const slack = 1e-9;
const baseTolerance = { t: 0.0005 + slack, v: 0.000005 + slack, i: 0.0000005 + slack, temp: 0.005 + slack };

function pad(n: number, width: number): string {
  return String(n).padStart(width, "0");
}

/** Elapsed h:mm:ss.sss, hours unbounded. */
export function formatHms(seconds: number): string {
  const ms = Math.round(seconds * 1000);
  const h = Math.floor(ms / 3_600_000);
  const m = Math.floor((ms % 3_600_000) / 60_000);
  const s = (ms % 60_000) / 1000;
  return `${h}:${pad(m, 2)}:${s.toFixed(3).padStart(6, "0")}`;
}

/** Local time at the given UTC offset, written as ISO 8601 with or without the offset. */
export function formatTimestamp(epochMs: number, offsetMinutes: number, withOffset: boolean): string {
  const local = new Date(epochMs + offsetMinutes * 60_000).toISOString().slice(0, 23);
  if (!withOffset) return local.replace("T", " ");
  const sign = offsetMinutes < 0 ? "-" : "+";
  const abs = Math.abs(offsetMinutes);
  return `${local}${sign}${pad(Math.floor(abs / 60), 2)}:${pad(abs % 60, 2)}`;
}

/** A late-evening start, so the timestamps cross midnight. */
const startEpochMs = Date.UTC(2024, 2, 5, 22, 50, 0);

function modeWord(i: number, words: readonly [string, string, string]): string {
  return i > 0 ? words[0] : i < 0 ? words[1] : words[2];
}

interface Headers {
  time: string;
  voltage: string;
  current: string;
  temperature: string;
}

const languages: Record<string, Headers> = {
  english: { time: "Time (s)", voltage: "Voltage (V)", current: "Current (A)", temperature: "Temperature (°C)" },
  german: { time: "Zeit (s)", voltage: "Spannung (V)", current: "Strom (A)", temperature: "Temperatur (°C)" },
  french: { time: "Temps (s)", voltage: "Tension (V)", current: "Courant (A)", temperature: "Température (°C)" },
  spanish: { time: "Tiempo (s)", voltage: "Tensión (V)", current: "Corriente (A)", temperature: "Temperatura (°C)" },
  italian: { time: "Tempo (s)", voltage: "Tensione (V)", current: "Corrente (A)", temperature: "Temperatura (°C)" },
  dutch: { time: "Tijd (s)", voltage: "Spanning (V)", current: "Stroom (A)", temperature: "Temperatuur (°C)" },
  portuguese: { time: "Tempo (s)", voltage: "Tensão (V)", current: "Corrente (A)", temperature: "Temperatura (°C)" },
};

function formSpecs(s: Series): Spec[] {
  const hasTemp = s.temp !== undefined && s.temp !== null;
  const at = (a: ArrayLike<number>, k: number) => a[k] ?? Number.NaN;
  const time = (header = "Time (s)"): Column => ({ header, cell: (k) => at(s.t, k).toFixed(3), numeric: true });
  const voltage = (header = "Voltage (V)"): Column => ({ header, cell: (k) => at(s.v, k).toFixed(5), numeric: true });
  const current = (header = "Current (A)", scale = 1): Column => ({ header, cell: (k) => (scale * at(s.i, k)).toFixed(6), numeric: true });
  const temperature = (header = "Temperature (°C)"): Column[] =>
    hasTemp ? [{ header, cell: (k) => at(s.temp!, k).toFixed(2), numeric: true }] : [];
  const base = {
    decimal: "." as const,
    timeFormat: "elapsed" as const,
    currentSign: "positive-charges" as const,
    tolerance: baseTolerance,
    withTemperature: hasTemp,
  };
  const standard = (h: Headers = languages.english!): Column[] => [time(h.time), voltage(h.voltage), current(h.current), ...temperature(h.temperature)];
  const specs: Spec[] = [
    { ...base, name: "comma, LF", delimiter: ",", columns: standard() },
    { ...base, name: "semicolon, decimal comma, German", delimiter: ";", decimal: ",", columns: standard(languages.german) },
    { ...base, name: "tab, decimal comma, French", delimiter: "\t", decimal: ",", columns: standard(languages.french) },
    { ...base, name: "tab, decimal point", delimiter: "\t", columns: standard() },
    { ...base, name: "semicolon, decimal point", delimiter: ";", columns: standard() },
    { ...base, name: "UTF-8 BOM, CRLF", delimiter: ",", bom: true, newline: "\r\n", columns: standard() },
    { ...base, name: "lone CR line ends", delimiter: ",", newline: "\r", columns: standard() },
    {
      ...base,
      name: "metadata lines before the header",
      delimiter: ";",
      decimal: ",",
      preamble: ["Operator: J. Doe", "Channel;3", "Cell: sample cell 7", ""],
      columns: standard(languages.german),
    },
    { ...base, name: "every field quoted", delimiter: ",", quoteAll: true, columns: standard() },
    { ...base, name: "quoted decimal comma, comma delimiter", delimiter: ",", decimal: ",", quoteAll: true, columns: standard() },
    {
      ...base,
      name: "record-number column",
      delimiter: ",",
      columns: [{ header: "Record", cell: (k) => String(k + 1), numeric: true }, ...standard()],
    },
    { ...base, name: "blank lines", delimiter: ",", blankEvery: 7, columns: standard() },
    { ...base, name: "trailing delimiter", delimiter: ";", decimal: ",", trailingDelimiter: true, columns: standard() },
    {
      ...base,
      name: "millivolts and milliamperes",
      delimiter: ",",
      columns: [
        time(),
        { header: "Voltage [mV]", cell: (k) => (1000 * at(s.v, k)).toFixed(2), numeric: true },
        { header: "Current [mA]", cell: (k) => (1000 * at(s.i, k)).toFixed(3), numeric: true },
        ...temperature(),
      ],
    },
    {
      ...base,
      name: "suffix units, milliseconds",
      delimiter: ";",
      columns: [
        { header: "Zeit_ms", cell: (k) => (1000 * at(s.t, k)).toFixed(0), numeric: true },
        voltage("Spannung_V"),
        { header: "Strom_mA", cell: (k) => (1000 * at(s.i, k)).toFixed(3), numeric: true },
        ...temperature("Temperatur_degC"),
      ],
    },
    {
      ...base,
      name: "minutes",
      delimiter: ",",
      tolerance: { ...baseTolerance, t: 60 * 0.5e-7 + slack },
      columns: [{ header: "Time (min)", cell: (k) => (at(s.t, k) / 60).toFixed(7), numeric: true }, voltage(), current(), ...temperature()],
    },
    {
      ...base,
      name: "hours, slash units",
      delimiter: ",",
      tolerance: { ...baseTolerance, t: 3600 * 0.5e-9 + 1e-7 },
      columns: [
        { header: "t/h", cell: (k) => (at(s.t, k) / 3600).toFixed(9), numeric: true },
        voltage("U/V"),
        current("I/A"),
        ...temperature("T/°C"),
      ],
    },
    {
      ...base,
      name: "elapsed hh:mm:ss.sss",
      delimiter: ";",
      decimal: ",",
      timeFormat: "hms",
      columns: [
        { header: "Test time (hh:mm:ss)", cell: (k) => formatHms(at(s.t, k)), numeric: false },
        voltage("Voltage (V)"),
        current("Current (A)"),
        ...temperature(),
      ],
    },
    {
      ...base,
      name: "ISO timestamps with offset (offset changes mid-file)",
      delimiter: ",",
      timeFormat: "timestamp",
      columns: [
        {
          header: "Timestamp",
          cell: (k) => formatTimestamp(startEpochMs + Math.round(at(s.t, k) * 1000), k < s.length / 2 ? 60 : 120, true),
          numeric: false,
        },
        voltage(),
        current(),
        ...temperature(),
      ],
    },
    {
      ...base,
      name: "timestamps without offset",
      delimiter: ";",
      decimal: ",",
      timeFormat: "timestamp",
      columns: [
        { header: "Datum/Uhrzeit", cell: (k) => formatTimestamp(startEpochMs + Math.round(at(s.t, k) * 1000), 0, false), numeric: false },
        voltage("Spannung (V)"),
        current("Strom (A)"),
        ...temperature("Temperatur (°C)"),
      ],
    },
    { ...base, name: "negative current charges", delimiter: ",", currentSign: "negative-charges", columns: [time(), voltage(), current("Current (A)", -1), ...temperature()] },
    {
      ...base,
      name: "magnitude with English mode words",
      delimiter: ",",
      currentSign: "magnitude-with-mode",
      columns: [
        time(),
        voltage(),
        { header: "Current (A)", cell: (k) => Math.abs(at(s.i, k)).toFixed(6), numeric: true },
        { header: "State", cell: (k) => modeWord(at(s.i, k), ["Charge", "Discharge", "Rest"]), numeric: false },
        ...temperature(),
      ],
    },
    {
      ...base,
      name: "magnitude with German mode words",
      delimiter: ";",
      decimal: ",",
      currentSign: "magnitude-with-mode",
      columns: [
        time("Zeit (s)"),
        { header: "Modus", cell: (k) => modeWord(at(s.i, k), ["Laden", "Entladen", "Pause"]), numeric: false },
        voltage("Spannung (V)"),
        { header: "Strom (A)", cell: (k) => Math.abs(at(s.i, k)).toFixed(6), numeric: true },
      ],
      withTemperature: false,
    },
    {
      ...base,
      name: "magnitude with French mode words, decimal comma",
      delimiter: ";",
      decimal: ",",
      currentSign: "magnitude-with-mode",
      columns: [
        time("Temps (s)"),
        voltage("Tension (V)"),
        { header: "Courant (A)", cell: (k) => Math.abs(at(s.i, k)).toFixed(6), numeric: true },
        { header: "État", cell: (k) => modeWord(at(s.i, k), ["Charge", "Décharge", "Repos"]), numeric: false },
        ...temperature("Température (°C)"),
      ],
    },
    {
      ...base,
      name: "magnitude with one-letter modes",
      delimiter: "\t",
      currentSign: "magnitude-with-mode",
      columns: [
        time(),
        voltage(),
        { header: "Current (mA)", cell: (k) => (1000 * Math.abs(at(s.i, k))).toFixed(3), numeric: true },
        { header: "Mode", cell: (k) => modeWord(at(s.i, k), ["C", "D", "R"]), numeric: false },
      ],
      withTemperature: false,
    },
    { ...base, name: "Spanish headers", delimiter: ";", decimal: ",", columns: standard(languages.spanish) },
    { ...base, name: "Italian headers", delimiter: ";", decimal: ",", columns: standard(languages.italian) },
    { ...base, name: "Dutch headers", delimiter: ";", decimal: ",", columns: standard(languages.dutch) },
    { ...base, name: "Portuguese headers", delimiter: ";", decimal: ",", columns: standard(languages.portuguese) },
    { ...base, name: "Latin-1 encoded degree sign", delimiter: ";", decimal: ",", encoding: "latin1", columns: standard(languages.french) },
    { ...base, name: "UTF-16LE with BOM", delimiter: "\t", bom: true, encoding: "utf-16le", columns: standard() },
    {
      ...base,
      name: "unit row under the header",
      delimiter: ";",
      decimal: ",",
      unitRow: true,
      columns: [
        { header: "Zeit", unit: "s", cell: (k) => at(s.t, k).toFixed(3), numeric: true },
        { header: "Spannung", unit: "mV", cell: (k) => (1000 * at(s.v, k)).toFixed(2), numeric: true },
        { header: "Strom", unit: "A", cell: (k) => at(s.i, k).toFixed(6), numeric: true },
      ],
      withTemperature: false,
    },
    {
      ...base,
      name: "quantity / unit labels",
      delimiter: ",",
      columns: [
        time("Test Time / s"),
        voltage("Voltage / V"),
        current("Current / A"),
        ...temperature("Cell Temperature / degC"),
        { header: "Cycle Count / 1", cell: () => "1", numeric: true },
      ],
    },
    {
      ...base,
      name: "extra columns in another order",
      delimiter: ",",
      columns: [
        { header: "Step", cell: () => "1", numeric: true },
        current("Current (A)"),
        { header: "Capacity (Ah)", cell: (k) => (at(s.t, k) / 3600).toFixed(4), numeric: true },
        { header: "Power (W)", cell: (k) => (at(s.v, k) * at(s.i, k)).toFixed(4), numeric: true },
        voltage("Voltage (V)"),
        { header: "Step Time (s)", cell: (k) => (at(s.t, k) % 100).toFixed(3), numeric: true },
        time("Total Time (s)"),
        ...temperature(),
      ],
    },
  ];
  return specs;
}

function quoteCell(cell: string): string {
  return `"${cell.replace(/"/g, '""')}"`;
}

function encode(text: string, encoding: Spec["encoding"], bom: boolean): Uint8Array {
  if (encoding === "latin1") {
    const out = new Uint8Array(text.length);
    for (let k = 0; k < text.length; k++) out[k] = text.charCodeAt(k) & 0xff;
    return out;
  }
  if (encoding === "utf-16le") {
    const body = bom ? `\ufeff${text}` : text;
    const out = new Uint8Array(body.length * 2);
    for (let k = 0; k < body.length; k++) {
      const c = body.charCodeAt(k);
      out[2 * k] = c & 0xff;
      out[2 * k + 1] = c >> 8;
    }
    return out;
  }
  return new TextEncoder().encode(bom ? `\ufeff${text}` : text);
}

function render(spec: Spec, s: Series): Uint8Array {
  const nl = spec.newline ?? "\n";
  const d = spec.delimiter;
  const join = (cells: string[]) => {
    const written = spec.quoteAll ? cells.map(quoteCell) : cells;
    return written.join(d) + (spec.trailingDelimiter ? d : "");
  };
  const out: string[] = [...(spec.preamble ?? [])];
  out.push(join(spec.columns.map((c) => c.header)));
  if (spec.unitRow) out.push(join(spec.columns.map((c) => c.unit ?? "")));
  for (let k = 0; k < s.length; k++) {
    out.push(join(spec.columns.map((c) => (c.numeric && spec.decimal === "," ? c.cell(k).replace(".", ",") : c.cell(k)))));
    if (spec.blankEvery !== undefined && (k + 1) % spec.blankEvery === 0) out.push("");
  }
  return encode(out.join(nl) + nl, spec.encoding, spec.bom ?? false);
}

/** Every input form of the series. */
export function logForms(s: Series): LogForm[] {
  return formSpecs(s).map((spec) => {
    const headerLine = (spec.preamble?.length ?? 0) + 1;
    const firstData = headerLine + (spec.unitRow ? 1 : 0) + 1;
    const every = spec.blankEvery;
    return {
      name: spec.name,
      expected: { delimiter: spec.delimiter, decimal: spec.decimal, timeFormat: spec.timeFormat, currentSign: spec.currentSign, headerLine },
      tolerance: spec.tolerance,
      withTemperature: spec.withTemperature,
      autoPath: spec.quoteAll && spec.decimal === spec.delimiter ? "papaparse" : "fast",
      lineOf: (k) => firstData + k + (every === undefined ? 0 : Math.floor(k / every)),
      render: () => render(spec, s),
    };
  });
}

/** The bytes as a stream of chunks of the given size (odd sizes cut lines, CRLF pairs and characters). */
export async function* chunked(bytes: Uint8Array, size: number): AsyncGenerator<Uint8Array> {
  for (let at = 0; at < bytes.length; at += size) yield bytes.subarray(at, Math.min(bytes.length, at + size));
}

export interface ReadBack {
  summary: ReadSummary;
  line: number[];
  t: number[];
  v: number[];
  i: number[];
  temp: number[] | null;
  step: number[] | null;
  cycle: number[] | null;
  batches: number;
}

/** Reads a whole log and copies every batch out (the reader reuses its buffers). */
export async function readAll(bytes: Uint8Array, options: ReadOptions & { chunkSize?: number } = {}): Promise<ReadBack> {
  const out: Omit<ReadBack, "summary"> = { line: [], t: [], v: [], i: [], temp: null, step: null, cycle: null, batches: 0 };
  const append = (target: number[], source: ArrayLike<number>, n: number) => {
    for (let k = 0; k < n; k++) target.push(source[k]!);
  };
  const summary = await readLog(
    chunked(bytes, options.chunkSize ?? 65536),
    (b) => {
      out.batches++;
      append(out.line, b.line, b.length);
      append(out.t, b.t, b.length);
      append(out.v, b.v, b.length);
      append(out.i, b.i, b.length);
      if (b.temp) append((out.temp ??= []), b.temp, b.length);
      if (b.step) append((out.step ??= []), b.step, b.length);
      if (b.cycle) append((out.cycle ??= []), b.cycle, b.length);
    },
    options,
  );
  return { summary, ...out };
}

export interface ReadErrors {
  rows: number;
  /** Largest absolute differences from the series (times relative to the first row). */
  t: number;
  v: number;
  i: number;
  temp: number;
  /** Physical lines of the first and last row as read, and as the form wrote them. */
  lines: { read: [number, number]; written: [number, number] };
}

/** How far what was read is from the series it was written from. */
export function readErrors(form: LogForm, got: ReadBack, s: Series): ReadErrors {
  const t0 = s.t[0]!;
  const e = { t: 0, v: 0, i: 0, temp: 0 };
  for (let k = 0; k < s.length; k++) {
    e.t = Math.max(e.t, Math.abs(got.t[k]! - (s.t[k]! - t0)));
    e.v = Math.max(e.v, Math.abs(got.v[k]! - s.v[k]!));
    e.i = Math.max(e.i, Math.abs(got.i[k]! - s.i[k]!));
    if (form.withTemperature) e.temp = Math.max(e.temp, Math.abs((got.temp?.[k] ?? Number.NaN) - s.temp![k]!));
  }
  for (const key of ["t", "v", "i", "temp"] as const) if (Number.isNaN(e[key])) e[key] = Infinity;
  return {
    rows: got.summary.rows,
    ...e,
    lines: { read: [got.line[0] ?? 0, got.line.at(-1) ?? 0], written: [form.lineOf(0), form.lineOf(s.length - 1)] },
  };
}

/**
 * A small invented test series: rest, constant-current charge, constant-voltage
 * hold, rest, constant-current discharge, rest, logged every second. The cell
 * is a crude open-circuit curve plus a series resistance; only the reader is
 * under test here, so the numbers need to look like a cell, not be one.
 */
export function sampleSeries(options: { withTemperature?: boolean; interval_s?: number } = {}): Series {
  const dt = options.interval_s ?? 1;
  const capacityAs = 0.5 * 3600; // 500 mAh
  const r = 0.08;
  const ocv = (soc: number) => 3.3 + 0.9 * soc - 0.15 * Math.exp(-12 * soc);
  const t: number[] = [];
  const v: number[] = [];
  const i: number[] = [];
  const temp: number[] = [];
  let soc = 0.1;
  let clock = 0;
  const log = (current: number, volts: number) => {
    t.push(clock);
    v.push(volts);
    i.push(current);
    temp.push(25 + 2 * Math.abs(current) * Math.sin(clock / 900) ** 2);
    soc += (current * dt) / capacityAs;
    clock += dt;
  };
  const rest = (seconds: number) => {
    for (let s = 0; s < seconds; s += dt) log(0, ocv(soc));
  };
  rest(120);
  while (ocv(soc) + r * 0.5 < 4.2) log(0.5, ocv(soc) + r * 0.5);
  for (let current = 0.5; current > 0.025; current = (4.2 - ocv(soc)) / r) log(current, 4.2);
  rest(300);
  while (ocv(soc) - r * 0.5 > 3.0) log(-0.5, ocv(soc) - r * 0.5);
  rest(300);
  return { length: t.length, t, v, i, temp: options.withTemperature === false ? null : temp };
}
