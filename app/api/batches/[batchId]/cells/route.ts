import { defineRoute } from "@/lib/auth/route";
import { pageOfCellRows } from "@/lib/notebook/batch-rows";
import { batchCellsQuery } from "@/lib/validations/notebook";
import { batchWithRows } from "./load";

/** GET /api/batches/:batchId/cells?q=&status=&tested=&sort=&dir=&page=&pageSize= — the batch's cells with their figures. */
export const GET = defineRoute("registry.read", batchCellsQuery, async ({ params, query }) => {
  const { rows } = await batchWithRows(params.batchId);
  return pageOfCellRows(rows, query);
});
