/**
 * The bad-input corpus in tests/fixtures/bad: every file is rejected with the
 * right code, line and column, on both parsing paths, and the upload preview
 * shows the same error from the file's first bytes.
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { previewLog } from "@/lib/analysis/read";
import { AnalysisRejected, type LocatedError } from "@/lib/analysis/types";
import { readAll } from "../support/log-forms";

interface Case {
  file: string;
  code: LocatedError["code"];
  line?: number;
  column?: number;
  /** A piece of the message the user must see. */
  says: string;
}

const corpus: Case[] = [
  { file: "empty.csv", code: "empty", says: "empty" },
  { file: "whitespace-only.csv", code: "empty", says: "empty" },
  { file: "binary-image.png", code: "binary", line: 1, says: "NUL byte" },
  { file: "zip-archive.xlsx", code: "binary", line: 1, says: "NUL byte" },
  { file: "invalid-utf8.csv", code: "binary", line: 1, says: "not valid text" },
  { file: "no-header.csv", code: "no-header", line: 1, says: "no header row" },
  { file: "metadata-only.txt", code: "no-header", line: 1, says: "No header row" },
  { file: "single-column.csv", code: "no-header", line: 1, says: "single field" },
  { file: "header-only.csv", code: "no-data-rows", line: 1, says: "no data rows" },
  { file: "no-voltage-column.csv", code: "no-voltage-column", line: 1, says: "No voltage column" },
  { file: "no-current-column.csv", code: "no-current-column", line: 1, says: "No current column" },
  { file: "no-time-column.csv", code: "no-time-column", line: 1, says: "No time column" },
  {
    file: "non-numeric-voltage.csv",
    code: "non-numeric",
    line: 18,
    column: 2,
    says: "Column 2 (Voltage (V)) has 4 non-numeric values, first on lines 18, 22, 40",
  },
  { file: "empty-current-cell.csv", code: "non-numeric", line: 25, column: 3, says: "Column 3 (Current (A)) has 1 non-numeric value, on line 25" },
  { file: "missing-fields.csv", code: "non-numeric", line: 12, column: 2, says: "on line 12" },
  { file: "time-backwards.csv", code: "time-backwards", line: 33, column: 1, says: "Time goes backwards on line 33" },
  { file: "voltage-in-millivolts.csv", code: "implausible-values", line: 2, column: 2, says: "looks like millivolts" },
  { file: "current-in-milliamperes.csv", code: "implausible-values", line: 7, column: 3, says: "looks like milliamperes" },
  { file: "temperature-in-kelvin.csv", code: "implausible-values", line: 2, column: 4, says: "looks like kelvin" },
  { file: "negative-voltage.csv", code: "implausible-values", line: 2, column: 2, says: "swapped sense leads" },
  { file: "line-too-long.csv", code: "line-too-long", line: 12, says: "Line 12" },
  { file: "too-many-columns.csv", code: "too-many-columns", line: 1, says: "1203 columns" },
  { file: "unknown-mode-word.csv", code: "bad-column-map", line: 20, column: 4, says: '"Formation"' },
];

const fixtures = join(process.cwd(), "tests", "fixtures", "bad");

async function rejection(bytes: Uint8Array, parser: "fast" | "papaparse" | "auto"): Promise<LocatedError> {
  try {
    await readAll(bytes, { parser, fileName: "log.csv", chunkSize: 1000 });
  } catch (error) {
    if (error instanceof AnalysisRejected) return error.detail;
    throw error;
  }
  throw new Error("the file was accepted");
}

describe("bad-input corpus", () => {
  for (const c of corpus) {
    it(`${c.file}: ${c.code}${c.line ? ` on line ${c.line}` : ""}`, async () => {
      const bytes = new Uint8Array(readFileSync(join(fixtures, c.file)));
      for (const parser of ["auto", "fast", "papaparse"] as const) {
        const detail = await rejection(bytes, parser);
        expect({ code: detail.code, line: detail.line, column: detail.column }, parser).toEqual({ code: c.code, line: c.line, column: c.column });
        expect(detail.message).toContain(c.says);
        expect(detail.file).toBe("log.csv");
      }
      // A line longer than the 64 KiB head cannot be judged from the preview.
      if (c.code === "line-too-long") return;
      const preview = previewLog(bytes.subarray(0, 64 * 1024));
      expect({ code: preview.error?.code, line: preview.error?.line }).toEqual({ code: c.code, line: c.line });
    });
  }

  it("covers every rejection code except a bad column map given by the user", () => {
    const codes = new Set(corpus.map((c) => c.code));
    const all: LocatedError["code"][] = [
      "empty", "binary", "no-header", "no-data-rows", "no-voltage-column", "no-current-column", "no-time-column",
      "non-numeric", "time-backwards", "implausible-values", "bad-column-map", "line-too-long", "too-many-columns",
    ];
    expect(all.filter((code) => !codes.has(code))).toEqual([]);
  });
});
