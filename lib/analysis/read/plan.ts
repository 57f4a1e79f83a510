/**
 * The read plan: detection merged with an explicit column map (the map wins
 * field by field), and everything the parsing paths need as plain numbers.
 */
import type { z } from "zod";
import {
  columnMapSchema,
  type ColumnMap,
  type ColumnRole,
  type DetectedColumn,
  type Detection,
  type currentSigns,
  type currentUnits,
  type temperatureUnits,
  type timeFormats,
  type timeUnits,
  type voltageUnits,
} from "../types";
import { chooseColumns, columnFacts, type ColumnFacts } from "./columns";
import { reject } from "./reject";
import type { Layout, LayoutHints } from "./sniff";

export type ColumnMapInput = z.input<typeof columnMapSchema>;
type TimeFormat = (typeof timeFormats)[number];
type TimeUnit = (typeof timeUnits)[number];
type CurrentSign = (typeof currentSigns)[number];

export interface ReadPlan {
  detection: Detection;
  delimiter: number;
  decimal: number;
  headerLine: number;
  header: string[];
  unitRow: { line: number; cells: string[] } | null;
  /** Zero-based field index per role, -1 when absent. */
  fields: { time: number; voltage: number; current: number; temperature: number; mode: number; step: number; cycle: number; record: number };
  timeFormat: TimeFormat;
  /** Seconds = (raw difference) * timeMul / timeDiv. */
  timeMul: number;
  timeDiv: number;
  voltDiv: number;
  ampDiv: number;
  tempUnit: (typeof temperatureUnits)[number];
  voltUnit: (typeof voltageUnits)[number];
  ampUnit: (typeof currentUnits)[number];
  /** "decide": signed current whose direction is found from the mode column or the voltage response. */
  sign: CurrentSign | "decide";
  /** Quoting the fast path leaves to papaparse (see Layout.oddQuoting). */
  oddQuoting: boolean;
}

const timeScale: Record<TimeUnit, [number, number]> = { s: [1, 1], ms: [1, 1000], min: [60, 1], h: [3600, 1] };

function timeSpec(f: ColumnFacts | undefined): { format: TimeFormat; unit: TimeUnit } {
  if (f === undefined) return { format: "elapsed", unit: "s" };
  if (f.timestampShare >= 0.9) return { format: "timestamp", unit: "s" };
  if (f.hmsShare >= 0.9 || (f.unit?.unit === "hms" && f.numericShare < 0.9)) return { format: "hms", unit: "s" };
  const unit = f.unit?.quantity === "time" && f.unit.unit !== "hms" ? (f.unit.unit as TimeUnit) : "s";
  return { format: "elapsed", unit };
}

function unitOf<T extends string>(f: ColumnFacts | undefined, allowed: readonly T[], fallback: T): T {
  const u = f?.unit?.unit;
  return u !== undefined && (allowed as readonly string[]).includes(u) ? (u as T) : fallback;
}

function displayTimeUnit(format: TimeFormat, unit: TimeUnit): string {
  return format === "hms" ? "hh:mm:ss" : format === "timestamp" ? "ISO 8601" : unit;
}

/**
 * A saved map names its columns: when the named header has moved in a new
 * file (one column added in front, say), follow the name, if exactly one
 * header cell carries it. Otherwise the index stands.
 */
function matchSavedName(header: readonly string[], index: number, name: string | undefined): number {
  if (name === undefined) return index;
  const key = name.trim().toLowerCase();
  if ((header[index] ?? "").trim().toLowerCase() === key) return index;
  const hits = header.flatMap((h, k) => (h.trim().toLowerCase() === key ? [k] : []));
  return hits.length === 1 ? hits[0]! : index;
}

function parseMap(raw: ColumnMapInput): ColumnMap {
  const parsed = columnMapSchema.safeParse(raw);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    reject("bad-column-map", `The column map is not valid: ${issue ? `${issue.path.join(".")}: ${issue.message}` : "unknown problem"}.`);
  }
  return parsed.data;
}

/** Builds the plan. `rawMap` keeps which fields the user actually set (zod fills defaults in). */
export function buildPlan(layout: Layout, rawMap?: ColumnMapInput): ReadPlan {
  const map = rawMap === undefined ? undefined : parseMap(rawMap);
  const facts = columnFacts(layout);
  const chosen = chooseColumns(facts);
  const width = Math.max(layout.header.length, 1);

  const refFor = (role: ColumnRole): { index: number; confidence: number } | undefined => {
    const mapped = map?.[role];
    if (mapped !== undefined) {
      const index = matchSavedName(layout.header, mapped.index, mapped.name);
      if (index >= width)
        reject(
          "bad-column-map",
          `The column map puts ${role} in column ${index + 1}, but the header on line ${layout.headerLine} has ${layout.header.length} columns.`,
          { line: layout.headerLine, column: index + 1 },
        );
      return { index, confidence: 1 };
    }
    const c = chosen[role];
    if (c === undefined) return undefined;
    // A column the map already claims for another role is not reused.
    const claimed = (["time", "voltage", "current", "temperature", "mode", "step", "cycle"] as const).some((r) => {
      const other = map?.[r];
      return r !== role && other !== undefined && matchSavedName(layout.header, other.index, other.name) === c.index;
    });
    return claimed ? undefined : c;
  };

  const listed = layout.header.slice(0, 20).map((h, k) => `${k + 1} "${h}"`);
  const headerList = listed.join(", ") + (layout.header.length > listed.length ? `, and ${layout.header.length - listed.length} more` : "");
  const required = (role: "time" | "voltage" | "current", code: "no-time-column" | "no-voltage-column" | "no-current-column") => {
    const ref = refFor(role);
    if (ref === undefined)
      reject(code, `No ${role} column found in the header on line ${layout.headerLine} (columns: ${headerList}). Map it by hand.`, {
        line: layout.headerLine,
      });
    return ref;
  };
  const voltage = required("voltage", "no-voltage-column");
  const current = required("current", "no-current-column");
  const time = required("time", "no-time-column");
  const temperature = refFor("temperature");
  const mode = refFor("mode");
  const step = refFor("step");
  const cycle = refFor("cycle");
  const record = chosen.record && ![time, voltage, current, temperature, mode, step, cycle].some((r) => r?.index === chosen.record?.index) ? chosen.record : undefined;

  const factAt = (index: number | undefined): ColumnFacts | undefined => (index === undefined ? undefined : facts[index]);
  const detectedTime = timeSpec(factAt(time.index));
  const rawTime = rawMap?.time;
  const timeFormat = rawTime?.format ?? detectedTime.format;
  const timeUnit: TimeUnit = rawTime?.unit ?? (timeFormat === "elapsed" ? (detectedTime.format === "elapsed" ? detectedTime.unit : "s") : "s");
  const voltUnit = rawMap?.voltage?.unit ?? unitOf(factAt(voltage.index), ["V", "mV"] as const, "V");
  const ampUnit = rawMap?.current?.unit ?? unitOf(factAt(current.index), ["A", "mA"] as const, "A");
  const tempUnit = rawMap?.temperature?.unit ?? unitOf(factAt(temperature?.index), ["degC", "degF", "K"] as const, "degC");

  const currentFacts = factAt(current.index);
  const mappedSign = rawMap?.current?.sign;
  const sign: ReadPlan["sign"] =
    mappedSign ?? (mode !== undefined && currentFacts !== undefined && !currentFacts.hasNegative ? "magnitude-with-mode" : "decide");

  const describe = (ref: { index: number; confidence: number }, unit: string | null): DetectedColumn => ({
    index: ref.index,
    name: layout.header[ref.index] ?? "",
    unit,
    confidence: ref.confidence,
  });
  const columns: Detection["columns"] = {
    time: describe(time, displayTimeUnit(timeFormat, timeUnit)),
    voltage: describe(voltage, voltUnit),
    current: describe(current, ampUnit),
  };
  if (temperature) columns.temperature = describe(temperature, tempUnit);
  if (mode) columns.mode = describe(mode, null);
  if (step) columns.step = describe(step, null);
  if (cycle) columns.cycle = describe(cycle, null);

  const ref = (c: DetectedColumn | undefined) => (c === undefined ? undefined : { index: c.index, name: c.name });
  const currentSign: CurrentSign = sign === "decide" ? "positive-charges" : sign;
  const columnMap: ColumnMap = {
    delimiter: layout.delimiter,
    decimal: layout.decimal,
    headerLine: layout.headerLine,
    time: { ...ref(columns.time)!, format: timeFormat, unit: timeUnit },
    voltage: { ...ref(columns.voltage)!, unit: voltUnit },
    current: { ...ref(columns.current)!, unit: ampUnit, sign: currentSign },
  };
  if (columns.temperature) columnMap.temperature = { ...ref(columns.temperature)!, unit: tempUnit };
  if (columns.mode) columnMap.mode = ref(columns.mode);
  if (columns.step) columnMap.step = ref(columns.step);
  if (columns.cycle) columnMap.cycle = ref(columns.cycle);

  const detection: Detection = {
    delimiter: layout.delimiter,
    decimal: layout.decimal,
    headerLine: layout.headerLine,
    timeFormat,
    currentSign,
    columns,
    confidence: Math.min(time.confidence, voltage.confidence, current.confidence),
    preamble: layout.preamble,
    columnMap,
  };
  const [timeMul, timeDiv] = timeScale[timeUnit];
  return {
    detection,
    delimiter: layout.delimiter.charCodeAt(0),
    decimal: layout.decimal.charCodeAt(0),
    headerLine: layout.headerLine,
    header: layout.header,
    unitRow: layout.unitRow,
    fields: {
      time: time.index,
      voltage: voltage.index,
      current: current.index,
      temperature: temperature?.index ?? -1,
      mode: mode?.index ?? -1,
      step: step?.index ?? -1,
      cycle: cycle?.index ?? -1,
      record: record?.index ?? -1,
    },
    timeFormat,
    timeMul,
    timeDiv,
    voltDiv: voltUnit === "mV" ? 1000 : 1,
    ampDiv: ampUnit === "mA" ? 1000 : 1,
    tempUnit,
    voltUnit,
    ampUnit,
    sign,
    oddQuoting: layout.oddQuoting,
  };
}

/** The detection once the sign is known, with the current column's confidence capped by how sure the sign is. */
export function settleDetection(detection: Detection, sign: CurrentSign, signConfidence: number): Detection {
  const current = detection.columns.current;
  const columns = { ...detection.columns };
  if (current) columns.current = { ...current, confidence: Math.min(current.confidence, signConfidence) };
  const required = [columns.time, columns.voltage, columns.current].map((c) => c?.confidence ?? 0);
  return {
    ...detection,
    currentSign: sign,
    columns,
    confidence: Math.min(...required),
    columnMap: { ...detection.columnMap, current: { ...detection.columnMap.current, sign } },
  };
}

/** The layout settings a column map fixes before detection runs. */
export function layoutHints(rawMap: ColumnMapInput | undefined): LayoutHints {
  if (rawMap === undefined) return {};
  const map = parseMap(rawMap);
  const hints: LayoutHints = {};
  if (map.delimiter !== undefined) hints.delimiter = map.delimiter;
  if (map.decimal !== undefined) hints.decimal = map.decimal;
  if (map.headerLine !== undefined) hints.headerLine = map.headerLine;
  return hints;
}
