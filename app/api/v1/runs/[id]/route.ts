import { z } from "zod";
import { defineRoute } from "@/lib/auth/route";
import { getRunDetail } from "@/lib/db/queries/run-views";
import type { RunError } from "@/lib/db/schema";
import { AppError } from "@/lib/http/errors";
import { runJson } from "@/lib/ingest/api-json";

const idParam = z.uuid();

/** A run that never analysed gets the CLI's rejection JSON (what `npm run analyze` prints for it). */
function rejection(error: RunError | null) {
  if (!error) return null;
  return { status: "reject" as const, reason: error.message, code: error.code, line: error.line ?? null, column: error.column ?? null };
}

/**
 * GET /api/v1/runs/:id[?version=N] — the run's status and its report in the CLI's JSON shape:
 * the latest analysis version (or version N), the rejection when the file was refused, else null.
 */
export const GET = defineRoute(
  "run.read",
  z.object({ version: z.coerce.number().int().min(1).optional() }),
  async ({ query, params }) => {
    const id = idParam.safeParse(params.id);
    if (!id.success) throw new AppError("not-found", "No run has this id.");
    const detail = await getRunDetail(id.data, query.version);
    if (!detail) throw new AppError("not-found", "No run has this id.");
    if (query.version !== undefined && !detail.analysis) throw new AppError("not-found", `Run ${id.data} has no analysis version ${query.version}.`);
    const { analysis } = detail;
    return {
      run: runJson(detail.run),
      analysis: analysis ? { version: analysis.version, engine_version: analysis.engineVersion, created_at: analysis.createdAt.toISOString() } : null,
      versions: detail.versions.map((v) => ({ version: v.version, engine_version: v.engineVersion, created_at: v.createdAt.toISOString() })),
      report: analysis?.report ?? rejection(detail.run.error),
    };
  },
  { auth: "session-or-token" },
);
