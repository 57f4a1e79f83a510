import { describe, expect, it } from "vitest";
import { detectSerialColumn, problemsByLine, readSerialList } from "@/lib/registry/serial-list";

describe("detectSerialColumn", () => {
  it("finds the serial column by its header, preferring a serial over a plain id", () => {
    expect(detectSerialColumn(["Position", "Serial Number", "Note"])).toBe(1);
    expect(detectSerialColumn(["S/N"])).toBe(0);
    expect(detectSerialColumn(["serial_no", "x"])).toBe(0);
    expect(detectSerialColumn(["ID", "Cell serial"])).toBe(1);
    expect(detectSerialColumn(["id", "weight"])).toBe(0);
    expect(detectSerialColumn(["KP-0001", "3.71"])).toBeNull();
  });
});

describe("readSerialList", () => {
  it("reads a one-column list without a header, skipping blank lines and the final line break", () => {
    const list = readSerialList("KP-0001\nKP-0002\n\nKP-0003\n");
    expect(list).toMatchObject({ hasHeader: false, column: 0, blankLines: 1, fileProblems: [] });
    expect(list.lines).toEqual([
      { line: 1, serial: "KP-0001", problems: [] },
      { line: 2, serial: "KP-0002", problems: [] },
      { line: 4, serial: "KP-0003", problems: [] },
    ]);
  });

  it("uses the header's serial column and numbers lines as the file does, CRLF included", () => {
    const list = readSerialList("Slot;S/N;Note\r\n1;KP-0001;ok\r\n2;KP-0002;\r\n");
    expect(list).toMatchObject({ hasHeader: true, column: 1, columns: ["Slot", "S/N", "Note"] });
    expect(list.lines.map((l) => [l.line, l.serial])).toEqual([
      [2, "KP-0001"],
      [3, "KP-0002"],
    ]);
  });

  it("counts the line breaks inside quoted fields (RFC 4180 §2.6) when numbering later lines", () => {
    const list = readSerialList('serial,remark\nKP-1,"dented\ncorner, see photo"\nKP-2,fine\n');
    expect(list.lines.map((l) => l.line)).toEqual([2, 4]);
    expect(list.lines[0]?.problems).toEqual([]);
  });

  it("reads doubled quotes inside a quoted field as one quote (RFC 4180 §2.7)", () => {
    const list = readSerialList('serial,remark\n"KP-9","said ""fine"""\n', { column: 1 });
    expect(list.lines[0]?.serial).toBe('said "fine"');
    expect(list.lines[0]?.problems).toHaveLength(1);
  });

  it("names every problem on its file line: empty serial, invalid characters, repeats in other case", () => {
    const list = readSerialList("serial,weight\nKP-1,20.1\n,20.3\nKP 2,20.2\nkp-1,20.0\n<KP-3>,19.9\n");
    const problems = list.lines.filter((l) => l.problems.length).map((l) => [l.line, l.problems.join(" ")]);
    expect(problems).toEqual([
      [3, "Serial is required"],
      [4, expect.stringContaining("may use letters, digits")],
      [5, "Repeats line 2"],
      [6, expect.stringContaining("may use letters, digits")],
    ]);
  });

  it("lets the reader override the guess: column and whether line 1 is a header", () => {
    const text = "Cell,Mass\nKP-1,20\n";
    expect(readSerialList(text).lines.map((l) => l.serial)).toEqual(["Cell", "KP-1"]);
    const chosen = readSerialList(text, { hasHeader: true, column: 0 });
    expect(chosen.columns).toEqual(["Cell", "Mass"]);
    expect(chosen.lines.map((l) => [l.line, l.serial])).toEqual([[2, "KP-1"]]);
  });

  it("reports a quote left open with the line it starts on", () => {
    const list = readSerialList('serial\nKP-1\n"KP-2\nKP-3\n');
    expect(list.fileProblems).toEqual([expect.stringMatching(/^Line 3: /)]);
  });

  it("strips a byte-order mark so the header is still recognised", () => {
    expect(readSerialList("\uFEFFSerial\nKP-1\n")).toMatchObject({ hasHeader: true, lines: [{ line: 2, serial: "KP-1" }] });
  });
});

describe("problemsByLine", () => {
  it("maps 0-based list positions back to file lines and keeps the rest general", () => {
    const submitted = readSerialList("serial\nKP-1\n\nKP-2\nKP-3\n").lines;
    const mapped = problemsByLine({ "serials.1": ["Already registered"], "serials.2": ["Repeats entry 1 of the list"], serials: ["Too many"] }, submitted);
    expect([...mapped.byLine]).toEqual([
      [4, ["Already registered"]],
      [5, ["Repeats entry 1 of the list"]],
    ]);
    expect(mapped.general).toEqual(["Too many"]);
  });
});
