import "server-only";
import type { Executor } from "../client";
import { auditEvent } from "../schema";

export interface AuditActor {
  id: string;
  name: string;
}

/**
 * Appends one audit event. Call it with the transaction that makes the change, so the record of a
 * change exists exactly when the change does. Nothing in the app updates or deletes these rows.
 */
export interface AuditEntry {
  action: string;
  entity: string;
  entityId: string;
  before?: unknown;
  after?: unknown;
}

export async function recordAudit(tx: Executor, actor: AuditActor | null, ...events: AuditEntry[]): Promise<void> {
  if (events.length === 0) return;
  await tx.insert(auditEvent).values(
    events.map((event) => ({
      actorId: actor?.id ?? null,
      actorName: actor?.name ?? "system",
      action: event.action,
      entity: event.entity,
      entityId: event.entityId,
      before: event.before ?? null,
      after: event.after ?? null,
    })),
  );
}
