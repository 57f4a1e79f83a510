import { createHash } from "node:crypto";
import { createAnalyzer } from "@/lib/analysis";
import { readLog } from "@/lib/analysis/read";
import type { AuditActor } from "@/lib/db/queries/audit";
import { claimQueuedRun, completeAnalysis, recordRun } from "@/lib/db/queries/runs";
import { analysisRows } from "@/lib/ingest/report-rows";
import type { RunPurpose } from "@/lib/validations/runs";
import { protocol, simulate, toCsv } from "./sim";

async function* bytes(text: string): AsyncIterable<Uint8Array> {
  yield new TextEncoder().encode(text);
}

/**
 * A bench log stored the way the ingest stores one, without the upload service and the worker:
 * the run recorded (recordRun), claimed (claimQueuedRun), analysed by the real engine with the
 * cell type's limits, and stored as a version (completeAnalysis) in one transaction.
 */
export async function storeAnalysedRun(
  actor: AuditActor,
  options: { serial: string; csv: string; purpose: RunPurpose; fileName?: string; testEndedAt?: Date },
): Promise<{ runId: string; cellId: string; version: number }> {
  const sha256 = createHash("sha256").update(options.csv).digest("hex");
  const { runId, cellId } = await recordRun(
    {
      cellSerial: options.serial,
      mayCreateCell: false,
      source: "api",
      purpose: options.purpose,
      ambientTempC: 23,
      testEndedAt: options.testEndedAt?.toISOString() ?? null,
      operatorNote: "",
      fileKey: `test/${sha256}`,
      fileName: options.fileName ?? `${options.serial}-${sha256.slice(0, 8)}.csv`,
      fileSize: Buffer.byteLength(options.csv),
      sha256,
      columnMap: null,
    },
    actor,
  );
  const claim = await claimQueuedRun(runId);
  if (!claim) throw new Error("the run was not queued");
  const analyzer = createAnalyzer({ limits: claim.limits });
  const summary = await readLog(bytes(options.csv), (batch) => analyzer.push(batch), { fileName: claim.fileName });
  const output = analyzer.finish(summary);
  const stored = await completeAnalysis(claim, {
    rows: analysisRows(output.report, output.series),
    columnMap: summary.detection.columnMap,
    engineVersion: "test",
  });
  if (!stored) throw new Error("the analysis was not stored");
  return { runId, cellId, version: stored.version };
}

/**
 * A capacity check of a cell simulated with a model capacity of `capacity_mAh` (the test's cell
 * type is rated 1000 mAh): the project's simulator, CC-CV charge at 0.5C to 4.2 V with C/20
 * termination, rest, 0.5C discharge to 3.0 V (the usual polymer-cell limits: common practice, no
 * source). The delivered capacity is read from the log by the engine, not assumed.
 */
export function capacityCheckOf(capacity_mAh: number, seed: number): string {
  const plan = protocol().ccCvCharge(0.5, 4.2, 0.05).rest(600).ccDischarge(0.5, 3.0).rest(300).build();
  const { samples } = simulate(plan, { ratedCapacity_mAh: capacity_mAh, initialSoc: 0.02, logInterval_s: 10, voltageNoise_V: 0.001, currentNoise_A: 0.001, seed });
  return toCsv(samples);
}
