import "server-only";
import type { ColumnMap } from "@/lib/analysis/types";
import { can } from "@/lib/auth/roles";
import type { SessionUser } from "@/lib/auth/session";
import { getColumnMap } from "@/lib/db/queries/column-maps";
import { recordRun, type NewRun } from "@/lib/db/queries/runs";
import { AppError } from "@/lib/http/errors";
import { deleteStoredFile } from "@/lib/uploads/storage";
import type { RunUploadInput } from "@/lib/validations/runs";
import { enqueueAnalysis, hashStoredFile } from "./runner";

/** The column map an upload asked for: a saved one by id, an inline one, or none (detection decides). */
export async function columnMapOf(input: { columnMapId?: string; columnMap?: ColumnMap }): Promise<ColumnMap | null> {
  if (input.columnMapId) return getColumnMap(input.columnMapId);
  return input.columnMap ?? null;
}

/** A run record's fields that come from the upload form (the rest come from the stored file). */
export type RunFields = Omit<NewRun, "source" | "fileKey" | "fileName" | "fileSize" | "sha256">;

/** The upload form's fields as a run record needs them, for the given uploader. */
export function runFields(input: RunUploadInput, user: SessionUser, columnMap: ColumnMap | null): RunFields {
  return {
    cellSerial: input.cellSerial,
    newCell: { batchId: input.batchId, cellTypeId: input.cellTypeId },
    mayCreateCell: can(user.role, "cell.write"),
    purpose: input.purpose,
    ambientTempC: input.ambientTempC ?? null,
    testEndedAt: input.testEndedAt ?? null,
    operatorNote: input.operatorNote,
    columnMap,
  };
}

export type StoredFile = { key: string; name: string; size: number };

/**
 * A file already in storage becomes a queued run: its bytes are hashed in a worker, the run is
 * recorded (duplicates refused with DuplicateRun), and its analysis queued. A refused file's
 * stored copy is removed, so storage keeps each cell's bytes once.
 */
export async function admitStoredFile(
  file: StoredFile,
  fields: RunFields,
  source: NewRun["source"],
  actor: { id: string; name: string },
  knownSha256?: string,
): Promise<{ runId: string; serial: string }> {
  const sha256 = knownSha256 ?? (await hashStoredFile(file.key)).sha256;
  try {
    const recorded = await recordRun({ ...fields, source, fileKey: file.key, fileName: file.name, fileSize: file.size, sha256 }, actor);
    await enqueueAnalysis(recorded.runId);
    return { runId: recorded.runId, serial: recorded.serial };
  } catch (error) {
    // A refused file belongs to no run: leave no orphan in storage.
    if (error instanceof AppError) await deleteStoredFile(file.key).catch((e: unknown) => console.error(`Removing duplicate ${file.key} failed`, e));
    throw error;
  }
}
