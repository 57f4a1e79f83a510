import { defineRoute } from "@/lib/auth/route";
import { listCells } from "@/lib/db/queries/registry";
import { cellListQuery } from "@/lib/validations/registry";

/** GET /api/cells?q=&status=&batchId=&sort=&dir=&page=&pageSize= */
export const GET = defineRoute("registry.read", cellListQuery, ({ query }) => listCells(query));
