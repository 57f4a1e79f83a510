import { defineRoute } from "@/lib/auth/route";
import { listBatches } from "@/lib/db/queries/registry";
import { batchListQuery } from "@/lib/validations/registry";

/** GET /api/batches?q=&disposition=&cellTypeId=&sort=&dir=&page=&pageSize= */
export const GET = defineRoute("registry.read", batchListQuery, ({ query }) => listBatches(query));
