import { z } from "zod";
import { defineRoute } from "@/lib/auth/route";
import { getDischargeCurvePayload } from "@/lib/db/queries/notebook";
import { AppError } from "@/lib/http/errors";

const idParam = z.uuid();

/**
 * GET /api/runs/:id/discharge-curve — voltage against delivered mAh of the run's capacity cycle,
 * for overlays. `curve` is null for a run without one (not analysed yet, or no discharge).
 */
export const GET = defineRoute("run.read", z.object({}), async ({ params }) => {
  const id = idParam.safeParse(params.id);
  const payload = id.success ? await getDischargeCurvePayload(id.data) : null;
  if (!payload) throw new AppError("not-found", "No run has this id.");
  return payload;
});
