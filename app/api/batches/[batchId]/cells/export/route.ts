import { defineRoute } from "@/lib/auth/route";
import { batchCellsCsv } from "@/lib/export/batch-cells-csv";
import { filterCellRows, sortCellRows } from "@/lib/notebook/batch-rows";
import { batchCellsQuery } from "@/lib/validations/notebook";
import { batchWithRows } from "../load";

/** GET /api/batches/:batchId/cells/export?q=&status=&tested=&sort=&dir= — the table's filters and order, every row, as CSV. */
export const GET = defineRoute("registry.read", batchCellsQuery.omit({ page: true, pageSize: true }), async ({ params, query }) => {
  const { batch, rows } = await batchWithRows(params.batchId);
  return batchCellsCsv(batch.lotCode, sortCellRows(filterCellRows(rows, query), query.sort, query.dir));
});
