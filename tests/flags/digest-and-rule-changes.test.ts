/**
 * Rules evaluated when they or the settings change, and the optional daily digest: built from the
 * flags not yet closed, queued once per server-clock day after the set hour, sent by the sender
 * to the real SMTP fake.
 */
import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { createRuleAction, saveLabSettingsAction, updateRuleAction } from "@/app/(lab)/flags/rules/actions";
import type { StoredMessage } from "@/fakes/smtp/message-store";
import { startSmtpFake, type SmtpFake } from "@/fakes/smtp/server";
import { withRequestHeaders } from "@/lib/auth/request-headers";
import { getDb } from "@/lib/db/client";
import { flagsOf, listRules, raiseFlagByHand } from "@/lib/db/queries/flags";
import { createCell } from "@/lib/db/queries/registry";
import { evaluateFlagsAfterAnalysis } from "@/lib/flags/evaluate";
import { buildDailyDigest, digestDue, localDate, queueDailyDigest } from "@/lib/mail/digest";
import { OutboxSender, stopOutboxSender } from "@/lib/mail/sender";
import { capacityCheckOf, storeAnalysedRun } from "../support/analysed-runs";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { signedInUser, type SignedInUser } from "../support/users";

vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn(), updateTag: vi.fn() }));

let mailDir: string;
let fake: SmtpFake;
let engineer: SignedInUser;
let cellId: string;
const asEngineer = <T>(fn: () => Promise<T>) => withRequestHeaders(engineer.headers, fn);

beforeAll(async () => {
  mailDir = await mkdtemp(path.join(os.tmpdir(), "kneepoint-digest-"));
  fake = await startSmtpFake({ dataDir: mailDir, log: () => undefined });
  await installTestDatabase();
  engineer = await signedInUser("engineer", "Ada Engineer");
  const admin = await signedInUser("admin");
  const actor = { id: admin.id, name: "Admin" };
  const { batchId } = await cellTypeWithBatch(actor, "LOT-DIGEST-1");
  await createCell({ serial: "KP-DIG-1", batchId }, actor);
  const stored = await storeAnalysedRun(actor, { serial: "KP-DIG-1", csv: capacityCheckOf(900, 11), purpose: "capacity check" });
  cellId = stored.cellId;
  await evaluateFlagsAfterAnalysis(stored.runId);
});

afterAll(async () => {
  await stopOutboxSender();
  await removeTestDatabase();
  await fake.close();
  await rm(mailDir, { recursive: true, force: true });
});

const sohFlags = async () => (await flagsOf({ cellId })).filter((f) => f.kind === "soh-below");

describe("rule and setting changes", () => {
  it("runs the rules again on every cell when the end-of-life threshold changes", async () => {
    const [before] = await sohFlags();
    expect(before).toBeUndefined();
    const saved = await asEngineer(() => saveLabSettingsAction({ eolThresholdPct: "99", digestEnabled: "", digestHour: "7" }));
    expect(saved).toMatchObject({ ok: true, data: { eolThresholdPct: 99, evaluated: true } });
    const [opened] = await sohFlags();
    expect(opened).toMatchObject({ state: "open", bound: 99 });
    expect(opened?.value).toBeLessThan(99);
    expect(saved.ok && saved.data.opened).toBeGreaterThanOrEqual(1);
  });

  it("runs a new or changed rule at once; a rule switched off does not run; a rule keeps its kind", async () => {
    const created = await asEngineer(() => createRuleAction({ kind: "soh-below", bound: "99.5", enabled: "on", note: "Tight incoming check" }));
    expect(created).toMatchObject({ ok: true, data: { opened: 1, evaluated: true } });
    expect(await sohFlags()).toHaveLength(2);

    const rule = (await listRules()).find((r) => r.note === "Tight incoming check");
    if (!rule) throw new Error("rule not listed");
    expect(rule.description).toBe("State of health below 99.5 %");
    const off = await asEngineer(() => updateRuleAction({ ruleId: rule.id, kind: "soh-below", bound: "99.5", enabled: "", note: "" }));
    expect(off).toMatchObject({ ok: true, data: { evaluated: false, opened: 0 } });
    expect((await listRules()).find((r) => r.id === rule.id)?.enabled).toBe(false);

    const rekind = await asEngineer(() => updateRuleAction({ ruleId: rule.id, kind: "ce-below", bound: "98", enabled: "on", note: "" }));
    expect(rekind).toMatchObject({ ok: false, status: 400 });
    const badBound = await asEngineer(() => createRuleAction({ kind: "ce-below", bound: "", enabled: "on", note: "" }));
    expect(badBound).toMatchObject({ ok: false, status: 400, fieldErrors: { bound: expect.any(Array) } });
  });
});

describe("the daily digest", () => {
  it("lists the flags not yet closed with links, and is nothing without any", async () => {
    const db = await getDb();
    const now = new Date(2026, 11, 2, 8, 30);
    const digest = await buildDailyDigest(db, now, "http://localhost:3000");
    const open = (await flagsOf({ cellId })).filter((f) => f.state === "open");
    expect(digest?.subject).toBe(`Kneepoint digest ${localDate(now)}: ${open.length} flags not yet closed`);
    expect(digest?.text).toContain(`Flags not yet closed: ${open.length}`);
    for (const f of open) expect(digest?.text).toContain(`http://localhost:3000/flags/${f.id}`);
    expect(digest?.text).toContain("[open] KP-DIG-1 (batch LOT-DIGEST-1): State of health below a bound");
  });

  it("is queued once per day after the set hour, to every engineer, and sent through the outbox", async () => {
    // The sender's clock runs from tomorrow: messages are queued at the database's real time, and
    // are due once the sender's clock has passed it (a fixed date would turn into the past).
    const today = new Date();
    const at = (daysAfterTomorrow: number, hour: number, minute: number) => new Date(today.getFullYear(), today.getMonth(), today.getDate() + 1 + daysAfterTomorrow, hour, minute);
    await raiseFlagByHand({ cellSerial: "KP-DIG-1", reason: "Label peeling" }, { id: engineer.id, name: "Ada Engineer" }, "http://localhost:3000");
    expect(await digestDue(at(0, 8, 0))).toBe(false);
    expect((await asEngineer(() => saveLabSettingsAction({ eolThresholdPct: "99", digestEnabled: "on", digestHour: "7" }))).ok).toBe(true);

    expect(await digestDue(at(0, 6, 59))).toBe(false);
    const morning = at(0, 7, 5);
    expect(await digestDue(morning)).toBe(true);
    let clock = morning;
    const sender = new OutboxSender({ smtpUrl: `smtp://127.0.0.1:${fake.smtpPort}`, now: () => clock, baseUrl: "http://localhost:3000" });
    const first = await sender.runOnce();
    expect(first.digestQueued).toBe(1);
    expect(await digestDue(morning)).toBe(false);
    expect(await queueDailyDigest(at(0, 18, 0), "http://localhost:3000")).toBe(0);

    const digests = async () =>
      ((await (await fetch(`${fake.httpUrl}/api/messages`)).json()) as StoredMessage[]).filter((m) => m.subject.startsWith("Kneepoint digest"));
    expect((await digests()).map((m) => [m.to, m.subject])).toEqual([[[engineer.email], expect.stringContaining(localDate(morning))]]);
    expect((await digests())[0]?.text).toContain("Label peeling");

    clock = at(1, 7, 1);
    expect((await sender.runOnce()).digestQueued).toBe(1);
    expect(await digests()).toHaveLength(2);
    await sender.stop();
  });
});
