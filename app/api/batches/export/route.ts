import { defineRoute } from "@/lib/auth/route";
import { batchesCsv } from "@/lib/export/registry-csv";
import { batchListQuery } from "@/lib/validations/registry";

/** GET /api/batches/export?q=&disposition=&cellTypeId=&sort=&dir= — the batches table's filters, every page, as CSV. */
export const GET = defineRoute("registry.read", batchListQuery.omit({ page: true, pageSize: true }), ({ query }) => batchesCsv(query));
