import Papa from "papaparse";

/**
 * CSV downloads that a spreadsheet opens safely.
 *
 * Formula injection: a text cell that starts with = + - @ tab or CR is run as a formula by common
 * spreadsheet programs (OWASP "CSV Injection"). papaparse's `escapeFormulae` prefixes such text
 * with ' and quotes it. We pass our own pattern because papaparse's default, /^[=+\-@\t\r].*$/,
 * needs the whole value to match `.*$`, so a value with a line break after the formula slips
 * through; only the first character matters.
 *
 * Negative numbers: papaparse never escapes values whose JavaScript type is number, so a
 * measurement such as -0.5 is written as -0.5 and stays a number in the sheet. Numbers therefore
 * go in as numbers, never pre-formatted as text: the text "-0.5" would be escaped like any other
 * text starting with "-". Non-finite numbers become empty cells.
 */
export const formulaStart = /^[=+\-@\t\r]/;

export type CsvValue = string | number | boolean | Date | null | undefined;

export interface CsvColumn<T> {
  /** A heading in plain words, with the unit in parentheses where the value has one. */
  header: string;
  value: (row: T) => CsvValue;
}

function cell(value: CsvValue): string | number | boolean | null {
  if (value === undefined || value === null) return null;
  if (value instanceof Date) return Number.isNaN(value.getTime()) ? null : value.toISOString();
  if (typeof value === "number") return Number.isFinite(value) ? value : null;
  return value;
}

/**
 * The CSV text, CRLF line ends (RFC 4180), starting with a UTF-8 byte-order mark so spreadsheet
 * programs read "°C" and "µ" as written instead of guessing a legacy code page.
 */
export function toCsv<T>(columns: CsvColumn<T>[], rows: Iterable<T>): string {
  const data: (string | number | boolean | null)[][] = [];
  for (const row of rows) data.push(columns.map((c) => cell(c.value(row))));
  const text = Papa.unparse({ fields: columns.map((c) => c.header), data }, { escapeFormulae: formulaStart, newline: "\r\n" });
  return `\uFEFF${text}\r\n`;
}

/** A file name safe in a header and on every file system: letters, digits, dot, dash, underscore. */
export function safeFileName(name: string): string {
  const cleaned = name.replace(/[^A-Za-z0-9._-]+/g, "-").replace(/^[-.]+|-+$/g, "");
  return cleaned || "export.csv";
}

/** A download response; `no-store` because an export reflects the records at the moment it is made. */
export function csvResponse(csv: string, fileName: string): Response {
  return new Response(csv, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": `attachment; filename="${safeFileName(fileName)}"`,
      "cache-control": "no-store",
      "x-content-type-options": "nosniff",
    },
  });
}
