import { defineRoute } from "@/lib/auth/route";
import { cellsCsv } from "@/lib/export/registry-csv";
import { cellListQuery } from "@/lib/validations/registry";

/** GET /api/cells/export?q=&status=&batchId=&sort=&dir= — the cells table's filters, every page, as CSV. */
export const GET = defineRoute("registry.read", cellListQuery.omit({ page: true, pageSize: true }), ({ query }) => cellsCsv(query));
