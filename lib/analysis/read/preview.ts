/**
 * The upload page's preview: detection and the first rows as text, from the
 * first bytes of a file. The head's rows also run through the row checks, so a
 * problem in the first part of the file shows before upload.
 */
import { AnalysisRejected, type Detection, type LocatedError } from "../types";
import { judgeBytes } from "./byte-source";
import { headLines } from "./head-text";
import { createPapaParser } from "./papa-path";
import { buildPlan, layoutHints, settleDetection, type ColumnMapInput } from "./plan";
import { reject } from "./reject";
import { RowSink } from "./row-sink";
import { sniffLayout } from "./sniff";
import { createStringRowReader } from "./string-rows";

export interface LogPreview {
  detection: Detection | null;
  error: LocatedError | null;
  header: string[];
  /** First maxRows data rows, raw text fields. */
  rows: string[][];
}

function utf8Head(head: Uint8Array): { bytes: Uint8Array; encoding: string } {
  if (head.length === 0) reject("empty", "The file is empty.");
  const verdict = judgeBytes(head);
  if (verdict.binary !== null) reject("binary", `This is not a text log: ${verdict.binary}.`, { line: 1 });
  if (verdict.encoding === "utf-16le" || verdict.encoding === "utf-16be")
    return { bytes: new TextEncoder().encode(new TextDecoder(verdict.encoding).decode(head)), encoding: "utf-8" };
  return { bytes: head, encoding: verdict.encoding };
}

export function previewLog(head: Uint8Array, options: { columnMap?: ColumnMapInput; maxRows?: number } = {}): LogPreview {
  const maxRows = options.maxRows ?? 20;
  let header: string[] = [];
  let rows: string[][] = [];
  let detection: Detection | null = null;
  try {
    const { bytes, encoding } = utf8Head(head);
    // The head is taken as cut: its last line may be incomplete and is left out.
    const { lines, newline } = headLines(bytes, false, encoding);
    rows = lines.slice(0, maxRows).map((line) => [line]);
    const layout = sniffLayout(lines, layoutHints(options.columnMap));
    header = layout.header;
    rows = layout.sample.slice(0, maxRows).map((r) => r.cells);
    const plan = buildPlan(layout, options.columnMap);
    detection = plan.detection;
    const sink = new RowSink(plan, () => {}, 4096);
    const parser = createPapaParser(plan, sink, createStringRowReader(plan, sink), encoding, newline);
    const lastNewline = bytes.lastIndexOf(newline);
    parser.push(bytes.subarray(0, lastNewline + 1));
    parser.end();
    const result = sink.finish();
    detection = settleDetection(plan.detection, result.sign, result.signConfidence);
    return { detection, error: null, header, rows };
  } catch (error) {
    if (!(error instanceof AnalysisRejected)) throw error;
    return { detection, error: error.detail, header, rows };
  }
}
