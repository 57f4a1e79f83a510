import "server-only";
import { and, eq } from "drizzle-orm";
import type { RunStatus } from "@/lib/validations/runs";
import { getDb } from "../client";
import { analysisVersion, cell, run, type RunError } from "../schema";

export interface RunForExport {
  serial: string;
  fileKey: string;
  fileName: string;
  sha256: string;
  status: RunStatus;
  error: RunError | null;
  ambientTempC: number | null;
  /** The column map of the latest analysis; before the first one, the map asked for (null: detection decides). */
  columnMap: unknown;
}

/** What a re-export of a run's samples needs. Server-side only (has the storage key). */
export async function getRunForExport(runId: string): Promise<RunForExport | null> {
  const db = await getDb();
  const [row] = await db
    .select({
      serial: cell.serial,
      fileKey: run.fileKey,
      fileName: run.fileName,
      sha256: run.sha256,
      status: run.status,
      error: run.error,
      ambientTempC: run.ambientTempC,
      requestedColumnMap: run.requestedColumnMap,
      analysedColumnMap: analysisVersion.columnMap,
    })
    .from(run)
    .innerJoin(cell, eq(cell.id, run.cellId))
    .leftJoin(analysisVersion, and(eq(analysisVersion.runId, run.id), eq(analysisVersion.version, run.latestVersion)))
    .where(eq(run.id, runId));
  if (!row) return null;
  const { requestedColumnMap, analysedColumnMap, ...rest } = row;
  return { ...rest, columnMap: analysedColumnMap ?? requestedColumnMap ?? null };
}
