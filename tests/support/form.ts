import { and, eq } from "drizzle-orm";
import { getDb } from "@/lib/db/client";
import { auditEvent } from "@/lib/db/schema";

/** A FormData as a browser form would post it: every value a string. */
export function formData(fields: Record<string, string | number>): FormData {
  const form = new FormData();
  for (const [key, value] of Object.entries(fields)) form.set(key, String(value));
  return form;
}

/** The audit trail of one record, oldest first. */
export async function auditOf(entity: string, entityId: string) {
  const db = await getDb();
  return db
    .select({ action: auditEvent.action, actorId: auditEvent.actorId, before: auditEvent.before, after: auditEvent.after })
    .from(auditEvent)
    .where(and(eq(auditEvent.entity, entity), eq(auditEvent.entityId, entityId)))
    .orderBy(auditEvent.id);
}
