/**
 * Several app processes on one PostgreSQL server: a process analysing a run holds a lease on it
 * (renewed while it works). Another process's recovery takes over only runs whose lease has run
 * out; the process that lost its lease can no longer renew it or store its late result; a
 * process alone on its database (PGlite's directory lock) takes every interrupted run at start.
 * Runs here against PGlite and, in CI, against a PostgreSQL server (`npm run test:pg`).
 */
import { eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/lib/db/client";
import { claimQueuedRun, failAnalysis, recordRun, recoverInterruptedRuns, releaseClaim, renewLease, type ClaimedRun } from "@/lib/db/queries/runs";
import { createCell } from "@/lib/db/queries/registry";
import { run } from "@/lib/db/schema";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { signedInUser } from "../support/users";

let actor: { id: string; name: string };
let seq = 0;

async function queuedRun(): Promise<string> {
  seq += 1;
  const { runId } = await recordRun(
    {
      cellSerial: "KP-LEASE-1",
      mayCreateCell: false,
      source: "api",
      purpose: "capacity check",
      ambientTempC: null,
      operatorNote: "",
      fileKey: `test/lease-${seq}`,
      fileName: `lease-${seq}.csv`,
      fileSize: 10,
      sha256: String(seq).padStart(64, "0"),
      columnMap: null,
    },
    actor,
  );
  return runId;
}

async function leaseOf(runId: string) {
  const db = await getDb();
  const [row] = await db
    .select({ status: run.status, owner: run.leaseOwner, secondsLeft: sql<number>`extract(epoch from ${run.leaseExpiresAt} - now())`.mapWith(Number) })
    .from(run)
    .where(eq(run.id, runId));
  return row;
}

function claimed(claim: ClaimedRun | null): ClaimedRun {
  if (!claim) throw new Error("the run was not claimed");
  return claim;
}

/** Time passing for a process that stopped renewing: its lease ends a second ago. */
async function expire(runId: string): Promise<void> {
  const db = await getDb();
  await db.update(run).set({ leaseExpiresAt: sql`now() - interval '1 second'` }).where(eq(run.id, runId));
}

beforeAll(async () => {
  await installTestDatabase();
  const admin = await signedInUser("admin");
  actor = { id: admin.id, name: "Ada Admin" };
  const { batchId } = await cellTypeWithBatch(actor, "LOT-LEASE-1");
  await createCell({ serial: "KP-LEASE-1", batchId }, actor);
});
afterAll(removeTestDatabase);

describe("analysis leases", () => {
  it("gives the claiming process a lease of about a minute, which it can renew", async () => {
    const runId = await queuedRun();
    const claim = claimed(await claimQueuedRun(runId, "process A"));
    expect(claim.owner).toBe("process A");
    const held = await leaseOf(runId);
    expect(held).toMatchObject({ status: "analysing", owner: "process A" });
    expect(held?.secondsLeft).toBeGreaterThan(55);
    expect(held?.secondsLeft).toBeLessThanOrEqual(60);
    expect(await renewLease({ runId, owner: "process A" })).toBe(true);
    // Another process cannot renew (or claim) what A holds.
    expect(await renewLease({ runId, owner: "process B" })).toBe(false);
    expect(await claimQueuedRun(runId, "process B")).toBeNull();
    await failAnalysis(claim, { code: "test", message: "done with this run" });
  });

  it("lets another process take over only once the lease has run out; the old holder's result is dropped", async () => {
    const runId = await queuedRun();
    const a = claimed(await claimQueuedRun(runId, "process A"));

    const early = await recoverInterruptedRuns(2, { onlyExpired: true });
    expect(early.requeued).not.toContain(runId);
    expect((await leaseOf(runId))?.status).toBe("analysing");

    await expire(runId);
    const late = await recoverInterruptedRuns(2, { onlyExpired: true });
    expect(late.requeued).toContain(runId);
    expect(late.queued).toContain(runId);
    expect(await leaseOf(runId)).toMatchObject({ status: "queued", owner: null });

    const b = claimed(await claimQueuedRun(runId, "process B"));
    expect(b.attempts).toBe(2);
    // A wakes up: it can neither renew nor store anything for the run B now holds.
    expect(await renewLease({ runId, owner: "process A" })).toBe(false);
    expect(await failAnalysis(a, { code: "late", message: "A's late outcome" })).toBeNull();
    expect(await releaseClaim(a, "A's worker died late", 2)).toBeNull();
    expect(await leaseOf(runId)).toMatchObject({ status: "analysing", owner: "process B" });
    expect(await failAnalysis(b, { code: "test", message: "B's outcome" })).toEqual({ requeue: false });
    expect((await leaseOf(runId))?.status).toBe("failed");
  });

  it("takes every interrupted run when the process holds the database alone", async () => {
    const runId = await queuedRun();
    await claimQueuedRun(runId, "a process that was killed");
    const recovered = await recoverInterruptedRuns(2);
    expect(recovered.requeued).toContain(runId);
    expect(await leaseOf(runId)).toMatchObject({ status: "queued", owner: null });
  });
});
