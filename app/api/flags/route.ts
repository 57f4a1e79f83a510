import { defineRoute } from "@/lib/auth/route";
import { listFlags } from "@/lib/db/queries/flags";
import { flagListQuery } from "@/lib/validations/flags";

/** Flags, open ones first, filtered by state, kind, batch or serial text; paged. */
export const GET = defineRoute("flag.read", flagListQuery, async ({ query }) => listFlags(query));
