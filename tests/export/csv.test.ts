/**
 * CSV export safety. The dangerous first characters (= + - @ tab CR) are those listed by OWASP,
 * "CSV Injection" (https://owasp.org/www-community/attacks/CSV_Injection); the file layout is
 * RFC 4180 (CRLF line ends, fields with quotes/commas/line breaks quoted, quotes doubled).
 */
import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { csvResponse, formulaStart, safeFileName, toCsv, type CsvColumn } from "@/lib/export/csv";

type Row = { label: string; value: number | null };
const columns: CsvColumn<Row>[] = [
  { header: "Label", value: (r) => r.label },
  { header: "Voltage (V)", value: (r) => r.value },
];

const bom = "\uFEFF";
const lines = (csv: string) => csv.slice(bom.length).split("\r\n");

describe("toCsv", () => {
  it("writes a heading row, CRLF line ends and a UTF-8 byte-order mark", () => {
    const csv = toCsv(columns, [{ label: "cell A", value: 3.7 }]);
    expect(csv.startsWith(bom)).toBe(true);
    expect(lines(csv)).toEqual(["Label,Voltage (V)", "cell A,3.7", ""]);
  });

  it("neutralises text starting with = + - @ tab or CR by a leading ' inside quotes", () => {
    const dangerous = ["=1+1", "+41 555", "-2+3", "@SUM(A1:A2)", "\t=1", "\r=1", '=HYPERLINK("http://example.invalid","x")'];
    const csv = toCsv(
      columns,
      dangerous.map((label) => ({ label, value: null })),
    );
    const parsed = Papa.parse<string[]>(csv.slice(bom.length), { skipEmptyLines: true }).data.slice(1);
    expect(parsed.map((row) => row[0])).toEqual(dangerous.map((d) => `'${d}`));
    expect(lines(csv)[1]).toBe(`"'=1+1",`);
  });

  it("also catches a formula followed by a line break, which papaparse's default pattern misses", () => {
    const label = "=1+1\nsecond line";
    const ours = toCsv(columns, [{ label, value: 1 }]);
    expect(ours).toContain(`"'=1+1\nsecond line"`);
    // Why formulaStart exists: the library default needs `.*$` to reach the end of the value.
    const libraryDefault = Papa.unparse([[label]], { escapeFormulae: true });
    expect(libraryDefault.startsWith(`"=`)).toBe(true);
    expect(formulaStart.test(label)).toBe(true);
  });

  it("keeps numbers, negative ones included, as bare numbers", () => {
    const csv = toCsv(columns, [
      { label: "discharge", value: -0.5 },
      { label: "tiny", value: -1e-7 },
      { label: "zero", value: 0 },
      { label: "not a number", value: Number.NaN },
    ]);
    expect(lines(csv).slice(1, 5)).toEqual(["discharge,-0.5", "tiny,-1e-7", "zero,0", "not a number,"]);
    const parsed = Papa.parse<Row>(csv.slice(bom.length), { header: true, dynamicTyping: true, skipEmptyLines: true }).data;
    expect(parsed.map((r) => r["Voltage (V)" as keyof Row])).toEqual([-0.5, -1e-7, 0, null]);
  });

  it("quotes commas, quotes and line breaks, and leaves harmless text alone", () => {
    const csv = toCsv(columns, [
      { label: 'Cells, "lot 7"', value: 1 },
      { label: "two\nlines", value: 2 },
      { label: "KP-0001", value: 3 },
    ]);
    expect(lines(csv)[1]).toBe('"Cells, ""lot 7""",1');
    expect(csv).toContain('"two\nlines",2');
    expect(csv).toContain("KP-0001,3");
  });

  it("writes dates as ISO 8601 instants and empty values as empty cells", () => {
    const dated: CsvColumn<{ at: Date | null }>[] = [{ header: "At (UTC)", value: (r) => r.at }];
    expect(lines(toCsv(dated, [{ at: new Date("2026-03-01T10:00:00Z") }, { at: null }, { at: new Date("x") }]))).toEqual([
      "At (UTC)",
      "2026-03-01T10:00:00.000Z",
      "",
      "",
      "",
    ]);
  });
});

describe("csvResponse", () => {
  it("is a CSV attachment with a file name that cannot break the header", async () => {
    const response = csvResponse("a\r\n", 'cells "2026"\r\nx.csv');
    expect(response.headers.get("content-type")).toBe("text/csv; charset=utf-8");
    expect(response.headers.get("content-disposition")).toBe('attachment; filename="cells-2026-x.csv"');
    expect(await response.text()).toBe("a\r\n");
    expect(safeFileName("../../etc/passwd")).toBe("etc-passwd");
  });
});
