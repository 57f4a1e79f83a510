/**
 * Electronic signatures on lot decisions and on clearing flags. 21 CFR 11.50(a) (from memory, see
 * /work/shared/notes/domain.md "Lab record integrity"): a signed record shows the signer's printed
 * name, the date and time of signing and the meaning of the signature. 21 CFR 11.200(a)(1): a
 * non-biometric signature is an identification code and a password, so the password is typed again
 * at signing. The password is checked against the hash better-auth stored at account creation.
 */
import { count, eq, sql } from "drizzle-orm";
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { decideLotAction } from "@/app/(lab)/batches/[batchId]/quality/actions";
import { transitionFlagAction } from "@/app/(lab)/flags/actions";
import { signatureAttemptLimit, verifySignature, wrongPasswordMessage } from "@/lib/auth/e-signature";
import { createFailureLimiter } from "@/lib/auth/failure-limiter";
import { withRequestHeaders } from "@/lib/auth/request-headers";
import { signatureManifest } from "@/lib/auth/signature-manifest";
import { getDb } from "@/lib/db/client";
import { getFlagDetail, raiseFlagByHand, transitionFlag } from "@/lib/db/queries/flags";
import { listLotDecisions } from "@/lib/db/queries/quality";
import { createCell, getBatch } from "@/lib/db/queries/registry";
import { createUserAccount } from "@/lib/db/queries/users";
import { auditEvent, flag, flagTransition, lotDecision, user } from "@/lib/db/schema";
import { AppError } from "@/lib/http/errors";
import { stopOutboxSender } from "@/lib/mail/sender";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { signedInUser, testPassword, type SignedInUser } from "../support/users";

vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn(), updateTag: vi.fn() }));

const wrongPassword = "not-the-password-9f3k";
const as = <T>(who: SignedInUser, fn: () => Promise<T>) => withRequestHeaders(who.headers, fn);

let qaLead: SignedInUser;
let qaLeadLimited: SignedInUser;
let engineer: SignedInUser;
let admin: { id: string; name: string };
let batchId: string;
let limitedBatchId: string;
let serial = 0;

async function counts() {
  const db = await getDb();
  const [[decisions], [transitions], [events]] = await Promise.all([
    db.select({ n: count() }).from(lotDecision),
    db.select({ n: count() }).from(flagTransition),
    db.select({ n: count() }).from(auditEvent),
  ]);
  return { decisions: decisions?.n, transitions: transitions?.n, events: events?.n };
}

async function openFlag(): Promise<string> {
  serial += 1;
  const cellSerial = `KP-SIGN-${serial}`;
  await createCell({ serial: cellSerial, batchId }, admin);
  const raised = await raiseFlagByHand({ cellSerial, reason: "Pouch puffed after the last charge" }, { id: engineer.id, name: "Ada Engineer" }, "http://localhost:3000");
  return raised.id;
}

const decide = (who: SignedInUser, fields: { disposition: "accepted" | "rejected" | "on hold"; expected: string; password?: string; meaning?: string; batch?: string }) =>
  as(who, () =>
    decideLotAction({
      batchId: fields.batch ?? batchId,
      disposition: fields.disposition,
      expectedDisposition: fields.expected as "pending",
      reason: "Capability and spread as shown on the page",
      password: fields.password as string,
      meaning: fields.meaning as "approved",
    }),
  );

beforeAll(async () => {
  await installTestDatabase();
  qaLead = await signedInUser("qa-lead", "Quinn Lead");
  qaLeadLimited = await signedInUser("qa-lead", "Rita Lead");
  engineer = await signedInUser("engineer", "Ada Engineer");
  const adminUser = await signedInUser("admin", "Admin");
  admin = { id: adminUser.id, name: "Admin" };
  ({ batchId } = await cellTypeWithBatch(admin, "LOT-SIGN-1"));
  ({ batchId: limitedBatchId } = await cellTypeWithBatch(admin, "LOT-SIGN-2"));
});

afterEach(() => {
  vi.restoreAllMocks();
});

afterAll(async () => {
  await stopOutboxSender();
  await removeTestDatabase();
});

describe("signing a lot decision", () => {
  it("with the right password records the signer's name, the time and the meaning, on the record and in its audit event", async () => {
    const before = Date.now();
    const result = await decide(qaLead, { disposition: "on hold", expected: "pending", password: testPassword, meaning: "reviewed" });
    const after = Date.now();
    expect(result).toMatchObject({ ok: true, data: { disposition: "on hold", signature: { signerName: "Quinn Lead", meaning: "reviewed" } } });

    const [decision] = await listLotDecisions(batchId);
    expect(decision?.signature).toMatchObject({ signerName: "Quinn Lead", meaning: "reviewed" });
    const signedAt = decision?.signature?.signedAt.getTime() ?? NaN;
    expect(signedAt).toBeGreaterThanOrEqual(before);
    expect(signedAt).toBeLessThanOrEqual(after);
    // The signature and the decision are one act: the same instant.
    expect(signedAt).toBe(decision?.decidedAt.getTime());

    const db = await getDb();
    const [row] = await db.select({ signedBy: lotDecision.signedBy }).from(lotDecision).where(eq(lotDecision.batchId, batchId));
    expect(row?.signedBy).toBe(qaLead.id);
    const [event] = await db.select({ after: auditEvent.after }).from(auditEvent).where(eq(auditEvent.action, "lot decision"));
    expect(event?.after).toMatchObject({ signature: { signerId: qaLead.id, signerName: "Quinn Lead", meaning: "reviewed", signedAt: new Date(signedAt).toISOString() } });
  });

  it("shows the signature as name, ISO time and meaning", async () => {
    const [decision] = await listLotDecisions(batchId);
    if (!decision?.signature) throw new Error("no signature");
    const line = signatureManifest(decision.signature);
    expect(line).toMatch(/^Signed by Quinn Lead, \d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}Z, meaning: reviewed$/);
    expect(new Date(line.split(", ")[1] ?? "").getTime()).toBe(Math.floor(decision.signature.signedAt.getTime() / 1000) * 1000);
  });

  it("with a wrong password refuses with a field error on the password and writes nothing", async () => {
    const logged = [vi.spyOn(console, "error"), vi.spyOn(console, "warn"), vi.spyOn(console, "log"), vi.spyOn(console, "info")];
    const before = await counts();
    const result = await decide(qaLead, { disposition: "accepted", expected: "on hold", password: wrongPassword, meaning: "approved" });
    expect(result).toEqual({ ok: false, status: 400, error: `${wrongPasswordMessage}.`, fieldErrors: { password: [wrongPasswordMessage] } });
    expect(await counts()).toEqual(before);
    expect((await getBatch(batchId))?.disposition).toBe("on hold");
    // Never echoed back and never logged.
    expect(JSON.stringify(result)).not.toContain(wrongPassword);
    for (const spy of logged) expect(JSON.stringify(spy.mock.calls)).not.toContain(wrongPassword);
  });

  it("refuses a decision without a signature, with a meaning that contradicts it, or with an overlong password", async () => {
    const before = await counts();
    const unsigned = await decide(qaLead, { disposition: "accepted", expected: "on hold" });
    expect(unsigned).toMatchObject({ ok: false, status: 400, fieldErrors: { password: expect.any(Array), meaning: expect.any(Array) } });
    const contradicting = await decide(qaLead, { disposition: "accepted", expected: "on hold", password: testPassword, meaning: "rejected" });
    expect(contradicting).toMatchObject({ ok: false, status: 400, fieldErrors: { meaning: ["A lot accepted cannot be signed as rejected"] } });
    const overlong = "x".repeat(129);
    const tooLong = await decide(qaLead, { disposition: "accepted", expected: "on hold", password: overlong, meaning: "approved" });
    expect(tooLong).toMatchObject({ ok: false, status: 400, fieldErrors: { password: ["A password has at most 128 characters"] } });
    expect(JSON.stringify(tooLong)).not.toContain(overlong);
    expect(await counts()).toEqual(before);
  });

  it("pauses signing for a signer after repeated wrong passwords, with a 429, and only for that signer", async () => {
    const { max } = signatureAttemptLimit;
    for (let i = 0; i < max; i += 1) {
      const wrong = await decide(qaLeadLimited, { disposition: "accepted", expected: "pending", password: `${wrongPassword}-${i}`, meaning: "approved", batch: limitedBatchId });
      expect(wrong).toMatchObject({ ok: false, status: 400, fieldErrors: { password: [wrongPasswordMessage] } });
    }
    const before = await counts();
    // Even the right password waits: the pause is what makes guessing slow.
    const paused = await decide(qaLeadLimited, { disposition: "accepted", expected: "pending", password: testPassword, meaning: "approved", batch: limitedBatchId });
    expect(paused).toMatchObject({ ok: false, status: 429 });
    expect(paused.ok ? "" : paused.error).toMatch(/^Too many wrong passwords: signing is paused for your account for 10 minutes\. Nothing was signed\.$/);
    expect(await counts()).toEqual(before);
    expect((await getBatch(limitedBatchId))?.disposition).toBe("pending");
    // Another signer is not held up.
    expect(await decide(qaLead, { disposition: "accepted", expected: "on hold", password: testPassword, meaning: "approved" })).toMatchObject({ ok: true });
  });
});

describe("the failure window", () => {
  it("counts failures per key within the window and lets the key try again once the oldest expires", () => {
    const limiter = createFailureLimiter({ max: 3, windowMs: 1000 });
    limiter.fail("a", 0);
    limiter.fail("a", 100);
    expect(limiter.blockedFor("a", 200)).toBe(0);
    limiter.fail("a", 200);
    // Three failures at 0, 100, 200: blocked until the one at 0 leaves the window at 1000.
    expect(limiter.blockedFor("a", 300)).toBe(700);
    expect(limiter.blockedFor("b", 300)).toBe(0);
    expect(limiter.blockedFor("a", 1000)).toBe(0);
    limiter.clear("a");
    expect(limiter.blockedFor("a", 300)).toBe(0);
  });
});

describe("who may sign", () => {
  it("checks the signer's own password, not another account's", async () => {
    const other = await createUserAccount({ name: "Sam Lead", email: "sam-lead@lab.test", password: "sams-own-long-password", role: "qa-lead" }, null);
    await expect(verifySignature(other.id, testPassword)).rejects.toMatchObject({ code: "bad-request", fieldErrors: { password: [wrongPasswordMessage] } });
    expect(await verifySignature(other.id, "sams-own-long-password")).toEqual({ signerId: other.id, signerName: "Sam Lead" });
  });

  it("refuses a banned account until its ban has expired", async () => {
    const banned = await createUserAccount({ name: "Bo Lead", email: "bo-lead@lab.test", password: testPassword, role: "qa-lead" }, null);
    const db = await getDb();
    await db.update(user).set({ banned: true, banExpires: null }).where(eq(user.id, banned.id));
    await expect(verifySignature(banned.id, testPassword)).rejects.toMatchObject({ code: "forbidden" });
    await db.update(user).set({ banned: true, banExpires: new Date(Date.now() - 60_000) }).where(eq(user.id, banned.id));
    expect(await verifySignature(banned.id, testPassword)).toEqual({ signerId: banned.id, signerName: "Bo Lead" });
  });

  it("refuses an account with no password to sign with", async () => {
    const db = await getDb();
    const id = "no-credential-user";
    await db.insert(user).values({ id, name: "No Password", email: "no-password@lab.test", role: "qa-lead" });
    await expect(verifySignature(id, testPassword)).rejects.toMatchObject({ code: "bad-request", fieldErrors: { password: [wrongPasswordMessage] } });
  });
});

describe("signing the clearing of a flag", () => {
  it("with the right password clears it and records name, time and meaning in the history and the audit event", async () => {
    const flagId = await openFlag();
    const result = await as(engineer, () =>
      transitionFlagAction({ flagId, to: "cleared", expectedState: "open", reason: "Puffing was the label lifting", password: testPassword, meaning: "reviewed" }),
    );
    expect(result).toMatchObject({ ok: true, data: { state: "cleared", signature: { signerName: "Ada Engineer", meaning: "reviewed" } } });
    const detail = await getFlagDetail(flagId);
    const clearing = detail?.transitions.at(-1);
    expect(clearing).toMatchObject({ toState: "cleared", signature: { signerName: "Ada Engineer", meaning: "reviewed" } });
    expect(clearing?.signature?.signedAt.getTime()).toBe(clearing?.at.getTime());
    // The opening step needed no signature and has none.
    expect(detail?.transitions[0]?.signature).toBeNull();

    const db = await getDb();
    const events = await db.select({ after: auditEvent.after }).from(auditEvent).where(eq(auditEvent.entityId, flagId));
    expect(events.map((e) => e.after)).toContainEqual({
      state: "cleared",
      reason: "Puffing was the label lifting",
      signature: { signerId: engineer.id, signerName: "Ada Engineer", meaning: "reviewed", signedAt: clearing?.at.toISOString() },
    });
  });

  it("with a wrong password refuses and writes nothing", async () => {
    const flagId = await openFlag();
    const before = await counts();
    const result = await as(engineer, () =>
      transitionFlagAction({ flagId, to: "cleared", expectedState: "open", reason: "Looked fine", password: wrongPassword, meaning: "reviewed" }),
    );
    expect(result).toMatchObject({ ok: false, status: 400, fieldErrors: { password: [wrongPasswordMessage] } });
    expect(await counts()).toEqual(before);
    expect((await getFlagDetail(flagId))?.state).toBe("open");
  });

  it("without a signature is refused with a 400, by the action and by the database layer", async () => {
    const flagId = await openFlag();
    const before = await counts();
    const unsigned = await as(engineer, () => transitionFlagAction({ flagId, to: "cleared", expectedState: "open", reason: "Looked fine" }));
    expect(unsigned).toMatchObject({ ok: false, status: 400, fieldErrors: { password: expect.any(Array), meaning: expect.any(Array) } });
    const blank = await as(engineer, () => transitionFlagAction({ flagId, to: "cleared", expectedState: "open", reason: "Looked fine", password: "", meaning: "" as "reviewed" }));
    expect(blank).toMatchObject({ ok: false, status: 400, fieldErrors: { password: expect.any(Array), meaning: expect.any(Array) } });
    const direct = transitionFlag({ flagId, to: "cleared", expectedState: "open", reason: "Looked fine" }, { id: engineer.id, name: "Ada Engineer" });
    await expect(direct).rejects.toBeInstanceOf(AppError);
    await expect(direct).rejects.toMatchObject({ status: 400 });
    expect(await counts()).toEqual(before);
    expect((await getFlagDetail(flagId))?.state).toBe("open");
  });

  it("leaves the other steps unsigned, even when a password is sent along", async () => {
    const flagId = await openFlag();
    expect(await as(engineer, () => transitionFlagAction({ flagId, to: "acknowledged", expectedState: "open", reason: "Set aside" }))).toMatchObject({
      ok: true,
      data: { state: "acknowledged", signature: null },
    });
    // A wrong password on a step that needs no signature is not checked and not recorded.
    expect(
      await as(engineer, () => transitionFlagAction({ flagId, to: "retest requested", expectedState: "acknowledged", reason: "Repeat at 0.2C", password: wrongPassword, meaning: "reviewed" })),
    ).toMatchObject({ ok: true, data: { signature: null } });
    expect(await as(engineer, () => transitionFlagAction({ flagId, to: "cell retired", expectedState: "retest requested", reason: "Swollen; scrapped per lab procedure" }))).toMatchObject({
      ok: true,
    });
    expect((await getFlagDetail(flagId))?.transitions.map((t) => t.signature)).toEqual([null, null, null, null]);
  });
});

describe("the stored records", () => {
  it("never hold the password: not in the audit trail, the decisions or the flag history", async () => {
    const db = await getDb();
    const signedEvents = await db.select({ after: auditEvent.after }).from(auditEvent).where(sql`${auditEvent.after} ? 'signature'`);
    // Signed events exist (so the search below looks at real signatures), and none carries a password.
    expect(signedEvents.length).toBeGreaterThanOrEqual(3);
    for (const table of [auditEvent, lotDecision, flagTransition]) {
      // A whole-row reference cast to text: every column of every row.
      const rows = await db.select({ t: sql<string>`${table}::text` }).from(table);
      expect(rows.length).toBeGreaterThan(0);
      const text = rows.map((r) => r.t).join("\n");
      expect(text).not.toContain(testPassword);
      expect(text).not.toContain(wrongPassword);
    }
    expect(JSON.stringify(signedEvents)).not.toMatch(/password/i);
  });

  it("keeps a signature whole in the database: a meaning without a name or time is refused", async () => {
    const db = await getDb();
    const [anyFlag] = await db.select({ id: flag.id }).from(flag).limit(1);
    await expect(
      db.insert(flagTransition).values({ flagId: anyFlag?.id ?? "", fromState: "open", toState: "acknowledged", reason: "x", actorName: "x", signatureMeaning: "reviewed" }),
    ).rejects.toThrow();
    await expect(
      db.execute(sql`insert into lot_decision (batch_id, from_disposition, disposition, reason, decided_by_name, signed_by_name, signed_at, signature_meaning)
        values (${batchId}, 'pending', 'accepted', 'x', 'x', 'x', now(), 'signed off')`),
    ).rejects.toThrow();
  });
});
