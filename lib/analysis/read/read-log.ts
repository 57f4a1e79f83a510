import type { SampleBatch } from "../types";
import { judgeBytes, readHead, transcodeToUtf8 } from "./byte-source";
import { createFastParser } from "./fast-path";
import { headLines } from "./head-text";
import { defaultBatchSize } from "./limits";
import type { ReadOptions, ReadSummary } from "./options";
import { createPapaParser } from "./papa-path";
import { buildPlan, layoutHints, settleDetection } from "./plan";
import { reject, withFileName } from "./reject";
import { RowSink } from "./row-sink";
import { sniffLayout } from "./sniff";
import { createStringRowReader } from "./string-rows";

async function* counted(source: AsyncIterable<Uint8Array>, total: { bytes: number }): AsyncGenerator<Uint8Array> {
  for await (const chunk of source) {
    total.bytes += chunk.length;
    yield chunk;
  }
}

/**
 * Streams the whole log once, calling onBatch for each chunk in file order
 * (buffers are reused after onBatch returns). Throws AnalysisRejected with a
 * located error for hard problems. Memory stays bounded: a head of at most
 * 1 MiB, the first rows held back while the current sign is decided, and one
 * batch.
 */
export async function readLog(
  source: AsyncIterable<Uint8Array>,
  onBatch: (batch: SampleBatch) => void,
  options: ReadOptions = {},
): Promise<ReadSummary> {
  try {
    const total = { bytes: 0 };
    let head = await readHead(counted(source, total));
    if (head.bytes.length === 0) reject("empty", "The file is empty.");
    const verdict = judgeBytes(head.bytes);
    if (verdict.binary !== null) reject("binary", `This is not a text log: ${verdict.binary}.`, { line: 1 });
    let encoding: string = verdict.encoding;
    if (verdict.encoding === "utf-16le" || verdict.encoding === "utf-16be") {
      head = await readHead(transcodeToUtf8(head.stream, verdict.encoding));
      encoding = "utf-8";
    }
    const { lines, newline } = headLines(head.bytes, head.complete, encoding);
    const plan = buildPlan(sniffLayout(lines, layoutHints(options.columnMap)), options.columnMap);
    const sink = new RowSink(plan, onBatch, options.batchSize ?? defaultBatchSize);
    const readCells = createStringRowReader(plan, sink);
    const choice = options.parser ?? "auto";
    const path = choice === "papaparse" || (choice === "auto" && plan.oddQuoting) ? "papaparse" : "fast";
    const parser =
      path === "fast" ? createFastParser(plan, sink, readCells, encoding, newline) : createPapaParser(plan, sink, readCells, encoding, newline);
    for await (const chunk of head.stream) parser.push(chunk);
    parser.end();
    const result = sink.finish();
    return {
      detection: settleDetection(plan.detection, result.sign, result.signConfidence),
      findings: result.findings,
      rows: result.rows,
      bytes: total.bytes,
      path,
    };
  } catch (error) {
    throw withFileName(error, options.fileName);
  }
}
