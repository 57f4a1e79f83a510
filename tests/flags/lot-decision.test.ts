/**
 * Lot decisions: QA leads only (checked on the server), recorded append-only with who, when, why
 * and the capability figures computed on the server; the batch's disposition and the audit event
 * change in the same transaction.
 */
import { eq, isNotNull, sql } from "drizzle-orm";
import { mean, sampleStandardDeviation } from "simple-statistics";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { decideLotAction } from "@/app/(lab)/batches/[batchId]/quality/actions";
import { withRequestHeaders } from "@/lib/auth/request-headers";
import { getDb } from "@/lib/db/client";
import { raiseFlagByHand } from "@/lib/db/queries/flags";
import { getBatchQuality, listLotDecisions } from "@/lib/db/queries/quality";
import { createCell, getBatch } from "@/lib/db/queries/registry";
import { auditEvent, lotDecision, runCycle } from "@/lib/db/schema";
import { stopOutboxSender } from "@/lib/mail/sender";
import { storeAnalysedRun } from "../support/analysed-runs";
import { capacityCheckCsv } from "../support/bench-logs";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { signedInUser, testPassword, type SignedInUser } from "../support/users";

vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn(), updateTag: vi.fn() }));

let qaLead: SignedInUser;
let others: SignedInUser[];
let batchId: string;
const serials = ["KP-LOT-1", "KP-LOT-2", "KP-LOT-3", "KP-LOT-4"];

beforeAll(async () => {
  await installTestDatabase();
  qaLead = await signedInUser("qa-lead", "Quinn Lead");
  const admin = await signedInUser("admin", "Admin");
  others = [await signedInUser("engineer"), await signedInUser("technician"), admin];
  const actor = { id: admin.id, name: "Admin" };
  ({ batchId } = await cellTypeWithBatch(actor, "LOT-DECIDE-1"));
  for (const [i, serial] of serials.entries()) {
    await createCell({ serial, batchId }, actor);
    await storeAnalysedRun(actor, { serial, csv: capacityCheckCsv(20 + i), purpose: "capacity check" });
  }
});

afterAll(async () => {
  await stopOutboxSender();
  await removeTestDatabase();
});

const meaningOf = { accepted: "approved", rejected: "rejected", "on hold": "reviewed" } as const;
const decide = (who: SignedInUser, disposition: "accepted" | "rejected" | "on hold", expectedDisposition: string, reason = "Capability and spread as shown") =>
  withRequestHeaders(who.headers, () =>
    decideLotAction({ batchId, disposition, expectedDisposition: expectedDisposition as "pending", reason, password: testPassword, meaning: meaningOf[disposition] }),
  );

describe("lot decisions", () => {
  it("computes the batch figures from the stored analyses by the handbook formulas", async () => {
    const db = await getDb();
    // Each capacity check's measurement: the discharge of its one full (charge then discharge) cycle as stored by the ingest.
    const stored = await db
      .select({ mAh: runCycle.dischargedMah })
      .from(runCycle)
      .where(isNotNull(runCycle.chargedMah));
    expect(stored).toHaveLength(4);
    const values = stored.map((s) => s.mAh ?? NaN);
    const quality = await getBatchQuality(batchId);
    expect(quality?.delivered.map((d) => d.serial).sort()).toEqual(serials);
    const m = mean(values);
    const s = sampleStandardDeviation(values);
    expect(quality?.report.summary?.mean).toBeCloseTo(m, 6);
    expect(quality?.report.summary?.sd).toBeCloseTo(s, 6);
    // One-sided capability against the lower limit only, Cpl = (mean − LSL)/(3s): NIST/SEMATECH e-Handbook §6.1.6.
    expect(quality?.report.capability).toMatchObject({ index: "Cpl" });
    expect(quality?.report.capability?.value).toBeCloseTo((m - 950) / (3 * s), 6);
  });

  it("refuses every role but QA lead, on the server", async () => {
    for (const who of others) expect(await decide(who, "accepted", "pending")).toMatchObject({ ok: false, status: 403 });
    expect((await getBatch(batchId))?.disposition).toBe("pending");
    expect(await listLotDecisions(batchId)).toEqual([]);
  });

  it("records the decision with who, when, why and the figures, and sets the disposition with an audit event", async () => {
    const result = await decide(qaLead, "on hold", "pending", "Waiting for the supplier's formation records");
    expect(result).toMatchObject({ ok: true, data: { disposition: "on hold" } });
    expect((await getBatch(batchId))?.disposition).toBe("on hold");
    const [decision] = await listLotDecisions(batchId);
    expect(decision).toMatchObject({ fromDisposition: "pending", disposition: "on hold", decidedByName: "Quinn Lead", reason: "Waiting for the supplier's formation records" });
    expect(decision?.signature).toMatchObject({ signerName: "Quinn Lead", meaning: "reviewed" });
    expect(decision?.figures).toMatchObject({ n: 4, unmeasured: 0, lsl_mAh: 950, usl_mAh: null, capability: { index: "Cpl" } });
    expect(Date.now() - (decision?.decidedAt.getTime() ?? 0)).toBeGreaterThanOrEqual(0);

    const db = await getDb();
    const audit = await db.select({ action: auditEvent.action, before: auditEvent.before, after: auditEvent.after }).from(auditEvent).where(eq(auditEvent.entityId, batchId));
    expect(audit.filter((a) => a.action === "lot decision")).toEqual([
      {
        action: "lot decision",
        before: { disposition: "pending" },
        after: {
          disposition: "on hold",
          reason: "Waiting for the supplier's formation records",
          lotCode: "LOT-DECIDE-1",
          signature: { signerId: qaLead.id, signerName: "Quinn Lead", signedAt: decision?.signature?.signedAt.toISOString(), meaning: "reviewed" },
        },
      },
    ]);
  });

  it("refuses a stale or repeated decision and keeps every decision", async () => {
    expect(await decide(qaLead, "accepted", "pending")).toMatchObject({ ok: false, status: 409 });
    expect(await decide(qaLead, "on hold", "on hold")).toMatchObject({ ok: false, status: 409 });
    expect(await decide(qaLead, "accepted", "on hold", "Records received; capability acceptable")).toMatchObject({ ok: true });
    expect((await listLotDecisions(batchId)).map((d) => [d.fromDisposition, d.disposition])).toEqual([
      ["on hold", "accepted"],
      ["pending", "on hold"],
    ]);
    const noReason = await decide(qaLead, "rejected", "accepted", "");
    expect(noReason).toMatchObject({ ok: false, status: 400, fieldErrors: { reason: expect.any(Array) } });

    const db = await getDb();
    await expect(db.update(lotDecision).set({ reason: "rewritten" }).where(eq(lotDecision.batchId, batchId))).rejects.toThrow();
    await expect(db.execute(sql`delete from lot_decision`)).rejects.toThrow();
    expect(await listLotDecisions(batchId)).toHaveLength(2);
  });

  it("groups matched sets from active cells only: a flagged cell stays out of a pack", async () => {
    const before = await getBatchQuality(batchId, { setSize: 2, capacityTolerance_pct: 50, dcirTolerance_pct: null });
    const grouped = (q: typeof before) => (q?.matching && "sets" in q.matching ? q.matching.sets.flatMap((set) => set.serials).sort() : []);
    expect(grouped(before)).toEqual(serials);
    await raiseFlagByHand({ cellSerial: "KP-LOT-2", reason: "Dent in the pouch" }, { id: others[0]?.id ?? "", name: "Test engineer" }, "http://localhost:3000");
    const after = await getBatchQuality(batchId, { setSize: 2, capacityTolerance_pct: 50, dcirTolerance_pct: null });
    expect(after?.flaggedSerials).toEqual(["KP-LOT-2"]);
    expect(grouped(after)).not.toContain("KP-LOT-2");
    expect(after?.report.summary?.n).toBe(4);
  });
});
