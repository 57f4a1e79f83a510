/**
 * The papaparse path: text decoded in streaming mode, cut into blocks of whole
 * lines, each block parsed by papaparse (quote-aware) and read row by row.
 * Slower than the fast path (see the benchmark), but it takes whatever quoting
 * a file throws at it.
 */
import Papa from "papaparse";
import type { LineParser } from "./fast-path";
import { maxLineBytes } from "./limits";
import type { ReadPlan } from "./plan";
import { reject } from "./reject";
import type { RowSink } from "./row-sink";
import type { StringRowReader } from "./string-rows";

const blockChars = 128 * 1024;

export function createPapaParser(plan: ReadPlan, sink: RowSink, readCells: StringRowReader, encoding: string, newline: number): LineParser {
  const decoder = new TextDecoder(encoding);
  const newlineText = newline === 13 ? "\r" : "\n";
  const delimiter = String.fromCharCode(plan.delimiter);
  const unitLine = plan.unitRow?.line ?? -1;
  let lineNumber = 1;
  let carry = "";

  const tooLong = (line: number): never =>
    reject("line-too-long", `Line ${line} is longer than ${maxLineBytes} bytes; a log line is much shorter.`, { line });

  const checkLengths = (block: string) => {
    if (block.length <= maxLineBytes) return;
    let from = 0;
    let line = lineNumber;
    for (let nl = block.indexOf(newlineText); ; nl = block.indexOf(newlineText, from)) {
      const to = nl < 0 ? block.length : nl;
      if (to - from > maxLineBytes) tooLong(line);
      if (nl < 0) return;
      from = nl + 1;
      line++;
    }
  };

  const parseBlock = (block: string, endsFile: boolean) => {
    checkLengths(block);
    const rows = block.length === 0 ? [[""]] : Papa.parse<string[]>(block, { delimiter, newline: newlineText, quoteChar: '"' }).data;
    for (let k = 0; k < rows.length; k++) {
      const line = lineNumber++;
      const cells = rows[k]!;
      if (newline === 10 && cells.length > 0) {
        const lastCell = cells[cells.length - 1]!;
        if (lastCell.endsWith("\r")) cells[cells.length - 1] = lastCell.slice(0, -1);
      }
      if (line <= plan.headerLine) continue;
      if (line === unitLine) {
        sink.skipped("unit row", line);
        continue;
      }
      readCells(line, cells, endsFile && k === rows.length - 1);
    }
  };

  return {
    push(chunk) {
      const text = carry + decoder.decode(chunk, { stream: true });
      const cut = text.lastIndexOf(newlineText);
      if (cut < 0) {
        carry = text;
        if (carry.length > maxLineBytes) tooLong(lineNumber);
        return;
      }
      carry = text.slice(cut + 1);
      // Blocks of about 128 K characters: papaparse's row arrays for a whole 1 MiB chunk
      // pushed peak memory towards the 256 MB budget.
      for (let from = 0; from <= cut; ) {
        let to = from + blockChars >= cut ? cut : text.lastIndexOf(newlineText, from + blockChars);
        if (to < from) to = cut;
        parseBlock(text.slice(from, to), false);
        from = to + 1;
      }
      if (carry.length > maxLineBytes) tooLong(lineNumber);
    },
    end() {
      const text = carry + decoder.decode();
      carry = "";
      if (text.length > 0) parseBlock(text, true);
    },
  };
}
