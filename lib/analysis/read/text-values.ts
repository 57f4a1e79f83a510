/**
 * Cell parsing from text, for detection, preview and the papaparse path.
 * Written independently of the byte parser (fast-fields.ts) on purpose: the
 * tests compare the two paths, so each checks the other.
 */
import { hmsSeconds, validDate, wholeSeconds } from "./civil-time";

const plainNumber = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/** A decimal number with the given decimal mark; NaN when empty or not a number. */
export function parseNumberText(text: string, decimal: "." | ","): number {
  let s = text.trim();
  if (decimal === ",") {
    if (s.includes(".")) return Number.NaN;
    s = s.replace(",", ".");
  }
  return plainNumber.test(s) ? Number(s) : Number.NaN;
}

export function isBlankText(text: string): boolean {
  return text.trim().length === 0;
}

/** Accepts either decimal mark, for deciding whether a cell is numeric at all. */
export function looksNumeric(text: string): boolean {
  const s = text.trim();
  return plainNumber.test(s) || plainNumber.test(s.replace(",", "."));
}

const hmsPattern = /^(\d{1,12}):(\d{1,2}):(\d{1,2}(?:[.,]\d{1,9})?)$/;

/** Elapsed hh:mm:ss(.sss), hours unbounded; NaN when not that form. */
export function parseHmsText(text: string): number {
  const m = hmsPattern.exec(text.trim());
  if (!m) return Number.NaN;
  const minutes = Number(m[2]);
  const seconds = Number((m[3] ?? "").replace(",", "."));
  if (minutes > 59 || seconds >= 60) return Number.NaN;
  return hmsSeconds(Number(m[1]), minutes, seconds);
}

const timestampPattern =
  /^(\d{4})[-/](\d{1,2})[-/](\d{1,2})(?:T|\s+)(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?\s*(Z|[+-]\d{2}(?::?\d{2})?)?$/i;

export interface TimestampParts {
  /** Whole seconds since the epoch (offset applied). */
  whole: number;
  /** Fraction of a second, 0 <= frac < 1. */
  frac: number;
}

/** ISO-8601 or "YYYY-MM-DD hh:mm:ss(.sss)" with optional Z or ±hh(:mm); null when not that form. */
export function parseTimestampText(text: string): TimestampParts | null {
  const m = timestampPattern.exec(text.trim());
  if (!m) return null;
  const [year, month, day, hour, minute] = [m[1], m[2], m[3], m[4], m[5]].map(Number) as [number, number, number, number, number];
  const second = m[6] === undefined ? 0 : Number(m[6]);
  if (!validDate(year, month, day) || hour > 23 || minute > 59 || second > 59) return null;
  let offset = 0;
  const zone = m[8];
  if (zone !== undefined && zone.toUpperCase() !== "Z") {
    const digits = zone.slice(1).replace(":", "");
    const oh = Number(digits.slice(0, 2));
    const om = digits.length > 2 ? Number(digits.slice(2)) : 0;
    if (oh > 14 || om > 59) return null;
    offset = (zone.startsWith("-") ? -1 : 1) * (oh * 60 + om);
  }
  const frac = m[7] === undefined ? 0 : Number(`0.${m[7]}`);
  return { whole: wholeSeconds(year, month, day, hour, minute, second, offset), frac };
}
