/**
 * The ingest benchmark (issue 4): wall-clock time from `POST /api/v1/runs` to a complete run for a
 * log of about 1e6 rows (21 MB), against the built app started as `npm start` starts it. Each
 * repeat posts the same file to another cell (the same bytes on one cell would be a duplicate).
 * Needs a fresh `next build`: the start command rebuilds a stale one first.
 */
import { openAsBlob, rmSync } from "node:fs";
import { join } from "node:path";
import { newDataRoot, startAppServer } from "../e2e/support/app-server";
import { BenchClient, prepareDataRoot, settled } from "../e2e/support/bench-client";
import { writeLog } from "./generate-log";

export interface IngestTiming {
  /** POST sent until its 202 (multipart received, hashed, stored, run queued). */
  accepted_s: number;
  /** POST sent until the run reads complete. */
  complete_s: number;
}

export interface IngestResult {
  rows: number;
  bytes: number;
  timings: IngestTiming[];
}

export const ingestTarget = { rows: 1e6, seconds: 3 };

export async function benchIngest(rows: number, repeats: number, workDir: string): Promise<IngestResult> {
  const dataRoot = newDataRoot();
  try {
    const { token, serials } = await prepareDataRoot(dataRoot);
    if (serials.length < repeats) throw new Error(`only ${serials.length} cells to post to`);
    const log = await writeLog(join(workDir, "ingest.csv"), rows);
    const app = await startAppServer({}, { dataRoot });
    try {
      const client = new BenchClient(app.url, token);
      const timings: IngestTiming[] = [];
      for (const serial of serials.slice(0, repeats)) {
        const start = performance.now();
        const answer = await client.post({ cellSerial: serial, purpose: "cycle life" }, await openAsBlob(log.path, { type: "text/csv" }), "ingest.csv");
        const accepted = performance.now();
        if (answer.status !== 202 || !answer.run) throw new Error(`POST /api/v1/runs answered ${answer.status}`);
        const done = await client.waitFor(answer.run.id, settled, 300_000, 10);
        if (done.status !== "complete") throw new Error(`the run ended ${done.status}: ${done.error?.message ?? ""}`);
        timings.push({ accepted_s: (accepted - start) / 1000, complete_s: (performance.now() - start) / 1000 });
      }
      return { rows: log.rows, bytes: log.bytes, timings };
    } finally {
      await app.stop();
      rmSync(log.path, { force: true });
    }
  } finally {
    rmSync(dataRoot, { recursive: true, force: true });
  }
}

export function formatIngest(result: IngestResult): string {
  const sorted = result.timings.map((t) => t.complete_s).sort((a, b) => a - b);
  const median = sorted[Math.floor(sorted.length / 2)] ?? Number.NaN;
  const lines = [
    `POST /api/v1/runs to a complete run, ${result.rows.toExponential(0)} rows (${(result.bytes / 1e6).toFixed(1)} MB), built server:`,
    "",
    "| repeat | 202 after s | complete after s |",
    "|---:|---:|---:|",
    ...result.timings.map((t, k) => `| ${k + 1} | ${t.accepted_s.toFixed(2)} | ${t.complete_s.toFixed(2)} |`),
    "",
    `median ${median.toFixed(2)} s; target ≤ ${ingestTarget.seconds} s -> ${median <= ingestTarget.seconds ? "met" : "MISSED"}`,
  ];
  return lines.join("\n");
}
