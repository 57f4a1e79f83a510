/**
 * Byte-level cell parsers for the fast path: bytes to numbers without a string
 * per field. Each parser starts at a field's first byte and leaves `cursor.pos`
 * on the delimiter that ends the field (or the line end) and `cursor.status`
 * telling a good value from an empty or bad cell.
 *
 * Decimal conversion: a mantissa m < 2^53 and a power of ten 10^k with k <= 22
 * are both exact doubles, so m / 10^k (or m * 10^k) is a single correctly
 * rounded operation and equals Number() of the same text (IEEE 754 round to
 * nearest; the "fast path" of Clinger's algorithm, W. D. Clinger, PLDI 1990).
 * Anything outside that range falls back to Number() on the field's text.
 */
import { hmsSeconds, validDate, wholeSeconds } from "./civil-time";

export const fieldOk = 0;
export const fieldEmpty = 1;
export const fieldBad = 2;

/** Shared scan state, so the hot loop allocates nothing. `frac`: a timestamp's fraction; `stop`: a text field's end. */
export const cursor = { pos: 0, status: fieldOk, frac: 0, stop: 0 };

const quote = 34;
const space = 32;
const tab = 9;
const exactMantissa = 2 ** 53;
const powersOfTen: readonly number[] = Array.from({ length: 23 }, (_, k) => 10 ** k);

function isBlank(c: number | undefined, delimiter: number): boolean {
  return (c === space || c === tab) && c !== delimiter;
}

/** Moves past the rest of a field (quote-aware) and leaves the cursor on its end. */
export function skipField(buf: Uint8Array, pos: number, end: number, delimiter: number): number {
  let p = pos;
  let inQuotes = false;
  while (p < end) {
    const c = buf[p];
    if (c === quote) inQuotes = !inQuotes;
    else if (c === delimiter && !inQuotes) break;
    p++;
  }
  return p;
}

function finishBad(buf: Uint8Array, pos: number, end: number, delimiter: number): number {
  cursor.pos = skipField(buf, pos, end, delimiter);
  cursor.status = fieldBad;
  return Number.NaN;
}

/** Skips blanks and an opening quote; returns the position and sets cursor.frac to 1 when quoted. */
function openField(buf: Uint8Array, pos: number, end: number, delimiter: number): number {
  let p = pos;
  while (p < end && isBlank(buf[p], delimiter)) p++;
  cursor.frac = 0;
  if (p < end && buf[p] === quote) {
    cursor.frac = 1;
    p++;
    while (p < end && isBlank(buf[p], delimiter)) p++;
  }
  return p;
}

/** After a value: blanks, the closing quote when opened, blanks, then the delimiter or the end. */
function closeField(buf: Uint8Array, pos: number, end: number, delimiter: number, quoted: boolean): boolean {
  let p = pos;
  while (p < end && isBlank(buf[p], delimiter)) p++;
  if (quoted) {
    if (buf[p] !== quote) return false;
    p++;
    while (p < end && isBlank(buf[p], delimiter)) p++;
  }
  cursor.pos = p;
  return p >= end || buf[p] === delimiter;
}

/** True (and status empty) when the field holds nothing but blanks or an empty quote. */
function isEmptyField(buf: Uint8Array, p: number, end: number, delimiter: number, quoted: boolean): boolean {
  if (p < end && buf[p] !== delimiter && !(quoted && buf[p] === quote)) return false;
  if (!closeField(buf, p, end, delimiter, quoted)) return false;
  cursor.status = fieldEmpty;
  return true;
}

function slowNumber(buf: Uint8Array, from: number, to: number, decimal: number): number {
  let text = "";
  for (let p = from; p < to; p++) text += String.fromCharCode(buf[p] === decimal ? 46 : (buf[p] ?? 0));
  return Number(text);
}

export function parseNumberField(buf: Uint8Array, pos: number, end: number, delimiter: number, decimal: number): number {
  let p = openField(buf, pos, end, delimiter);
  const quoted = cursor.frac === 1;
  const start = p;
  let negative = false;
  if (buf[p] === 45 || buf[p] === 43) {
    negative = buf[p] === 45;
    p++;
  }
  let mantissa = 0;
  let digits = 0;
  let fractionDigits = 0;
  let c = buf[p] ?? -1;
  while (p < end && c >= 48 && c <= 57) {
    mantissa = mantissa * 10 + (c - 48);
    digits++;
    c = buf[++p] ?? -1;
  }
  if (p < end && c === decimal) {
    c = buf[++p] ?? -1;
    while (p < end && c >= 48 && c <= 57) {
      mantissa = mantissa * 10 + (c - 48);
      digits++;
      fractionDigits++;
      c = buf[++p] ?? -1;
    }
  }
  if (digits === 0) {
    if (p === start && closeField(buf, p, end, delimiter, quoted)) {
      cursor.status = fieldEmpty;
      return Number.NaN;
    }
    return finishBad(buf, p, end, delimiter);
  }
  let exponent = 0;
  if (p < end && (c === 101 || c === 69)) {
    c = buf[++p] ?? -1;
    let exponentNegative = false;
    if (c === 45 || c === 43) {
      exponentNegative = c === 45;
      c = buf[++p] ?? -1;
    }
    let exponentDigits = 0;
    while (p < end && c >= 48 && c <= 57) {
      exponent = exponent * 10 + (c - 48);
      exponentDigits++;
      c = buf[++p] ?? -1;
    }
    if (exponentDigits === 0) return finishBad(buf, p, end, delimiter);
    if (exponentNegative) exponent = -exponent;
  }
  const stop = p;
  if (!closeField(buf, p, end, delimiter, quoted)) return finishBad(buf, p, end, delimiter);
  cursor.status = fieldOk;
  const power = exponent - fractionDigits;
  let value: number;
  if (mantissa >= exactMantissa || power > 22 || power < -22) value = slowNumber(buf, start, stop, decimal);
  else if (power === 0) value = negative ? -mantissa : mantissa;
  else {
    value = power > 0 ? mantissa * powersOfTen[power]! : mantissa / powersOfTen[-power]!;
    if (negative) value = -value;
  }
  return value;
}

/** Reads exactly `count` digits (count 0: one or more); returns NaN when missing. */
function digitsAt(buf: Uint8Array, pos: number, end: number, min: number, max: number): number {
  let p = pos;
  let value = 0;
  while (p < end && p - pos < max) {
    const c = buf[p] ?? -1;
    if (c < 48 || c > 57) break;
    value = value * 10 + (c - 48);
    p++;
  }
  if (p - pos < min) return Number.NaN;
  cursor.pos = p;
  return value;
}

/** Seconds with an optional fraction ("05", "05.250", "05,25") as one correctly rounded division. */
function secondsAt(buf: Uint8Array, pos: number, end: number): number {
  const whole = digitsAt(buf, pos, end, 1, 2);
  if (Number.isNaN(whole)) return Number.NaN;
  let p = cursor.pos;
  if (p < end && (buf[p] === 46 || buf[p] === 44)) {
    const fracStart = p + 1;
    const fraction = digitsAt(buf, fracStart, end, 1, 9);
    if (Number.isNaN(fraction)) return Number.NaN;
    p = cursor.pos;
    const k = p - fracStart;
    cursor.pos = p;
    return (whole * powersOfTen[k]! + fraction) / powersOfTen[k]!;
  }
  return whole;
}

/** Elapsed hh:mm:ss(.sss); hours unbounded. */
export function parseHmsField(buf: Uint8Array, pos: number, end: number, delimiter: number): number {
  const p = openField(buf, pos, end, delimiter);
  const quoted = cursor.frac === 1;
  if (isEmptyField(buf, p, end, delimiter, quoted)) return Number.NaN;
  const hours = digitsAt(buf, p, end, 1, 12);
  if (Number.isNaN(hours) || buf[cursor.pos] !== 58) return finishBad(buf, p, end, delimiter);
  const minutes = digitsAt(buf, cursor.pos + 1, end, 1, 2);
  if (Number.isNaN(minutes) || minutes > 59 || buf[cursor.pos] !== 58) return finishBad(buf, p, end, delimiter);
  const seconds = secondsAt(buf, cursor.pos + 1, end);
  if (Number.isNaN(seconds) || seconds >= 60) return finishBad(buf, p, end, delimiter);
  if (!closeField(buf, cursor.pos, end, delimiter, quoted)) return finishBad(buf, p, end, delimiter);
  cursor.status = fieldOk;
  return hmsSeconds(hours, minutes, seconds);
}

/**
 * ISO-8601 / "YYYY-MM-DD hh:mm(:ss(.sss))" with optional Z or ±hh(:mm).
 * Returns whole seconds since the epoch; the fraction is left in cursor.frac.
 */
export function parseTimestampField(buf: Uint8Array, pos: number, end: number, delimiter: number): number {
  const start = openField(buf, pos, end, delimiter);
  const quoted = cursor.frac === 1;
  if (isEmptyField(buf, start, end, delimiter, quoted)) return Number.NaN;
  const bad = (): number => finishBad(buf, start, end, delimiter);
  const year = digitsAt(buf, start, end, 4, 4);
  const sep = buf[cursor.pos];
  if (Number.isNaN(year) || (sep !== 45 && sep !== 47)) return bad();
  const month = digitsAt(buf, cursor.pos + 1, end, 1, 2);
  if (Number.isNaN(month) || (buf[cursor.pos] !== 45 && buf[cursor.pos] !== 47)) return bad();
  const day = digitsAt(buf, cursor.pos + 1, end, 1, 2);
  if (Number.isNaN(day)) return bad();
  let p = cursor.pos;
  if (buf[p] === 84 || buf[p] === 116) p++;
  else {
    const blankStart = p;
    while (p < end && (buf[p] === space || buf[p] === tab) && buf[p] !== delimiter) p++;
    if (p === blankStart) return bad();
  }
  const hour = digitsAt(buf, p, end, 1, 2);
  if (Number.isNaN(hour) || buf[cursor.pos] !== 58) return bad();
  const minute = digitsAt(buf, cursor.pos + 1, end, 2, 2);
  if (Number.isNaN(minute)) return bad();
  let second = 0;
  let frac = 0;
  p = cursor.pos;
  if (buf[p] === 58) {
    second = digitsAt(buf, p + 1, end, 2, 2);
    if (Number.isNaN(second)) return bad();
    p = cursor.pos;
    if (buf[p] === 46 || buf[p] === 44) {
      const fraction = digitsAt(buf, p + 1, end, 1, 9);
      if (Number.isNaN(fraction)) return bad();
      frac = fraction / powersOfTen[cursor.pos - p - 1]!;
      p = cursor.pos;
    }
  }
  while (p < end && (buf[p] === space || buf[p] === tab) && buf[p] !== delimiter) p++;
  let offset = 0;
  const z = buf[p];
  if (z === 90 || z === 122) p++;
  else if (z === 43 || z === 45) {
    const oh = digitsAt(buf, p + 1, end, 2, 2);
    if (Number.isNaN(oh)) return bad();
    p = cursor.pos;
    if (buf[p] === 58) p++;
    let om = 0;
    if (p < end && (buf[p] ?? 0) >= 48 && (buf[p] ?? 0) <= 57) {
      om = digitsAt(buf, p, end, 2, 2);
      if (Number.isNaN(om)) return bad();
      p = cursor.pos;
    } else if (buf[p - 1] === 58) return bad();
    if (oh > 14 || om > 59) return bad();
    offset = (z === 45 ? -1 : 1) * (oh * 60 + om);
  }
  if (!validDate(year, month, day) || hour > 23 || minute > 59 || second > 59) return bad();
  if (!closeField(buf, p, end, delimiter, quoted)) return bad();
  cursor.status = fieldOk;
  cursor.frac = frac;
  return wholeSeconds(year, month, day, hour, minute, second, offset);
}

/** Start of a text field's content (quotes and blanks stripped); its end is left in cursor.stop. */
export function textFieldBounds(buf: Uint8Array, pos: number, end: number, delimiter: number): number {
  const start = openField(buf, pos, end, delimiter);
  const quoted = cursor.frac === 1;
  let p = start;
  if (quoted) {
    while (p < end && buf[p] !== quote) p++;
  } else {
    while (p < end && buf[p] !== delimiter) p++;
  }
  let stop = p;
  while (stop > start && isBlank(buf[stop - 1], delimiter)) stop--;
  cursor.pos = quoted ? skipField(buf, p, end, delimiter) : p;
  cursor.stop = stop;
  cursor.status = stop === start ? fieldEmpty : fieldOk;
  return start;
}
