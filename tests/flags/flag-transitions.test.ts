/**
 * A flag's life through the server actions: raised by hand, stepped through our states with who,
 * when and why recorded; illegal and stale steps refused; roles checked on the server; the
 * history refused any change by the database; the cell's status following its flags.
 */
import { eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { raiseFlagAction, transitionFlagAction } from "@/app/(lab)/flags/actions";
import { withRequestHeaders } from "@/lib/auth/request-headers";
import { getDb } from "@/lib/db/client";
import { getFlagDetail } from "@/lib/db/queries/flags";
import { createCell, getCellBySerial } from "@/lib/db/queries/registry";
import { flagTransition } from "@/lib/db/schema";
import type { FlagState } from "@/lib/flags/vocabulary";
import { stopOutboxSender } from "@/lib/mail/sender";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { signedInUser, testPassword, type SignedInUser } from "../support/users";

vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn(), updateTag: vi.fn() }));

let engineer: SignedInUser;
let other: SignedInUser;
let qaLead: SignedInUser;
let technician: SignedInUser;

const as = <T>(who: SignedInUser, fn: () => Promise<T>) => withRequestHeaders(who.headers, fn);
/** Clearing is signed with the stepper's password (tests/security/e-signature.test.ts covers the signature itself). */
const signed = { password: testPassword, meaning: "reviewed" } as const;

async function raise(serial: string, reason = "Swelling seen at the tab after the last charge") {
  const result = await as(engineer, () => raiseFlagAction({ cellSerial: serial, reason }));
  if (!result.ok) throw new Error(result.error);
  return result.data.id;
}

beforeAll(async () => {
  await installTestDatabase();
  engineer = await signedInUser("engineer", "Ada Engineer");
  other = await signedInUser("engineer", "Ben Engineer");
  qaLead = await signedInUser("qa-lead", "Quinn Lead");
  technician = await signedInUser("technician");
  const admin = await signedInUser("admin");
  const { batchId } = await cellTypeWithBatch({ id: admin.id, name: "Admin" }, "LOT-STEPS-1");
  for (const serial of ["KP-STEP-1", "KP-STEP-2", "KP-STEP-3"]) await createCell({ serial, batchId }, { id: admin.id, name: "Admin" });
});

afterAll(async () => {
  await stopOutboxSender();
  await removeTestDatabase();
});

describe("flag steps", () => {
  it("records who, when and why for every step, and the cell is flagged until the flag closes", async () => {
    const flagId = await raise("KP-STEP-1");
    expect((await getCellBySerial("KP-STEP-1"))?.status).toBe("flagged");

    const steps: [SignedInUser, FlagState, FlagState, string][] = [
      [engineer, "acknowledged", "open", "Seen; the cell is set aside"],
      [other, "retest requested", "acknowledged", "Repeat the capacity check at 0.2C"],
      [engineer, "cleared", "retest requested", "Retest within spec; the swelling was the pouch label"],
    ];
    for (const [who, to, expectedState, reason] of steps) {
      const result = await as(who, () => transitionFlagAction({ flagId, to, expectedState, reason, ...(to === "cleared" ? signed : {}) }));
      expect(result).toMatchObject({ ok: true, data: { id: flagId, state: to } });
    }
    const detail = await getFlagDetail(flagId);
    expect(detail?.state).toBe("cleared");
    expect(detail?.transitions.map((t) => [t.fromState, t.toState, t.actorName, t.reason])).toEqual([
      [null, "open", "Ada Engineer", "Swelling seen at the tab after the last charge"],
      ["open", "acknowledged", "Ada Engineer", "Seen; the cell is set aside"],
      ["acknowledged", "retest requested", "Ben Engineer", "Repeat the capacity check at 0.2C"],
      ["retest requested", "cleared", "Ada Engineer", "Retest within spec; the swelling was the pouch label"],
    ]);
    const times = detail?.transitions.map((t) => t.at.getTime()) ?? [];
    expect([...times].sort((a, b) => a - b)).toEqual(times);
    expect((await getCellBySerial("KP-STEP-1"))?.status).toBe("active");
  });

  it("refuses illegal steps, stale steps and steps without a reason", async () => {
    const flagId = await raise("KP-STEP-2");
    const reopen = await as(engineer, () => transitionFlagAction({ flagId, to: "open", expectedState: "open", reason: "Again" }));
    expect(reopen).toMatchObject({ ok: false, status: 409 });
    const stale = await as(engineer, () => transitionFlagAction({ flagId, to: "cleared", expectedState: "acknowledged", reason: "Looked fine", ...signed }));
    expect(stale).toMatchObject({ ok: false, status: 409 });
    const noReason = await as(engineer, () => transitionFlagAction({ flagId, to: "cleared", expectedState: "open", reason: " ", ...signed }));
    expect(noReason).toMatchObject({ ok: false, status: 400, fieldErrors: { reason: expect.any(Array) } });
    const unknownState = await as(engineer, () => transitionFlagAction({ flagId, to: "closed" as "cleared", expectedState: "open", reason: "Done" }));
    expect(unknownState).toMatchObject({ ok: false, status: 400 });

    expect(await as(engineer, () => transitionFlagAction({ flagId, to: "cleared", expectedState: "open", reason: "Looked fine on a second look", ...signed }))).toMatchObject({ ok: true });
    const afterClose = await as(engineer, () => transitionFlagAction({ flagId, to: "acknowledged", expectedState: "cleared", reason: "Once more" }));
    expect(afterClose).toMatchObject({ ok: false, status: 409 });
    expect((await getFlagDetail(flagId))?.transitions).toHaveLength(2);
  });

  it("lets only engineers raise and step flags", async () => {
    const flagId = await raise("KP-STEP-2", "Second look needed");
    for (const who of [qaLead, technician]) {
      expect(await as(who, () => raiseFlagAction({ cellSerial: "KP-STEP-2", reason: "Looks odd" }))).toMatchObject({ ok: false, status: 403 });
      expect(await as(who, () => transitionFlagAction({ flagId, to: "acknowledged", expectedState: "open", reason: "Seen" }))).toMatchObject({ ok: false, status: 403 });
    }
    expect((await getFlagDetail(flagId))?.state).toBe("open");
    expect(await as(engineer, () => raiseFlagAction({ cellSerial: "KP-NOPE", reason: "No such cell" }))).toMatchObject({ ok: false, status: 404 });
  });

  it("retiring the cell closes all its flags and no new flag can be raised on it", async () => {
    const first = await raise("KP-STEP-3", "Capacity well below its batch");
    const second = await raise("KP-STEP-3", "Resistance up after the last cycle block");
    const retired = await as(engineer, () => transitionFlagAction({ flagId: first, to: "cell retired", expectedState: "open", reason: "Below end of life; scrapped per lab procedure" }));
    expect(retired).toMatchObject({ ok: true, data: { state: "cell retired", closedAlso: 1 } });
    expect((await getCellBySerial("KP-STEP-3"))?.status).toBe("retired");
    const secondDetail = await getFlagDetail(second);
    expect(secondDetail?.state).toBe("cell retired");
    expect(secondDetail?.transitions.at(-1)).toMatchObject({ fromState: "open", toState: "cell retired", actorName: "Ada Engineer" });
    expect(secondDetail?.transitions.at(-1)?.reason).toContain("Below end of life; scrapped per lab procedure");
    expect(await as(engineer, () => raiseFlagAction({ cellSerial: "KP-STEP-3", reason: "One more" }))).toMatchObject({ ok: false, status: 409 });
  });

  it("keeps the history append-only in the database", async () => {
    const db = await getDb();
    const [any] = await db.select({ id: flagTransition.id }).from(flagTransition).limit(1);
    const id = any?.id ?? -1;
    await expect(db.update(flagTransition).set({ reason: "rewritten" }).where(eq(flagTransition.id, id))).rejects.toThrow();
    await expect(db.execute(sql`delete from flag_transition`)).rejects.toThrow();
    const [still] = await db.select({ reason: flagTransition.reason }).from(flagTransition).where(eq(flagTransition.id, id));
    expect(still?.reason).not.toBe("rewritten");
  });
});
