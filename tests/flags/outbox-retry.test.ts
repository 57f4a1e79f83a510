/**
 * The outbox keeps mail while the mail server is down: the real SMTP fake stops listening
 * (setAvailable(false)), the sender records each failed attempt and backs off exponentially,
 * and delivers once the fake is back; a message that runs out of attempts ends failed with its
 * last error kept. The sender runs on a clock the test moves, so nothing depends on wall time.
 */
import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { StoredMessage } from "@/fakes/smtp/message-store";
import { startSmtpFake, type SmtpFake } from "@/fakes/smtp/server";
import { getDb } from "@/lib/db/client";
import { enqueueMessages } from "@/lib/db/queries/outbox";
import { outboxMessage } from "@/lib/db/schema";
import { nextAttemptAt } from "@/lib/mail/backoff";
import { OutboxSender } from "@/lib/mail/sender";
import { installTestDatabase, removeTestDatabase } from "../support/db";

let mailDir: string;
let fake: SmtpFake;
let clock: Date;
const policy = { maxAttempts: 3, baseDelayMs: 60_000, maxDelayMs: 600_000 };
const later = (ms: number) => {
  clock = new Date(clock.getTime() + ms);
};

function sender(): OutboxSender {
  return new OutboxSender({ smtpUrl: `smtp://127.0.0.1:${fake.smtpPort}`, now: () => clock, retry: policy, digest: false, baseUrl: "http://localhost:3000" });
}

async function row(subject: string) {
  const db = await getDb();
  const [found] = await db
    .select({ status: outboxMessage.status, attempts: outboxMessage.attempts, nextAttemptAt: outboxMessage.nextAttemptAt, lastError: outboxMessage.lastError, sentAt: outboxMessage.sentAt })
    .from(outboxMessage)
    .where(eq(outboxMessage.subject, subject));
  if (!found) throw new Error(`no message ${subject}`);
  return found;
}

async function received(subject: string): Promise<StoredMessage[]> {
  const all = (await (await fetch(`${fake.httpUrl}/api/messages`)).json()) as StoredMessage[];
  return all.filter((m) => m.subject === subject);
}

async function queue(subject: string): Promise<void> {
  await enqueueMessages(await getDb(), [{ kind: "test", toAddress: "ada@lab.test", subject, textBody: `Body of ${subject}` }]);
  clock = new Date(Date.now() + 1000);
}

beforeAll(async () => {
  mailDir = await mkdtemp(path.join(os.tmpdir(), "kneepoint-outbox-"));
  fake = await startSmtpFake({ dataDir: mailDir, log: () => undefined });
  await installTestDatabase();
});

afterAll(async () => {
  await removeTestDatabase();
  await fake.setAvailable(true);
  await fake.close();
  await rm(mailDir, { recursive: true, force: true });
});

describe("retry schedule", () => {
  it("doubles the delay after each failed attempt, up to the cap, and stops at the last attempt", () => {
    const t0 = new Date("2026-12-01T08:00:00Z");
    const policy5 = { maxAttempts: 5, baseDelayMs: 30_000, maxDelayMs: 100_000 };
    // base · 2^(n − 1): 30 s, 60 s, then capped at 100 s.
    expect(nextAttemptAt(t0, 1, policy5)?.toISOString()).toBe("2026-12-01T08:00:30.000Z");
    expect(nextAttemptAt(t0, 2, policy5)?.toISOString()).toBe("2026-12-01T08:01:00.000Z");
    expect(nextAttemptAt(t0, 3, policy5)?.toISOString()).toBe("2026-12-01T08:01:40.000Z");
    expect(nextAttemptAt(t0, 4, policy5)?.toISOString()).toBe("2026-12-01T08:01:40.000Z");
    expect(nextAttemptAt(t0, 5, policy5)).toBeNull();
  });
});

describe("the outbox while the mail server is down", () => {
  it("keeps the message, backs off, and delivers it once the server is back", async () => {
    await queue("Held while down");
    await fake.setAvailable(false);
    const s = sender();

    const first = await s.runOnce();
    expect(first).toMatchObject({ sent: 0, retrying: 1, failed: 0 });
    const afterFirst = await row("Held while down");
    expect(afterFirst).toMatchObject({ status: "pending", attempts: 1, sentAt: null });
    expect(afterFirst.lastError).toMatch(/ECONNREFUSED/);
    expect(afterFirst.nextAttemptAt.getTime()).toBe(clock.getTime() + 60_000);

    // Not due yet: nothing is tried.
    later(30_000);
    expect(await s.runOnce()).toMatchObject({ sent: 0, retrying: 0, failed: 0 });
    expect((await row("Held while down")).attempts).toBe(1);

    later(30_000);
    expect(await s.runOnce()).toMatchObject({ retrying: 1 });
    const second = await row("Held while down");
    expect(second).toMatchObject({ status: "pending", attempts: 2 });
    expect(second.nextAttemptAt.getTime()).toBe(clock.getTime() + 120_000);
    expect(await received("Held while down")).toEqual([]);

    await fake.setAvailable(true);
    later(120_000);
    expect(await s.runOnce()).toMatchObject({ sent: 1, retrying: 0, failed: 0 });
    expect(await row("Held while down")).toMatchObject({ status: "sent", attempts: 3, lastError: null });
    const delivered = await received("Held while down");
    expect(delivered).toHaveLength(1);
    expect(delivered[0]).toMatchObject({ to: ["ada@lab.test"], text: "Body of Held while down\n" });

    // Sent once: a later pass does not send it again.
    later(600_000);
    expect(await s.runOnce()).toMatchObject({ sent: 0 });
    expect(await received("Held while down")).toHaveLength(1);
    await s.stop();
  });

  it("marks a message failed after its last attempt and keeps the error", async () => {
    await queue("Never delivered");
    await fake.setAvailable(false);
    const s = sender();
    expect(await s.runOnce()).toMatchObject({ retrying: 1 });
    later(60_000);
    expect(await s.runOnce()).toMatchObject({ retrying: 1 });
    later(120_000);
    expect(await s.runOnce()).toMatchObject({ retrying: 0, failed: 1 });
    const failed = await row("Never delivered");
    expect(failed).toMatchObject({ status: "failed", attempts: 3, sentAt: null });
    expect(failed.lastError).toMatch(/ECONNREFUSED/);

    // A failed message is not tried again, even with the server back.
    await fake.setAvailable(true);
    later(3_600_000);
    expect(await s.runOnce()).toMatchObject({ sent: 0, retrying: 0, failed: 0 });
    expect((await row("Never delivered")).attempts).toBe(3);
    expect(await received("Never delivered")).toEqual([]);
    await s.stop();
  });

  it("sends from its background loop once kicked, without anyone calling a pass", async () => {
    await queue("Sent by the loop");
    const loop = new OutboxSender({ smtpUrl: `smtp://127.0.0.1:${fake.smtpPort}`, digest: false, baseUrl: "http://localhost:3000" });
    loop.kick();
    // Wait for the loop's pass (bounded); what is checked is the outcome, not how long it took.
    for (let i = 0; i < 200 && (await row("Sent by the loop")).status !== "sent"; i++) await new Promise((resolve) => setTimeout(resolve, 25));
    await loop.stop();
    expect(await row("Sent by the loop")).toMatchObject({ status: "sent", attempts: 1 });
    expect(await received("Sent by the loop")).toHaveLength(1);
  });
});
