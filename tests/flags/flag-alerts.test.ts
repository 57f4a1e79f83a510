/**
 * Flag rules end to end: a bench log stored the way the ingest stores it → the rules evaluated
 * after the analysis → a flag with its first history step → alert mail queued in the same
 * transaction → sent through nodemailer to the real SMTP fake on free ports → read back from
 * the fake's message API.
 */
import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import type { StoredMessage } from "@/fakes/smtp/message-store";
import { startSmtpFake, type SmtpFake } from "@/fakes/smtp/server";
import { getDb } from "@/lib/db/client";
import { flagsOf, getFlagDetail, raiseFlagByHand, transitionFlag } from "@/lib/db/queries/flags";
import { createCell, getCellBySerial } from "@/lib/db/queries/registry";
import { auditEvent, flag, outboxMessage, user } from "@/lib/db/schema";
import { evaluateFlagsAfterAnalysis } from "@/lib/flags/evaluate";
import { OutboxSender, stopOutboxSender } from "@/lib/mail/sender";
import { capacityCheckOf, storeAnalysedRun } from "../support/analysed-runs";
import { capacityCheckCsv, trapezoidTotals_mAh } from "../support/bench-logs";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { signedInUser, type SignedInUser } from "../support/users";

vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn(), updateTag: vi.fn() }));

let mailDir: string;
let fake: SmtpFake;
let engineerA: SignedInUser;
let engineerB: SignedInUser;
let admin: { id: string; name: string };
let batchId: string;

async function inbox(): Promise<StoredMessage[]> {
  const response = await fetch(`${fake.httpUrl}/api/messages`);
  return (await response.json()) as StoredMessage[];
}

/** Stops the process's background sender (waiting for a pass under way), then sends whatever is still due. */
async function deliver(): Promise<void> {
  await stopOutboxSender();
  await new OutboxSender({ digest: false }).runOnce();
}

beforeAll(async () => {
  mailDir = await mkdtemp(path.join(os.tmpdir(), "kneepoint-flag-mail-"));
  fake = await startSmtpFake({ dataDir: mailDir, log: () => undefined });
  process.env.SMTP_URL = `smtp://127.0.0.1:${fake.smtpPort}`;
  await installTestDatabase();
  engineerA = await signedInUser("engineer", "Ada Engineer");
  engineerB = await signedInUser("engineer", "Ben Engineer");
  // Neither of these may get engineers' alerts: a banned engineer and a QA lead.
  const banned = await signedInUser("engineer", "Banned Engineer");
  await (await getDb()).update(user).set({ banned: true }).where(eq(user.id, banned.id));
  await signedInUser("qa-lead");
  const adminUser = await signedInUser("admin", "Admin");
  admin = { id: adminUser.id, name: "Admin" };
  ({ batchId } = await cellTypeWithBatch(admin, "LOT-FLAGS-1"));
  for (const serial of ["KP-FADE-1", "KP-GOOD-1"]) await createCell({ serial, batchId }, admin);
});

afterAll(async () => {
  await stopOutboxSender();
  await removeTestDatabase();
  await fake.close();
  await rm(mailDir, { recursive: true, force: true });
  delete process.env.SMTP_URL;
});

describe("a rule opens a flag after an analysis and the engineers get the alert", () => {
  let fadedRun: string;

  it("flags the cell whose capacity is below 80 % of rated and mails every active engineer", async () => {
    const csv = capacityCheckOf(700, 3);
    const stored = await storeAnalysedRun(admin, { serial: "KP-FADE-1", csv, purpose: "capacity check" });
    fadedRun = stored.runId;
    const good = await storeAnalysedRun(admin, { serial: "KP-GOOD-1", csv: capacityCheckCsv(4), purpose: "capacity check" });

    const first = await evaluateFlagsAfterAnalysis(stored.runId);
    await evaluateFlagsAfterAnalysis(good.runId);

    const fadeFlags = (await flagsOf({ cellId: stored.cellId })).filter((f) => f.kind === "soh-below");
    expect(fadeFlags).toHaveLength(1);
    const opened = fadeFlags[0];
    if (!opened) throw new Error("no flag");
    expect(first.opened.map((o) => o.flagId)).toContain(opened.id);
    expect((await flagsOf({ cellId: good.cellId })).filter((f) => f.kind === "soh-below")).toEqual([]);

    // SOH = discharged / rated; the discharged charge checked against the trapezoid rule over the same CSV (any numerical-analysis text).
    const expectedSoh = (trapezoidTotals_mAh(csv).discharged / 1000) * 100;
    expect(opened.value).toBeCloseTo(expectedSoh, 0);
    expect(opened.value).toBeLessThan(80);
    expect(opened).toMatchObject({ state: "open", bound: 80, unit: "%", serial: "KP-FADE-1", lotCode: "LOT-FLAGS-1" });

    const detail = await getFlagDetail(opened.id);
    expect(detail?.transitions).toEqual([expect.objectContaining({ fromState: null, toState: "open", actorName: "Kneepoint (rule)" })]);
    expect(detail?.transitions[0]?.reason).toContain("State of health below the end-of-life threshold (80 %)");
    expect(detail?.evidence?.runId).toBe(stored.runId);
    expect((await getCellBySerial("KP-FADE-1"))?.status).toBe("flagged");
    expect((await getCellBySerial("KP-GOOD-1"))?.status).not.toBe("retired");

    const db = await getDb();
    const audit = await db.select({ action: auditEvent.action }).from(auditEvent).where(eq(auditEvent.entityId, opened.id));
    expect(audit.map((a) => a.action)).toEqual(["open"]);
    const queued = await db.select({ to: outboxMessage.toAddress, status: outboxMessage.status }).from(outboxMessage).where(eq(outboxMessage.flagId, opened.id));
    expect(queued.map((q) => q.to).sort()).toEqual([engineerA.email, engineerB.email].sort());

    await deliver();
    const received = (await inbox()).filter((m) => m.subject.includes("KP-FADE-1"));
    expect(received.flatMap((m) => m.to).sort()).toEqual([engineerA.email, engineerB.email].sort());
    for (const message of received) {
      expect(message.subject).toBe("Flag on cell KP-FADE-1: State of health below a bound");
      expect(message.text).toContain("A flag opened on cell KP-FADE-1 (batch LOT-FLAGS-1).");
      expect(message.text).toContain("Rule: State of health below the end-of-life threshold (80 %)");
      expect(message.text).toMatch(/Value: \d+(\.\d+)? % against a bound of 80 %/);
      expect(message.text).toContain("http://localhost:3000/cells/KP-FADE-1");
      expect(message.text).toContain(`http://localhost:3000/flags/${opened.id}`);
    }
    const sent = await db.select({ status: outboxMessage.status, attempts: outboxMessage.attempts }).from(outboxMessage).where(eq(outboxMessage.flagId, opened.id));
    expect(sent).toEqual([
      { status: "sent", attempts: 1 },
      { status: "sent", attempts: 1 },
    ]);
  });

  it("does not open the same flag twice, and a cleared flag stays cleared for its evidence", async () => {
    const db = await getDb();
    const sohFlags = async () =>
      (await db.select({ id: flag.id, state: flag.state, kind: flag.kind, ruleId: flag.ruleId }).from(flag)).filter((f) => f.kind === "soh-below");
    const [only] = await sohFlags();
    if (!only) throw new Error("no flag");
    const again = await evaluateFlagsAfterAnalysis(fadedRun);
    expect(again.opened.filter((o) => o.ruleId === only.ruleId)).toEqual([]);
    expect(again.skipped).toBeGreaterThanOrEqual(1);
    expect(await sohFlags()).toHaveLength(1);

    await transitionFlag(
      { flagId: only.id, to: "cleared", reason: "Capacity low by design: a half-size sample cell", expectedState: "open" },
      { id: engineerA.id, name: "Ada Engineer" },
      // The password check is the action's; this test calls the database layer, which only needs a verified signer.
      { signerId: engineerA.id, signerName: "Ada Engineer", meaning: "reviewed" },
    );
    const unclosed = (await flagsOf({ cellId: (await getCellBySerial("KP-FADE-1"))?.id ?? "" })).filter((f) => f.state !== "cleared");
    expect((await getCellBySerial("KP-FADE-1"))?.status).toBe(unclosed.length ? "flagged" : "active");

    const afterClear = await evaluateFlagsAfterAnalysis(fadedRun);
    expect(afterClear.opened.filter((o) => o.ruleId === only.ruleId)).toEqual([]);
    expect(await sohFlags()).toHaveLength(1);

    // New evidence (a later capacity check that is still low) opens a new flag.
    const later = await storeAnalysedRun(admin, { serial: "KP-FADE-1", csv: capacityCheckOf(690, 5), purpose: "capacity check" });
    const fresh = await evaluateFlagsAfterAnalysis(later.runId);
    const soh = await sohFlags();
    expect(soh).toHaveLength(2);
    expect(fresh.opened.map((o) => o.flagId)).toContain(soh.find((f) => f.state === "open")?.id);
  });

  it("mails the engineers when an engineer raises a flag by hand, with the reason", async () => {
    await deliver();
    const before = (await inbox()).length;
    const raised = await raiseFlagByHand({ cellSerial: "kp-good-1", reason: "Tab looks discoloured after the last test" }, { id: engineerB.id, name: "Ben Engineer" }, "http://localhost:3000");
    expect(raised.serial).toBe("KP-GOOD-1");
    expect((await getCellBySerial("KP-GOOD-1"))?.status).toBe("flagged");
    await deliver();
    const all = await inbox();
    // The fake lists newest first.
    const fresh = all.slice(0, all.length - before);
    expect(fresh.flatMap((m) => m.to).sort()).toEqual([engineerA.email, engineerB.email].sort());
    expect(fresh[0]?.subject).toBe("Flag on cell KP-GOOD-1: Raised by hand");
    expect(fresh[0]?.text).toContain("Raised by hand by Ben Engineer.");
    expect(fresh[0]?.text).toContain("Reason: Tab looks discoloured after the last test");
  });
});
