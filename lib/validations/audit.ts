import { z } from "zod";
import { pageQuery } from "./fields";

/** The actor filter's value for events written by the app itself (analysis worker, seed). */
export const systemActor = "system";

/**
 * GET /api/audit filters. `since`/`until` are instants (the browser turns the reader's local
 * dates into them); `until` is exclusive so "to 12 March" can be sent as the start of 13 March.
 */
export const auditListQuery = z
  .object({
    ...pageQuery,
    pageSize: z.coerce.number().int().min(1).max(200).default(50),
    entity: z.string().trim().max(40).optional(),
    action: z.string().trim().max(40).optional(),
    actor: z.string().trim().max(100).optional(),
    since: z.iso.datetime({ offset: true }).optional(),
    until: z.iso.datetime({ offset: true }).optional(),
  })
  .refine((v) => !v.since || !v.until || Date.parse(v.since) < Date.parse(v.until), {
    path: ["until"],
    message: "The end of the date range must be after its start",
  });
export type AuditListQuery = z.output<typeof auditListQuery>;
