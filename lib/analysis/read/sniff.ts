/**
 * Layout of a log from its head: delimiter, decimal mark, metadata lines,
 * header row, an optional unit row under it, and a sample of data rows.
 */
import Papa from "papaparse";
import { maxColumns, maxLineBytes } from "./limits";
import { reject } from "./reject";
import { parseUnitToken } from "./units";
import { looksNumeric, parseHmsText, parseTimestampText } from "./text-values";

export type Delimiter = "," | ";" | "\t";
export type DecimalMark = "." | ",";

/** How many head lines detection looks at. */
const linesLooked = 400;
/** Data rows kept as the sample for column detection and preview. */
export const sampleRows = 200;

export interface SampleRow {
  line: number;
  cells: string[];
}

export interface Layout {
  delimiter: Delimiter;
  decimal: DecimalMark;
  headerLine: number;
  header: string[];
  unitRow: SampleRow | null;
  preamble: string[];
  sample: SampleRow[];
  /** Quote characters in the data rows. */
  quoted: boolean;
  /**
   * Quoting beyond plain "value" cells: a quoted delimiter, a doubled quote, an
   * unbalanced quote. The papaparse path takes such files.
   */
  oddQuoting: boolean;
}

export function splitCells(line: string, delimiter: Delimiter): string[] {
  if (line.length === 0) return [""];
  const parsed = Papa.parse<string[]>(line, { delimiter, newline: "\n", quoteChar: '"' });
  return parsed.data[0] ?? [""];
}

/** Field count without trailing empty fields (a trailing delimiter adds one). */
export function filledWidth(cells: readonly string[]): number {
  let n = cells.length;
  while (n > 0 && (cells[n - 1] ?? "").trim() === "") n--;
  return n;
}

export function isBlankRow(cells: readonly string[]): boolean {
  return filledWidth(cells) === 0;
}

function isValueCell(cell: string): boolean {
  return looksNumeric(cell) || !Number.isNaN(parseHmsText(cell)) || parseTimestampText(cell) !== null;
}

export function isDataRow(cells: readonly string[]): boolean {
  let filled = 0;
  let values = 0;
  for (const cell of cells) {
    if (cell.trim() === "") continue;
    filled++;
    if (isValueCell(cell)) values++;
  }
  return values >= 2 && values * 2 >= filled;
}

function isTextRow(cells: readonly string[]): boolean {
  let filled = 0;
  let text = 0;
  for (const cell of cells) {
    if (cell.trim() === "") continue;
    filled++;
    if (/\p{L}/u.test(cell) && !isValueCell(cell)) text++;
  }
  return filled >= 2 && text * 2 >= filled;
}

function isUnitRow(cells: readonly string[]): boolean {
  let filled = 0;
  for (const cell of cells) {
    if (cell.trim() === "") continue;
    filled++;
    if (parseUnitToken(cell) === null && !/^\s*[([{]?\s*h{1,3}:mm:ss(\.s+)?\s*[)\]}]?\s*$/i.test(cell)) return false;
  }
  return filled > 0;
}

function mostCommon(values: readonly number[]): number {
  const counts = new Map<number, number>();
  let best = 0;
  let bestCount = 0;
  for (const v of values) {
    const c = (counts.get(v) ?? 0) + 1;
    counts.set(v, c);
    if (c > bestCount || (c === bestCount && v > best)) {
      best = v;
      bestCount = c;
    }
  }
  return best;
}

interface DelimiterFit {
  delimiter: Delimiter;
  rows: string[][];
  width: number;
  fit: number;
}

function fitDelimiter(lines: readonly string[], delimiter: Delimiter): DelimiterFit {
  const rows = lines.map((line) => splitCells(line, delimiter));
  const dataWidths = rows.filter(isDataRow).map(filledWidth);
  const width = mostCommon(dataWidths.slice(-50));
  const fit = width >= 2 ? dataWidths.filter((w) => w === width).length : 0;
  return { delimiter, rows, width, fit };
}

function chooseDecimal(sample: readonly SampleRow[]): DecimalMark {
  let comma = 0;
  let dot = 0;
  for (const row of sample)
    for (const cell of row.cells) {
      const s = cell.trim();
      if (/^[+-]?\d+,\d+(?:[eE][+-]?\d+)?$/.test(s)) comma++;
      else if (/^[+-]?\d*\.\d+(?:[eE][+-]?\d+)?$/.test(s)) dot++;
    }
  return comma > dot ? "," : ".";
}

function hasOddQuoting(line: string, delimiter: Delimiter): boolean {
  if ((line.match(/"/g)?.length ?? 0) % 2 === 1) return true;
  for (const m of line.matchAll(/"((?:[^"]|"")*)"/g)) {
    const inner = m[1] ?? "";
    if (inner.includes(delimiter) || inner.includes('"')) return true;
  }
  return false;
}

export interface LayoutHints {
  delimiter?: Delimiter;
  decimal?: DecimalMark;
  headerLine?: number;
}

/**
 * `lines` are the head's physical lines (line n at index n - 1); when the head
 * is not the whole file its last, possibly cut, line is already dropped.
 */
export function sniffLayout(lines: readonly string[], hints: LayoutHints = {}): Layout {
  const looked = lines.slice(0, linesLooked);
  const longLine = looked.findIndex((l) => l.length > maxLineBytes);
  if (longLine >= 0)
    reject("line-too-long", `Line ${longLine + 1} is ${looked[longLine]?.length} characters long; a log line is at most ${maxLineBytes}.`, {
      line: longLine + 1,
    });
  if (looked.every((l) => l.trim() === "")) reject("empty", "The file is empty.");

  const candidates: Delimiter[] = hints.delimiter ? [hints.delimiter] : ["\t", ";", ","];
  let best: DelimiterFit | null = null;
  for (const d of candidates) {
    const fit = fitDelimiter(looked, d);
    if (best === null || fit.fit > best.fit) best = fit;
  }
  if (best!.fit === 0) {
    // No data rows at all: take the delimiter that splits a text row widest, so a
    // header-only file is reported as having no data rather than no header.
    const widest = (f: DelimiterFit): number => Math.max(0, ...f.rows.filter(isTextRow).map(filledWidth));
    for (const d of candidates) {
      const fit = fitDelimiter(looked, d);
      if (widest(fit) > widest(best!)) best = fit;
    }
  }
  const { delimiter, rows, width } = best!;
  const wide = rows.findIndex((cells) => cells.length > maxColumns);
  if (wide >= 0)
    reject("too-many-columns", `Line ${wide + 1} has ${rows[wide]!.length} columns; at most ${maxColumns} are read.`, { line: wide + 1 });

  let headerIndex = -1;
  if (hints.headerLine !== undefined) {
    headerIndex = hints.headerLine - 1;
    if (headerIndex >= rows.length)
      reject("bad-column-map", `The column map puts the header on line ${hints.headerLine}, but the file's first part has ${rows.length} lines.`, {
        line: hints.headerLine,
      });
  } else {
    for (let k = 0; k < rows.length; k++) {
      const cells = rows[k]!;
      const w = filledWidth(cells);
      if (w < 2 || (width > 0 && Math.abs(w - width) > 1) || !isTextRow(cells)) continue;
      let next = k + 1;
      while (next < rows.length && isBlankRow(rows[next]!)) next++;
      if (next < rows.length && isUnitRow(rows[next]!)) next++;
      while (next < rows.length && isBlankRow(rows[next]!)) next++;
      if (next >= rows.length || isDataRow(rows[next]!)) {
        headerIndex = k;
        break;
      }
    }
  }
  if (headerIndex < 0) {
    const firstData = rows.findIndex(isDataRow);
    if (firstData >= 0)
      reject(
        "no-header",
        `Line ${firstData + 1} is already data: the file has no header row naming its columns (time, voltage, current).`,
        { line: firstData + 1 },
      );
    if (rows.every((cells) => filledWidth(cells) <= 1) && rows.some((cells) => isValueCell(cells[0] ?? "")))
      reject(
        "no-header",
        "Every line holds a single field: no comma, semicolon or tab separates columns, so time, voltage and current cannot be told apart.",
        { line: 1 },
      );
    reject("no-header", "No header row with column names and no data rows were found: this does not look like a cycling log.", { line: 1 });
  }

  const header = rows[headerIndex]!.map((c) => c.trim());
  const preamble = lines.slice(0, headerIndex).filter((l) => l.trim() !== "").map((l) => l.trim());

  let unitRow: SampleRow | null = null;
  const sample: SampleRow[] = [];
  let quoted = false;
  let oddQuoting = false;
  for (let k = headerIndex + 1; k < rows.length && sample.length < sampleRows; k++) {
    const cells = rows[k]!;
    if (isBlankRow(cells)) continue;
    if (unitRow === null && sample.length === 0 && isUnitRow(cells) && !isDataRow(cells)) {
      unitRow = { line: k + 1, cells };
      continue;
    }
    const text = looked[k] ?? "";
    if (text.includes('"')) {
      quoted = true;
      if (hasOddQuoting(text, delimiter)) oddQuoting = true;
    }
    sample.push({ line: k + 1, cells });
  }
  if (sample.length === 0)
    reject("no-data-rows", `The header is on line ${headerIndex + 1}, but no data rows follow it.`, { line: headerIndex + 1 });

  return {
    delimiter,
    decimal: hints.decimal ?? (delimiter === "," && !quoted ? "." : chooseDecimal(sample)),
    headerLine: headerIndex + 1,
    header,
    unitRow,
    preamble,
    sample,
    quoted,
    oddQuoting,
  };
}
