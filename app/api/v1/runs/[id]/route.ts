import { z } from "zod";
import { defineRoute } from "@/lib/auth/route";
import { getRunDetail } from "@/lib/db/queries/run-views";
import { AppError } from "@/lib/http/errors";
import { runJson } from "@/lib/ingest/api-json";

const idParam = z.uuid();

/**
 * GET /api/v1/runs/:id[?version=N] — the run's status and, once analysed, its report in the
 * CLI's JSON shape (the latest analysis version unless `version` is given).
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
      report: analysis?.report ?? null,
    };
  },
  { auth: "session-or-token" },
);
