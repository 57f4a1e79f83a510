/**
 * Unit markers in header cells, in the forms bench instruments write:
 * "Voltage (V)", "Spannung [mV]", "Strom_A", "I/mA", "Test Time / s", "Temp °C", "Zeit in h".
 */

export type UnitQuantity = "time" | "voltage" | "current" | "temperature" | "other";

export interface UnitMarker {
  quantity: UnitQuantity;
  /** Canonical unit: s, ms, min, h, hms, V, mV, A, mA, degC, degF, K, or the text for "other". */
  unit: string;
  /** The marker text as found. */
  text: string;
}

const table: ReadonlyArray<readonly [UnitQuantity, string, readonly string[]]> = [
  ["time", "s", ["s", "sec", "secs", "second", "seconds", "sek", "sekunden", "seg", "segundos", "secondes", "seconden", "secondi"]],
  ["time", "ms", ["ms", "msec", "millisecond", "milliseconds", "millisekunden"]],
  ["time", "min", ["min", "mins", "minute", "minutes", "minuten", "minutos", "minuti"]],
  ["time", "h", ["h", "hr", "hrs", "hour", "hours", "std", "stunden", "heures", "horas", "ore", "uur"]],
  ["time", "hms", ["hh:mm:ss", "h:mm:ss", "h:m:s", "hh:mm:ss.sss", "hh:mm:ss.ss", "hh:mm:ss.s", "[h]:mm:ss", "hhh:mm:ss"]],
  ["voltage", "V", ["v", "volt", "volts"]],
  ["voltage", "mV", ["mv", "millivolt", "millivolts"]],
  ["current", "A", ["a", "amp", "amps", "ampere", "amperes"]],
  ["current", "mA", ["ma", "milliamp", "milliamps", "milliampere", "milliamperes"]],
  ["temperature", "degC", ["°c", "degc", "deg c", "celsius", "c", "°"]],
  ["temperature", "degF", ["°f", "degf", "deg f", "fahrenheit"]],
  ["temperature", "K", ["k", "kelvin"]],
  ["other", "dimensionless", ["1", "-", "#", "%"]],
  ["other", "charge", ["ah", "mah", "as", "c/g", "mah/g"]],
  ["other", "energy", ["wh", "mwh", "kwh", "j"]],
  ["other", "power", ["w", "mw", "kw"]],
  ["other", "resistance", ["ohm", "mohm", "ω", "mω", "ohms", "mohms"]],
];

const lookup = new Map<string, readonly [UnitQuantity, string]>();
for (const [quantity, unit, spellings] of table) for (const s of spellings) lookup.set(s, [quantity, unit]);

/** Reads one unit token ("mV", "°C", "(s)") or returns null when it is not one. */
export function parseUnitToken(raw: string): UnitMarker | null {
  const text = raw.trim();
  const key = text
    .replace(/^[([{]\s*|\s*[)\]}]$/g, "")
    .replace(/Â/g, "") // "°" written as UTF-8 and read as Latin-1
    .replace(/º/g, "°") // the ordinal sign, a common stand-in for the degree sign
    .replace(/\s+/g, " ")
    .toLowerCase();
  const hit = lookup.get(key);
  return hit ? { quantity: hit[0], unit: hit[1], text } : null;
}

export interface HeaderParts {
  /** Header text with the unit marker removed. */
  label: string;
  unit: UnitMarker | null;
}

const markerPatterns: readonly RegExp[] = [
  /[([{]([^)\]}]*)[)\]}]/, // Voltage (V), Spannung [mV]
  /\/\s*([^/]+?)\s*$/, // Test Time / s, I/mA
  /_([^_\s]+)$/, // Strom_A
  /\s(?:in|en|em)\s+(\S+)$/i, // Spannung in V, Tension en V
  /\s(\S+)$/, // Current mA
];

/** Splits a header cell into its label and unit marker, if any. */
export function splitHeader(cell: string): HeaderParts {
  const text = cell.trim();
  const whole = parseUnitToken(text);
  if (whole) return { label: "", unit: whole };
  for (const pattern of markerPatterns) {
    const match = pattern.exec(text);
    const inner = match?.[1];
    if (match === null || inner === undefined) continue;
    const unit = parseUnitToken(inner);
    if (unit) return { label: (text.slice(0, match.index) + text.slice(match.index + match[0].length)).trim(), unit };
  }
  return { label: text, unit: null };
}
