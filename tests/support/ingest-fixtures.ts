import { createHash } from "node:crypto";
import { recordRun } from "@/lib/db/queries/runs";
import { createCell } from "@/lib/db/queries/registry";
import type { AuditActor } from "@/lib/db/queries/audit";
import { storeFile } from "@/lib/uploads/storage";
import { cellTypeWithBatch } from "./registry-fixtures";
import { startUploadService, type UploadService } from "./upload-service";

export interface IngestFixtures {
  service: UploadService;
  serial: string;
  /** The batch the fixture cell belongs to. */
  batchId: string;
  /** A queued run whose raw file is in the upload fake. */
  runId: string;
}

/** A cell with one stored run, and the upload fake the run's file lives in (for route tests). */
export async function ingestFixtures(actor: AuditActor): Promise<IngestFixtures> {
  const service = await startUploadService();
  const { batchId } = await cellTypeWithBatch(actor, "LOT-INGEST-FIXTURE");
  const serial = "KP-FIXTURE-0001";
  await createCell({ serial, batchId }, actor);
  const text = "time_s,voltage_V,current_A\n0,3.700,0.500\n10,3.710,0.500\n";
  const stored = await storeFile(new Blob([text], { type: "text/csv" }), "fixture.csv", "text/csv");
  const { runId } = await recordRun(
    {
      cellSerial: serial,
      mayCreateCell: false,
      source: "api",
      purpose: "other",
      ambientTempC: null,
      operatorNote: "",
      fileKey: stored.key,
      fileName: "fixture.csv",
      fileSize: stored.size,
      sha256: createHash("sha256").update(text).digest("hex"),
      columnMap: null,
    },
    actor,
  );
  return { service, serial, batchId, runId };
}

/** A small log whose bytes differ on every call, so repeated uploads are never duplicates. */
export function uniqueLog(): string {
  const stamp = `${Date.now()}-${Math.random().toString(36).slice(2)}`;
  return `# ${stamp}\ntime_s,voltage_V,current_A\n0,3.700,0.500\n10,3.710,0.500\n20,3.720,0.500\n`;
}
