import { defineRoute } from "@/lib/auth/route";
import { listAuditEvents } from "@/lib/db/queries/audit";
import { auditListQuery } from "@/lib/validations/audit";

/** GET /api/audit?q=&entity=&action=&actor=&since=&until=&page=&pageSize= — newest first. */
export const GET = defineRoute("audit.read", auditListQuery, ({ query }) => listAuditEvents(query));
