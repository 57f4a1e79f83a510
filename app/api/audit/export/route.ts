import { defineRoute } from "@/lib/auth/route";
import { auditCsv } from "@/lib/export/audit-csv";
import { auditExportQuery } from "@/lib/validations/audit";

/** GET /api/audit/export?q=&entity=&action=&actor=&since=&until= — the audit page's filters, every event, oldest first, as CSV. */
export const GET = defineRoute("audit.read", auditExportQuery, ({ query }) => auditCsv(query));
