/**
 * Contracts shared by the reader (lib/analysis/read) and the analyser
 * (steps, charge phases, totals, resistance, safety, plot series).
 *
 * This module is pure TypeScript: no Next, React, database or Node-only imports,
 * so the same code runs in the server, a worker thread, the CLI and the tests.
 *
 * Sign convention everywhere after the reader: current is positive while the
 * cell is being charged and negative while it is being discharged.
 */
import { z } from "zod";

/** Units the reader understands; values are converted to SI base units (s, V, A, °C). */
export const timeUnits = ["s", "ms", "min", "h"] as const;
export const voltageUnits = ["V", "mV"] as const;
export const currentUnits = ["A", "mA"] as const;
export const temperatureUnits = ["degC", "K", "degF"] as const;

export const timeFormats = [
  "elapsed", // a number in timeUnit from some origin
  "hms", // elapsed hh:mm:ss(.sss), hours may exceed 24
  "timestamp", // ISO-8601 or "YYYY-MM-DD hh:mm:ss", with or without offset
] as const;

/** How the log tells charge from discharge. */
export const currentSigns = [
  "positive-charges", // signed current, positive while charging
  "negative-charges", // signed current, negative while charging
  "magnitude-with-mode", // unsigned current; a mode/state column names the direction
] as const;

const columnRef = z.object({
  /** Zero-based column index in the header row. */
  index: z.number().int().min(0).max(4096),
  /** Header text as found (for display and for matching a saved map to a new file). */
  name: z.string().max(200).optional(),
});

/**
 * An explicit column map. It overrides detection field by field and is what a
 * user saves as a named column map. Serialisable as JSON.
 */
export const columnMapSchema = z
  .object({
    delimiter: z.enum([",", ";", "\t"]).optional(),
    decimal: z.enum([".", ","]).optional(),
    /** 1-based line number of the header row in the file. */
    headerLine: z.number().int().min(1).max(10_000).optional(),
    time: columnRef.extend({
      format: z.enum(timeFormats).default("elapsed"),
      unit: z.enum(timeUnits).default("s"),
    }),
    voltage: columnRef.extend({ unit: z.enum(voltageUnits).default("V") }),
    current: columnRef.extend({
      unit: z.enum(currentUnits).default("A"),
      sign: z.enum(currentSigns).default("positive-charges"),
    }),
    temperature: columnRef.extend({ unit: z.enum(temperatureUnits).default("degC") }).optional(),
    mode: columnRef.optional(),
    step: columnRef.optional(),
    cycle: columnRef.optional(),
  })
  .strict();
export type ColumnMap = z.infer<typeof columnMapSchema>;

export type ColumnRole = "time" | "voltage" | "current" | "temperature" | "mode" | "step" | "cycle";

export interface DetectedColumn {
  index: number;
  name: string;
  unit: string | null;
  /** 0..1: how sure detection is about this column's role and unit. */
  confidence: number;
}

export interface Detection {
  delimiter: "," | ";" | "\t";
  decimal: "." | ",";
  /** 1-based line of the header row. */
  headerLine: number;
  timeFormat: (typeof timeFormats)[number];
  currentSign: (typeof currentSigns)[number];
  columns: Partial<Record<ColumnRole, DetectedColumn>>;
  /** Lowest per-column confidence among the required columns; the UI asks the user to confirm below 0.8. */
  confidence: number;
  /** Metadata lines seen above the header (key/value text as found), for display. */
  preamble: string[];
  /** The complete ColumnMap equivalent of this detection, so a user can edit and save it. */
  columnMap: ColumnMap;
}

/**
 * A columnar chunk of normalised samples, in file order.
 * Arrays may be longer than `length` (reused buffers): read only [0, length).
 */
export interface SampleBatch {
  length: number;
  /** 1-based physical line in the file of each sample, for located messages. */
  line: Int32Array;
  /** Seconds since the first data row. */
  t: Float64Array;
  /** Volts. */
  v: Float64Array;
  /** Amperes, positive while charging. */
  i: Float64Array;
  /** °C, NaN where the log has no temperature. Null when the log has no temperature column. */
  temp: Float64Array | null;
  /** Step index from the log when present (NaN where missing), else null. */
  step: Float64Array | null;
  /** Cycle index from the log when present (NaN where missing), else null. */
  cycle: Float64Array | null;
}

export type Severity = "info" | "warning" | "danger";

export const findingKinds = [
  "over-voltage",
  "under-voltage",
  "charge-over-current",
  "discharge-over-current",
  "charge-temperature",
  "discharge-temperature",
  "cv-not-terminated",
  "logging-gap",
  "duplicate-timestamp",
  "dropped-rows",
  "skipped-rows",
] as const;
export type FindingKind = (typeof findingKinds)[number];

export interface Finding {
  kind: FindingKind;
  severity: Severity;
  /** Seconds from the first data row where the condition starts. */
  time_s: number;
  /** Where it ends, when it lasts. */
  end_s?: number;
  line?: number;
  value: number | null;
  limit: number | null;
  unit: string | null;
  /** Plain-language description of what was seen. */
  message: string;
  /** Safety caution to show beside it; empty for purely data-quality findings. */
  caution: string;
}

/** A hard problem: the file is rejected and nothing is stored. */
export interface LocatedError {
  code:
    | "empty"
    | "binary"
    | "no-header"
    | "no-data-rows"
    | "no-voltage-column"
    | "no-current-column"
    | "no-time-column"
    | "non-numeric"
    | "time-backwards"
    | "implausible-values"
    | "bad-column-map"
    | "line-too-long"
    | "too-many-columns";
  message: string;
  /** 1-based physical line, when one is to blame. */
  line?: number;
  /** 1-based column (field number), when one is to blame. */
  column?: number;
  /** Name of the file, when known. */
  file?: string;
}

export class AnalysisRejected extends Error {
  readonly detail: LocatedError;
  constructor(detail: LocatedError) {
    super(detail.message);
    this.name = "AnalysisRejected";
    this.detail = detail;
  }
}

/** Limits of a cell type, as the registry stores them. All optional: without them fewer checks run. */
export interface CellLimits {
  ratedCapacity_mAh?: number;
  nominalVoltage_V?: number;
  chargeVoltageLimit_V?: number;
  /** Tolerance above the charge limit before an over-voltage finding, default 0.05 V (domain notes, from memory). */
  chargeVoltageTolerance_V?: number;
  dischargeCutoff_V?: number;
  maxChargeC?: number;
  maxDischargeC?: number;
  /** Termination current as a fraction of 1C, e.g. 0.05 for C/20. */
  terminationC?: number;
  chargeTemp_C?: { min: number; max: number };
  dischargeTemp_C?: { min: number; max: number };
}

export const stepKinds = [
  "rest",
  "constant-current charge",
  "constant-voltage charge",
  "constant-current discharge",
  "other",
] as const;
export type StepKind = (typeof stepKinds)[number];
