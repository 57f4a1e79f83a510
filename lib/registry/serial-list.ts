import Papa from "papaparse";
import { identifierField } from "@/lib/validations/fields";

/** One non-blank data line of a serial list, numbered as the file numbers it (first line is 1). */
export interface SerialLine {
  line: number;
  serial: string;
  problems: string[];
}

export interface SerialList {
  /** Labels for a column picker: the header's names, or "Column 1", "Column 2", … */
  columns: string[];
  column: number;
  hasHeader: boolean;
  lines: SerialLine[];
  blankLines: number;
  /** Problems of the file as a whole (a quote left open), each naming its line. */
  fileProblems: string[];
}

export interface SerialListChoice {
  column?: number;
  hasHeader?: boolean;
}

const serialSchema = identifierField("Serial");

/** Header names that mean "the serial", best first: a file with both "id" and "serial" uses "serial". */
const headerRanks: ReadonlyMap<string, number> = new Map([
  ["serial", 0],
  ["serial number", 0],
  ["serial no", 0],
  ["serial nr", 0],
  ["serialnumber", 0],
  ["s/n", 0],
  ["sn", 0],
  ["cell serial", 0],
  ["id", 1],
  ["cell id", 1],
]);

function normalizeHeader(text: string): string {
  return text
    .toLowerCase()
    .replace(/[\s_\-.#]+/g, " ")
    .trim();
}

/** The column whose header names the serial, or null when the first row is not such a header. */
export function detectSerialColumn(firstRow: readonly string[]): number | null {
  let best: number | null = null;
  let bestRank = Infinity;
  for (const [index, cell] of firstRow.entries()) {
    const rank = headerRanks.get(normalizeHeader(cell)) ?? Infinity;
    if (rank < bestRank) {
      best = index;
      bestRank = rank;
    }
  }
  return best;
}

function countNewlines(text: string, from: number, to: number): number {
  let n = 0;
  for (let i = text.indexOf("\n", from); i !== -1 && i < to; i = text.indexOf("\n", i + 1)) n++;
  return n;
}

interface RawRow {
  cells: string[];
  line: number;
}

/**
 * Splits CSV (RFC 4180: quoted fields may hold delimiters and line breaks) into rows that keep
 * the file line each row starts on, so every message can point at the line a person sees.
 */
function readRows(input: string): { rows: RawRow[]; fileProblems: string[]; endsWithBreak: boolean } {
  const text = input.replace(/^\uFEFF/, "").replace(/\r\n?/g, "\n");
  const rows: RawRow[] = [];
  const fileProblems: string[] = [];
  let start = 0;
  let line = 1;
  Papa.parse<string[]>(text, {
    newline: "\n",
    delimitersToGuess: [",", ";", "\t", "|"],
    skipEmptyLines: false,
    step(result) {
      rows.push({ cells: result.data, line });
      for (const error of result.errors) {
        // A one-column list has no delimiter to find; that is not a problem.
        if (error.code !== "UndetectableDelimiter") fileProblems.push(`Line ${line}: ${error.message}`);
      }
      const end = result.meta.cursor;
      line += countNewlines(text, start, end);
      start = end;
    },
  });
  return { rows, fileProblems, endsWithBreak: text.endsWith("\n") };
}

const isBlank = (row: RawRow) => row.cells.every((cell) => cell.trim() === "");

/**
 * Reads a serial list: finds the serial column (a header such as "Serial" or "S/N", otherwise the
 * first column), and checks every line as the server will: a valid serial, not repeated in the file
 * (case does not make two serials different, as in the registry).
 */
export function readSerialList(input: string, choice: SerialListChoice = {}): SerialList {
  const { rows, fileProblems, endsWithBreak } = readRows(input);
  const first = rows.find((row) => !isBlank(row));
  const detected = first ? detectSerialColumn(first.cells) : null;
  const hasHeader = choice.hasHeader ?? detected !== null;
  const width = rows.reduce((max, row) => Math.max(max, row.cells.length), 0);
  const column = Math.min(Math.max(choice.column ?? detected ?? 0, 0), Math.max(width - 1, 0));
  const columns = Array.from({ length: width }, (_, i) => {
    const name = hasHeader ? first?.cells[i]?.trim() : undefined;
    return name ? name : `Column ${i + 1}`;
  });

  const lines: SerialLine[] = [];
  const firstLineOf = new Map<string, number>();
  let blankLines = 0;
  for (const row of rows) {
    if (hasHeader && row === first) continue;
    if (isBlank(row)) {
      blankLines++;
      continue;
    }
    const raw = row.cells[column] ?? "";
    const parsed = serialSchema.safeParse(raw);
    const serial = raw.trim();
    const problems = parsed.success ? [] : parsed.error.issues.map((issue) => issue.message);
    if (serial) {
      const key = serial.toLowerCase();
      const earlier = firstLineOf.get(key);
      if (earlier !== undefined) problems.push(`Repeats line ${earlier}`);
      else firstLineOf.set(key, row.line);
    }
    lines.push({ line: row.line, serial, problems });
  }
  // The last line of most files ends with a line break; that empty "line" is not the user's.
  const last = rows.at(-1);
  if (last && isBlank(last) && endsWithBreak) blankLines--;
  return { columns, column, hasHeader, lines, blankLines: Math.max(blankLines, 0), fileProblems };
}

/**
 * Maps field errors of the import (keys "serials.<index>" from zod or from the registry, 0-based in
 * the submitted list) back to the file's line numbers; anything else is a problem of the whole list.
 */
export function problemsByLine(
  fieldErrors: Record<string, string[]>,
  submitted: readonly SerialLine[],
): { byLine: Map<number, string[]>; general: string[] } {
  const byLine = new Map<number, string[]>();
  const general: string[] = [];
  for (const [key, messages] of Object.entries(fieldErrors)) {
    const match = /^serials\.(\d+)$/.exec(key);
    const entry = match ? submitted[Number(match[1])] : undefined;
    if (entry) byLine.set(entry.line, [...(byLine.get(entry.line) ?? []), ...messages]);
    else general.push(...messages);
  }
  return { byLine, general };
}
