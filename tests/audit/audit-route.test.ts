/**
 * GET /api/audit through its real route handler, real sessions and a real in-memory database:
 * newest first, each filter, paging, labels and links, and who may read it.
 */
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { AuditDiff } from "@/components/audit/audit-diff";
import { GET } from "@/app/api/audit/route";
import type { AuditPage } from "@/lib/db/queries/audit";
import { createCell, importSerials } from "@/lib/db/queries/registry";
import { auditEvent, run } from "@/lib/db/schema";
import type { DatabaseHandle } from "@/lib/db/client";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { signedInUser, type SignedInUser } from "../support/users";

let handle: DatabaseHandle;
let qa: SignedInUser;
let admin: SignedInUser;
let engineer: SignedInUser;
let batchId: string;
let looseCellId: string;

beforeAll(async () => {
  handle = await installTestDatabase();
  qa = await signedInUser("qa-lead", "Quinn QA");
  admin = await signedInUser("admin", "Ada Admin");
  engineer = await signedInUser("engineer", "Eli Engineer");
  const eli = { id: engineer.id, name: "Eli Engineer" };
  ({ batchId } = await cellTypeWithBatch(eli, "LOT-AUD-1"));
  await importSerials(batchId, ["AUD-0001", "AUD-0002", "AUD-0003"], { id: qa.id, name: "Quinn QA" });
  ({ id: looseCellId } = await createCell({ serial: "AUD/LOOSE#1", batchId }, eli));
  // Events with chosen times, written the way the app writes (insert only), for the date filter.
  await handle.db.insert(auditEvent).values([
    { at: new Date("2026-03-01T10:00:00Z"), actorId: null, actorName: "system", action: "analyse", entity: "run", entityId: "run-old-1", after: { status: "complete" } },
    { at: new Date("2026-03-02T23:30:00Z"), actorId: null, actorName: "system", action: "analyse", entity: "run", entityId: "run-old-2", after: { status: "failed" } },
  ]);
});
afterAll(removeTestDatabase);

async function audit(user: SignedInUser, params: Record<string, string> = {}): Promise<AuditPage> {
  const response = await GET(new Request(`http://localhost:3000/api/audit?${new URLSearchParams(params)}`, { headers: user.headers }));
  expect(response.status).toBe(200);
  return (await response.json()) as AuditPage;
}

describe("GET /api/audit", () => {
  it("lists every event newest first, with a total", async () => {
    const page = await audit(qa);
    // 3 accounts + cell type + batch + 3 imported cells + 1 registered cell + 2 runs
    expect(page.total).toBe(11);
    const times = page.items.map((e) => Date.parse(e.at));
    expect(times).toEqual([...times].sort((a, b) => b - a));
    expect(page.items[0]).toMatchObject({ action: "create", entity: "cell", entityId: looseCellId, actorName: "Eli Engineer" });
    expect(page.items.at(-1)).toMatchObject({ entityId: "run-old-1" });
  });

  it("filters by kind of record, action and actor (including the app itself)", async () => {
    const cells = await audit(qa, { entity: "cell" });
    expect(cells.total).toBe(4);
    expect(cells.items.every((e) => e.entity === "cell")).toBe(true);

    const imports = await audit(qa, { action: "import" });
    expect(imports.items.map((e) => e.entityLabel).sort()).toEqual(["AUD-0001", "AUD-0002", "AUD-0003"]);

    const byEli = await audit(qa, { actor: engineer.id });
    expect(byEli.items.map((e) => `${e.action} ${e.entity}`).sort()).toEqual(["create batch", "create cell", "create cell type"]);

    // The test accounts are made without an acting user, like the seed, so they count as the app's own.
    const bySystem = await audit(qa, { actor: "system" });
    expect(bySystem.items.map((e) => `${e.action} ${e.entity}`).sort()).toEqual(["analyse run", "analyse run", "create user", "create user", "create user"]);
    expect(bySystem.items.every((e) => e.actorId === null)).toBe(true);

    const combined = await audit(qa, { entity: "cell", actor: qa.id });
    expect(combined.total).toBe(3);
  });

  it("filters by a date range with an exclusive end", async () => {
    const day = await audit(qa, { since: "2026-03-02T00:00:00Z", until: "2026-03-03T00:00:00Z" });
    expect(day.items.map((e) => e.entityId)).toEqual(["run-old-2"]);
    const upTo = await audit(qa, { until: "2026-03-02T23:30:00Z" });
    expect(upTo.items.map((e) => e.entityId)).toEqual(["run-old-1"]);
    const backwards = await GET(
      new Request("http://localhost:3000/api/audit?since=2026-03-03T00:00:00Z&until=2026-03-02T00:00:00Z", { headers: qa.headers }),
    );
    expect(backwards.status).toBe(400);
    const notADate = await GET(new Request("http://localhost:3000/api/audit?since=yesterday", { headers: qa.headers }));
    expect(notADate.status).toBe(400);
  });

  it("finds records by id, serial or lot code in the free-text box", async () => {
    const bySerial = await audit(qa, { q: "aud-0002" });
    expect(bySerial.items.map((e) => e.entityLabel)).toEqual(["AUD-0002"]);
    const byLot = await audit(qa, { q: "LOT-AUD" });
    expect(byLot.items.map((e) => e.entity)).toEqual(["batch"]);
    const byId = await audit(qa, { q: looseCellId.slice(0, 13) });
    expect(byId.items.map((e) => e.entityId)).toEqual([looseCellId]);
    // "%" and "_" are literal text, not wildcards.
    expect((await audit(qa, { q: "%" })).total).toBe(0);
  });

  it("names and links cells and batches to their pages", async () => {
    const page = await audit(admin, { entity: "cell", q: "LOOSE" });
    expect(page.items[0]).toMatchObject({ entityLabel: "AUD/LOOSE#1", entityHref: "/cells/AUD%2FLOOSE%231" });
    const batchEvent = (await audit(admin, { entity: "batch" })).items[0];
    expect(batchEvent).toMatchObject({ entityLabel: "LOT-AUD-1", entityHref: `/batches/${batchId}` });
    const gone = (await audit(admin, { q: "run-old-1" })).items[0];
    expect(gone).toMatchObject({ entityLabel: null, entityHref: null });
  });

  it("names a stored run by its file name and links its page", async () => {
    // A run row as the ingest path stores it, and its upload event, written directly (insert only).
    const [stored] = await handle.db
      .insert(run)
      .values({ cellId: looseCellId, source: "browser", purpose: "capacity check", fileKey: "k-aud-1", fileName: "<b>bench 4</b>.csv", fileSize: 10, sha256: "0".repeat(64) })
      .returning({ id: run.id });
    const runId = stored?.id ?? "";
    await handle.db.insert(auditEvent).values({ actorId: engineer.id, actorName: "Eli Engineer", action: "upload", entity: "run", entityId: runId, after: { serial: "AUD/LOOSE#1" } });
    const [event] = (await audit(qa, { entity: "run", action: "upload" })).items;
    expect(event).toMatchObject({ entityId: runId, entityLabel: "<b>bench 4</b>.csv", entityHref: `/runs/${runId}` });
    // The cell's serial recorded in the event finds it too: an auditor follows a cell through its runs.
    expect((await audit(qa, { q: "AUD/LOOSE" })).items.map((e) => `${e.action} ${e.entity}`)).toEqual(["upload run", "create cell"]);
  });

  it("pages through the trail", async () => {
    const first = await audit(qa, { pageSize: "4", page: "1" });
    const third = await audit(qa, { pageSize: "4", page: "3" });
    expect(first.items).toHaveLength(4);
    // 11 events from the set-up plus the run's upload event from the test above.
    expect(third.items).toHaveLength(4);
    expect(third.total).toBe(12);
    const fourth = await audit(qa, { pageSize: "4", page: "4" });
    expect(fourth.items).toEqual([]);
    const ids = new Set([...first.items, ...third.items].map((e) => e.id));
    expect(ids.size).toBe(8);
  });

  it("is refused to roles without audit.read and to signed-out requests", async () => {
    const technician = await signedInUser("technician");
    for (const user of [technician, engineer]) {
      const response = await GET(new Request("http://localhost:3000/api/audit", { headers: user.headers }));
      expect(response.status).toBe(403);
    }
    expect((await GET(new Request("http://localhost:3000/api/audit"))).status).toBe(401);
  });
});

describe("the before → after view", () => {
  it("shows markup in recorded values as text", () => {
    const html = renderToStaticMarkup(
      createElement(AuditDiff, { before: { notes: "plain" }, after: { notes: '<img src=x onerror="alert(1)">', name: "<script>alert(2)</script>" } }),
    );
    expect(html).not.toContain("<img");
    expect(html).not.toContain("<script");
    expect(html).toContain("&lt;img src=x onerror=&quot;alert(1)&quot;&gt;");
    expect(html).toContain("&lt;script&gt;alert(2)&lt;/script&gt;");
  });
});
