/**
 * The jobs a worker thread runs: reading a stored file once while hashing it, and analysing it.
 * No database and no Next.js here: results go back to the main thread, which stores them.
 */
import { createHash, type Hash } from "node:crypto";
import { createAnalyzer } from "@/lib/analysis";
import { readLog } from "@/lib/analysis/read";
import packageJson from "@/package.json";
import { AnalysisRejected, type CellLimits, type ColumnMap, type LocatedError } from "@/lib/analysis/types";

export interface HashJob {
  kind: "hash";
  url: string;
}

export interface AnalyseJob {
  kind: "analyse";
  url: string;
  fileName: string;
  columnMap: ColumnMap | null;
  limits: CellLimits;
  /** The hash recorded at upload; the bytes analysed must be these bytes. */
  expectedSha256: string;
}

export type Job = HashJob | AnalyseJob;

export interface HashResult {
  sha256: string;
  bytes: number;
}

export type AnalyseResult =
  | {
      outcome: "complete";
      sha256: string;
      bytes: number;
      report: unknown;
      series: unknown;
      /** The column map the reader applied: the request's, completed by detection. */
      columnMap: ColumnMap;
      engineVersion: string;
    }
  | { outcome: "rejected"; error: LocatedError }
  | { outcome: "file-changed"; sha256: string; bytes: number };

export type JobResult<J extends Job> = J extends HashJob ? HashResult : AnalyseResult;

/** Names the engine that produced a stored analysis, so old versions can be told from new ones. */
const engineVersion = `kneepoint ${packageJson.version}`;

/** Long enough for a 256 MB file over a slow link; a stuck download must not hold a worker forever. */
const DOWNLOAD_TIMEOUT_MS = 15 * 60_000;

async function openBody(url: string): Promise<ReadableStream<Uint8Array>> {
  const response = await fetch(url, { signal: AbortSignal.timeout(DOWNLOAD_TIMEOUT_MS) });
  if (!response.ok || !response.body) {
    await response.body?.cancel();
    throw new Error(`Reading the stored file failed: HTTP ${response.status}`);
  }
  return response.body;
}

/** The stream's chunks in order, each also fed to the hash; `counter.bytes` counts them. */
async function* hashing(body: ReadableStream<Uint8Array>, hash: Hash, counter: { bytes: number }): AsyncGenerator<Uint8Array> {
  const reader = body.getReader();
  try {
    for (;;) {
      const { done, value } = await reader.read();
      if (done) return;
      hash.update(value);
      counter.bytes += value.byteLength;
      yield value;
    }
  } finally {
    // The analyser may stop early (a rejected file): release the connection.
    await reader.cancel().catch(() => undefined);
  }
}

export async function runHashJob(job: HashJob): Promise<HashResult> {
  const hash = createHash("sha256");
  const counter = { bytes: 0 };
  for await (const chunk of hashing(await openBody(job.url), hash, counter)) void chunk;
  return { sha256: hash.digest("hex"), bytes: counter.bytes };
}

export async function runAnalyseJob(job: AnalyseJob): Promise<AnalyseResult> {
  const hash = createHash("sha256");
  const counter = { bytes: 0 };
  try {
    // analyzeLog's two steps, spelled out to keep the reader's summary: it holds the column map applied.
    const analyzer = createAnalyzer({ limits: job.limits });
    const summary = await readLog(hashing(await openBody(job.url), hash, counter), (batch) => analyzer.push(batch), {
      fileName: job.fileName,
      columnMap: job.columnMap ?? undefined,
    });
    const output = analyzer.finish(summary);
    const sha256 = hash.digest("hex");
    if (sha256 !== job.expectedSha256) return { outcome: "file-changed", sha256, bytes: counter.bytes };
    return {
      outcome: "complete",
      sha256,
      bytes: counter.bytes,
      report: output.report,
      series: output.series,
      columnMap: summary.detection.columnMap,
      engineVersion,
    };
  } catch (error) {
    if (error instanceof AnalysisRejected) return { outcome: "rejected", error: { ...error.detail, file: error.detail.file ?? job.fileName } };
    throw error;
  }
}

export function runJob(job: Job): Promise<HashResult | AnalyseResult> {
  return job.kind === "hash" ? runHashJob(job) : runAnalyseJob(job);
}
