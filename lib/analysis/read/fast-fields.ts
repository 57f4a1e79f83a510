/**
 * Byte-level cell parsers for the fast path: bytes to numbers without a string
 * per field. Each parser starts at a field's first byte, leaves `cursor.pos`
 * on the delimiter that ends the field (or the line end), puts the value in
 * `parsed` and returns a status telling a good value from an empty or bad cell.
 * Values go through a Float64Array rather than return values: V8 boxes a
 * double returned from a call it does not inline, which would allocate per cell.
 *
 * Decimal conversion: a mantissa m < 2^53 and a power of ten 10^k with k <= 22
 * are both exact doubles, so m / 10^k (or m * 10^k) is a single correctly
 * rounded operation and equals Number() of the same text (IEEE 754 round to
 * nearest; the "fast path" of Clinger's algorithm, W. D. Clinger, PLDI 1990).
 * Anything outside that range falls back to Number() on the field's text.
 */
import * as civil from "./civil-time";

// Module-local copies of imported bindings: a CommonJS build (tsx: the CLI and the bench) reaches
// imports through getters, which costs more than the parsing itself in per-row code.
const { hmsSeconds, validDate, wholeSeconds } = civil;

export const fieldOk = 0;
export const fieldEmpty = 1;
export const fieldBad = 2;

/** Shared scan state. `quoted`: the field opened with a quote; `stop`, `status`: a text field's end and status. */
export const cursor = { pos: 0, status: fieldOk, quoted: false, stop: 0 };
/** [0]: the value parsed last; [1]: a timestamp's fraction of a second. */
export const parsed = new Float64Array(2);

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
  return fieldBad;
}

/** Skips blanks and an opening quote; returns the position and sets cursor.quoted. */
function openField(buf: Uint8Array, pos: number, end: number, delimiter: number): number {
  let p = pos;
  while (p < end && isBlank(buf[p], delimiter)) p++;
  cursor.quoted = false;
  if (p < end && buf[p] === quote) {
    cursor.quoted = true;
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

/** True when the field holds nothing but blanks or an empty quote. */
function isEmptyField(buf: Uint8Array, p: number, end: number, delimiter: number, quoted: boolean): boolean {
  if (p < end && buf[p] !== delimiter && !(quoted && buf[p] === quote)) return false;
  return closeField(buf, p, end, delimiter, quoted);
}

function slowNumber(buf: Uint8Array, from: number, to: number, decimal: number): number {
  let text = "";
  for (let p = from; p < to; p++) text += String.fromCharCode(buf[p] === decimal ? 46 : (buf[p] ?? 0));
  return Number(text);
}

/**
 * The common cell, [-]digits[.digits] ended by the delimiter or the line end,
 * read in a loop small enough for V8 to inline; anything else goes to
 * parseNumberField from the start of the cell, so both give the same result.
 */
export function quickNumberField(buf: Uint8Array, pos: number, end: number, delimiter: number, decimal: number): number {
  let p = pos;
  let c = buf[p]!;
  const negative = c === 45;
  if (negative) c = buf[++p]!;
  let mantissa = 0;
  let digits = 0;
  while (p < end && c >= 48 && c <= 57) {
    mantissa = mantissa * 10 + (c - 48);
    digits++;
    c = buf[++p]!;
  }
  let fractionDigits = 0;
  if (p < end && c === decimal) {
    c = buf[++p]!;
    while (p < end && c >= 48 && c <= 57) {
      mantissa = mantissa * 10 + (c - 48);
      fractionDigits++;
      c = buf[++p]!;
    }
  }
  if (digits + fractionDigits === 0 || (p < end && c !== delimiter) || mantissa >= exactMantissa || fractionDigits > 22)
    return parseNumberField(buf, pos, end, delimiter, decimal);
  const value = fractionDigits === 0 ? mantissa : mantissa / powersOfTen[fractionDigits]!;
  parsed[0] = negative ? -value : value;
  cursor.pos = p;
  return fieldOk;
}

/** A decimal number with the given decimal mark (and optional exponent) into parsed[0]. */
export function parseNumberField(buf: Uint8Array, pos: number, end: number, delimiter: number, decimal: number): number {
  let p = pos;
  let c = buf[p]!;
  let quoted = false;
  if (c === space || c === tab || c === quote) {
    p = openField(buf, pos, end, delimiter);
    quoted = cursor.quoted;
    c = buf[p]!;
  }
  const start = p;
  let negative = false;
  if (c === 45 || c === 43) {
    negative = c === 45;
    c = buf[++p]!;
  }
  let mantissa = 0;
  let digits = 0;
  let fractionDigits = 0;
  // Reads past `end` see the line's own terminator or later bytes, never outside the buffer
  // while p < end is checked first.
  while (p < end && c >= 48 && c <= 57) {
    mantissa = mantissa * 10 + (c - 48);
    digits++;
    c = buf[++p]!;
  }
  if (p < end && c === decimal) {
    c = buf[++p]!;
    while (p < end && c >= 48 && c <= 57) {
      mantissa = mantissa * 10 + (c - 48);
      digits++;
      fractionDigits++;
      c = buf[++p]!;
    }
  }
  if (digits === 0) {
    if (p === start && closeField(buf, p, end, delimiter, quoted)) return fieldEmpty;
    return finishBad(buf, p, end, delimiter);
  }
  let exponent = 0;
  if (p < end && (c === 101 || c === 69)) {
    c = buf[++p]!;
    let exponentNegative = false;
    if (c === 45 || c === 43) {
      exponentNegative = c === 45;
      c = buf[++p]!;
    }
    let exponentDigits = 0;
    while (p < end && c >= 48 && c <= 57) {
      exponent = exponent * 10 + (c - 48);
      exponentDigits++;
      c = buf[++p]!;
    }
    if (exponentDigits === 0) return finishBad(buf, p, end, delimiter);
    if (exponentNegative) exponent = -exponent;
  }
  const stop = p;
  if (!quoted && (p >= end || c === delimiter)) cursor.pos = p;
  else if (!closeField(buf, p, end, delimiter, quoted)) return finishBad(buf, p, end, delimiter);
  const power = exponent - fractionDigits;
  let value: number;
  if (mantissa >= exactMantissa || power > 22 || power < -22) {
    parsed[0] = slowNumber(buf, start, stop, decimal);
    return fieldOk;
  }
  if (power === 0) value = mantissa;
  else if (power < 0) value = mantissa / powersOfTen[-power]!;
  else value = mantissa * powersOfTen[power]!;
  parsed[0] = negative ? -value : value;
  return fieldOk;
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

/** Elapsed hh:mm:ss(.sss), hours unbounded, as seconds into parsed[0]. */
export function parseHmsField(buf: Uint8Array, pos: number, end: number, delimiter: number): number {
  const p = openField(buf, pos, end, delimiter);
  const quoted = cursor.quoted;
  if (isEmptyField(buf, p, end, delimiter, quoted)) return fieldEmpty;
  const hours = digitsAt(buf, p, end, 1, 12);
  if (Number.isNaN(hours) || buf[cursor.pos] !== 58) return finishBad(buf, p, end, delimiter);
  const minutes = digitsAt(buf, cursor.pos + 1, end, 1, 2);
  if (Number.isNaN(minutes) || minutes > 59 || buf[cursor.pos] !== 58) return finishBad(buf, p, end, delimiter);
  const seconds = secondsAt(buf, cursor.pos + 1, end);
  if (Number.isNaN(seconds) || seconds >= 60) return finishBad(buf, p, end, delimiter);
  if (!closeField(buf, cursor.pos, end, delimiter, quoted)) return finishBad(buf, p, end, delimiter);
  parsed[0] = hmsSeconds(hours, minutes, seconds);
  return fieldOk;
}

/**
 * ISO-8601 / "YYYY-MM-DD hh:mm(:ss(.sss))" with optional Z or ±hh(:mm).
 * Puts whole seconds since the epoch in parsed[0] and the fraction in parsed[1].
 */
export function parseTimestampField(buf: Uint8Array, pos: number, end: number, delimiter: number): number {
  const start = openField(buf, pos, end, delimiter);
  const quoted = cursor.quoted;
  if (isEmptyField(buf, start, end, delimiter, quoted)) return fieldEmpty;
  const year = digitsAt(buf, start, end, 4, 4);
  const sep = buf[cursor.pos];
  if (Number.isNaN(year) || (sep !== 45 && sep !== 47)) return finishBad(buf, start, end, delimiter);
  const month = digitsAt(buf, cursor.pos + 1, end, 1, 2);
  if (Number.isNaN(month) || (buf[cursor.pos] !== 45 && buf[cursor.pos] !== 47)) return finishBad(buf, start, end, delimiter);
  const day = digitsAt(buf, cursor.pos + 1, end, 1, 2);
  if (Number.isNaN(day)) return finishBad(buf, start, end, delimiter);
  let p = cursor.pos;
  if (buf[p] === 84 || buf[p] === 116) p++;
  else {
    const blankStart = p;
    while (p < end && (buf[p] === space || buf[p] === tab) && buf[p] !== delimiter) p++;
    if (p === blankStart) return finishBad(buf, start, end, delimiter);
  }
  const hour = digitsAt(buf, p, end, 1, 2);
  if (Number.isNaN(hour) || buf[cursor.pos] !== 58) return finishBad(buf, start, end, delimiter);
  const minute = digitsAt(buf, cursor.pos + 1, end, 2, 2);
  if (Number.isNaN(minute)) return finishBad(buf, start, end, delimiter);
  let second = 0;
  let frac = 0;
  p = cursor.pos;
  if (buf[p] === 58) {
    second = digitsAt(buf, p + 1, end, 2, 2);
    if (Number.isNaN(second)) return finishBad(buf, start, end, delimiter);
    p = cursor.pos;
    if (buf[p] === 46 || buf[p] === 44) {
      const fraction = digitsAt(buf, p + 1, end, 1, 9);
      if (Number.isNaN(fraction)) return finishBad(buf, start, end, delimiter);
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
    if (Number.isNaN(oh)) return finishBad(buf, start, end, delimiter);
    p = cursor.pos;
    if (buf[p] === 58) p++;
    let om = 0;
    if (p < end && (buf[p] ?? 0) >= 48 && (buf[p] ?? 0) <= 57) {
      om = digitsAt(buf, p, end, 2, 2);
      if (Number.isNaN(om)) return finishBad(buf, start, end, delimiter);
      p = cursor.pos;
    } else if (buf[p - 1] === 58) return finishBad(buf, start, end, delimiter);
    if (oh > 14 || om > 59) return finishBad(buf, start, end, delimiter);
    offset = (z === 45 ? -1 : 1) * (oh * 60 + om);
  }
  if (!validDate(year, month, day) || hour > 23 || minute > 59 || second > 59) return finishBad(buf, start, end, delimiter);
  if (!closeField(buf, p, end, delimiter, quoted)) return finishBad(buf, start, end, delimiter);
  parsed[0] = wholeSeconds(year, month, day, hour, minute, second, offset);
  parsed[1] = frac;
  return fieldOk;
}

/** Start of a text field's content (quotes and blanks stripped); its end is left in cursor.stop. */
export function textFieldBounds(buf: Uint8Array, pos: number, end: number, delimiter: number): number {
  const start = openField(buf, pos, end, delimiter);
  const quoted = cursor.quoted;
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
