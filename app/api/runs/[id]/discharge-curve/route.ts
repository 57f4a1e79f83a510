import { z } from "zod";
import { defineRoute } from "@/lib/auth/route";
import { getRunDischargeCurve } from "@/lib/db/queries/notebook";
import { getRunHeader } from "@/lib/db/queries/run-views";
import { AppError } from "@/lib/http/errors";

const idParam = z.uuid();

/**
 * GET /api/runs/:id/discharge-curve — voltage against delivered mAh of the run's capacity cycle,
 * for overlays. `curve` is null for a run without one (not analysed yet, or no discharge).
 */
export const GET = defineRoute("run.read", z.object({}), async ({ params }) => {
  const id = idParam.safeParse(params.id);
  const header = id.success ? await getRunHeader(id.data) : null;
  if (!header) throw new AppError("not-found", "No run has this id.");
  return { runId: header.id, serial: header.serial, createdAt: header.createdAt.toISOString(), curve: await getRunDischargeCurve(header.id) };
});
