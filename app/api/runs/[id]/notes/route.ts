import { z } from "zod";
import { defineRoute } from "@/lib/auth/route";
import { listRunNotes } from "@/lib/db/queries/notebook";
import { getRunHeader } from "@/lib/db/queries/run-views";
import { AppError } from "@/lib/http/errors";

const idParam = z.uuid();

/** GET /api/runs/:id/notes — the run's notes, oldest first, amended ones included. */
export const GET = defineRoute("run.read", z.object({}), async ({ params }) => {
  const id = idParam.safeParse(params.id);
  if (!id.success || !(await getRunHeader(id.data))) throw new AppError("not-found", "No run has this id.");
  return { items: await listRunNotes(id.data) };
});
