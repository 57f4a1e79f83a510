import "server-only";
import { previewLog, type LogPreview } from "@/lib/analysis/read";
import type { ColumnMap } from "@/lib/analysis/types";
import type { SessionUser } from "@/lib/auth/session";
import { getRunFile, getRunHeader } from "@/lib/db/queries/run-views";
import { requestAnalysis } from "@/lib/db/queries/runs";
import { AppError } from "@/lib/http/errors";
import { readStoredHead } from "@/lib/uploads/storage";
import { columnMapOf } from "./intake";
import { enqueueAnalysis } from "./runner";

/** The upload page's preview needs only the first lines; 64 KiB holds a few hundred rows. */
export const previewHeadBytes = 64 * 1024;

/** Detection and the first rows of a stored run's file, optionally under a column map being tried. */
export async function previewStoredRun(runId: string, columnMap?: ColumnMap): Promise<LogPreview & { runId: string; fileName: string }> {
  const file = await getRunFile(runId);
  if (!file) throw new AppError("not-found", "That run does not exist.");
  const head = await readStoredHead(file.fileKey, previewHeadBytes);
  return { runId, fileName: file.fileName, ...previewLog(head, { columnMap, maxRows: 20 }) };
}

/**
 * Asks for an analysis of a stored run with a column map (saved, inline or none). `onlyWhenDone`
 * refuses while an analysis is queued or running (re-analysis from a run page); without it a
 * running analysis finishes and the new request follows (the upload page's confirmation).
 */
export async function startAnalysis(
  input: { runId: string; columnMapId?: string; columnMap?: ColumnMap },
  user: SessionUser,
  options: { onlyWhenDone?: boolean } = {},
): Promise<{ runId: string; status: string; serial: string }> {
  const header = await getRunHeader(input.runId);
  if (!header) throw new AppError("not-found", "That run does not exist.");
  if (options.onlyWhenDone && (header.status === "queued" || header.status === "analysing"))
    throw new AppError("conflict", "This run is being analysed; wait until it finishes before analysing it again.");
  const columnMap = await columnMapOf(input);
  const requested = await requestAnalysis(input.runId, columnMap, { id: user.id, name: user.name });
  if (requested.enqueue) await enqueueAnalysis(input.runId);
  return { runId: input.runId, status: requested.status, serial: header.serial };
}
