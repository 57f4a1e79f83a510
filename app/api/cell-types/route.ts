import { z } from "zod";
import { defineRoute } from "@/lib/auth/route";
import { listCellTypes } from "@/lib/db/queries/registry";

/** GET /api/cell-types: every cell type with its limits (a lab has tens, not thousands). */
export const GET = defineRoute("registry.read", z.object({}), async () => ({ items: await listCellTypes() }));
