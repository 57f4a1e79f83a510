import { z } from "zod";
import { pageQuery } from "./fields";

/** The actor filter's value for events written by the app itself (analysis worker, seed). */
export const systemActor = "system";

/**
 * GET /api/audit filters. `since`/`until` are instants (the browser turns the reader's local
 * dates into them); `until` is exclusive so "to 12 March" can be sent as the start of 13 March.
 */
const auditFilterFields = {
  entity: z.string().trim().max(40).optional(),
  action: z.string().trim().max(40).optional(),
  actor: z.string().trim().max(100).optional(),
  since: z.iso.datetime({ offset: true }).optional(),
  until: z.iso.datetime({ offset: true }).optional(),
};

const rangeInOrder = (v: { since?: string; until?: string }) => !v.since || !v.until || Date.parse(v.since) < Date.parse(v.until);
const rangeMessage = { path: ["until"], message: "The end of the date range must be after its start" };

export const auditListQuery = z
  .object({
    ...pageQuery,
    pageSize: z.coerce.number().int().min(1).max(200).default(50),
    ...auditFilterFields,
  })
  .refine(rangeInOrder, rangeMessage);
export type AuditListQuery = z.output<typeof auditListQuery>;

/** GET /api/audit/export filters: the page's filters without paging (the export holds every matching event). */
export const auditExportQuery = z
  .object({ q: pageQuery.q, ...auditFilterFields })
  .refine(rangeInOrder, rangeMessage);
export type AuditExportQuery = z.output<typeof auditExportQuery>;
