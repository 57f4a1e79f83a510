import "server-only";
import { and, asc, count, eq, inArray, lte, min, sql } from "drizzle-orm";
import { getDb, type Executor } from "../client";
import { outboxMessage, user } from "../schema";

/**
 * The mail outbox. Messages are written in the transaction of the event that causes them and
 * sent afterwards by lib/mail/sender.ts, so a mail server that is down delays mail but loses none.
 */

export interface NewMessage {
  kind: string;
  toAddress: string;
  subject: string;
  textBody: string;
  htmlBody?: string | null;
  flagId?: string | null;
}

export async function enqueueMessages(tx: Executor, messages: readonly NewMessage[]): Promise<number> {
  if (messages.length === 0) return 0;
  await tx.insert(outboxMessage).values(messages.map((m) => ({ ...m, htmlBody: m.htmlBody ?? null, flagId: m.flagId ?? null })));
  return messages.length;
}

/** Every engineer who may sign in: the people an opened flag is mailed to. */
export async function activeEngineers(exec: Executor): Promise<{ id: string; name: string; email: string }[]> {
  return exec
    .select({ id: user.id, name: user.name, email: user.email })
    .from(user)
    .where(and(eq(user.role, "engineer"), sql`coalesce(${user.banned}, false) = false`))
    .orderBy(asc(user.email));
}

export interface ClaimedMessage {
  id: string;
  toAddress: string;
  subject: string;
  textBody: string;
  htmlBody: string | null;
  attempts: number;
}

/**
 * Takes up to `limit` due messages for sending: each attempt is counted and the message is leased
 * (its next attempt moved to `leaseUntil`), so a second sender skips it and a sender that dies
 * mid-send leaves it to be retried when the lease runs out. Delivery is thus at least once.
 */
export async function claimDueMessages(now: Date, leaseUntil: Date, limit: number): Promise<ClaimedMessage[]> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const due = await tx
      .select({ id: outboxMessage.id })
      .from(outboxMessage)
      .where(and(eq(outboxMessage.status, "pending"), lte(outboxMessage.nextAttemptAt, now)))
      .orderBy(asc(outboxMessage.nextAttemptAt), asc(outboxMessage.createdAt))
      .limit(limit)
      .for("update", { skipLocked: true });
    if (due.length === 0) return [];
    return tx
      .update(outboxMessage)
      .set({ attempts: sql`${outboxMessage.attempts} + 1`, nextAttemptAt: leaseUntil })
      .where(inArray(outboxMessage.id, due.map((d) => d.id)))
      .returning({
        id: outboxMessage.id,
        toAddress: outboxMessage.toAddress,
        subject: outboxMessage.subject,
        textBody: outboxMessage.textBody,
        htmlBody: outboxMessage.htmlBody,
        attempts: outboxMessage.attempts,
      });
  });
}

export async function markSent(id: string, at: Date): Promise<void> {
  const db = await getDb();
  await db.update(outboxMessage).set({ status: "sent", sentAt: at, lastError: null }).where(eq(outboxMessage.id, id));
}

/** Records a failed attempt: retried at `retryAt`, or failed for good when `retryAt` is null. */
export async function markAttemptFailed(id: string, error: string, retryAt: Date | null): Promise<void> {
  const db = await getDb();
  await db
    .update(outboxMessage)
    .set(retryAt ? { lastError: error, nextAttemptAt: retryAt } : { lastError: error, status: "failed" })
    .where(eq(outboxMessage.id, id));
}

/** When the next pending message falls due, or null with none pending. */
export async function nextDueAt(): Promise<Date | null> {
  const db = await getDb();
  const [row] = await db.select({ at: min(outboxMessage.nextAttemptAt) }).from(outboxMessage).where(eq(outboxMessage.status, "pending"));
  return row?.at ?? null;
}

export interface OutboxView {
  id: string;
  kind: string;
  toAddress: string;
  subject: string;
  status: "pending" | "sent" | "failed";
  attempts: number;
  nextAttemptAt: Date;
  lastError: string | null;
  createdAt: Date;
  sentAt: Date | null;
}

/** The messages of one flag (the flag page shows whether its alert went out). */
export async function messagesOfFlag(flagId: string): Promise<OutboxView[]> {
  const db = await getDb();
  return db
    .select({
      id: outboxMessage.id,
      kind: outboxMessage.kind,
      toAddress: outboxMessage.toAddress,
      subject: outboxMessage.subject,
      status: outboxMessage.status,
      attempts: outboxMessage.attempts,
      nextAttemptAt: outboxMessage.nextAttemptAt,
      lastError: outboxMessage.lastError,
      createdAt: outboxMessage.createdAt,
      sentAt: outboxMessage.sentAt,
    })
    .from(outboxMessage)
    .where(eq(outboxMessage.flagId, flagId))
    .orderBy(asc(outboxMessage.toAddress));
}

export async function outboxCounts(): Promise<Record<"pending" | "sent" | "failed", number>> {
  const db = await getDb();
  const rows = await db.select({ status: outboxMessage.status, n: count() }).from(outboxMessage).groupBy(outboxMessage.status);
  const out = { pending: 0, sent: 0, failed: 0 };
  for (const r of rows) out[r.status] = r.n;
  return out;
}
