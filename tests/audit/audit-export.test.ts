/**
 * GET /api/audit/export through its real route handler: the audit page's filters, every event,
 * oldest first, as CSV that a spreadsheet opens safely (OWASP "CSV Injection": a text cell
 * starting with = + - @ is written with a leading '), refused to roles without audit.read.
 */
import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET } from "@/app/api/audit/export/route";
import { auditEventsForExport, listAuditEvents } from "@/lib/db/queries/audit";
import { importSerials } from "@/lib/db/queries/registry";
import { auditEvent } from "@/lib/db/schema";
import { auditExportQuery, auditListQuery } from "@/lib/validations/audit";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { signedInUser, type SignedInUser } from "../support/users";

let qa: SignedInUser;
let technician: SignedInUser;
let engineer: SignedInUser;
const formula = "=HYPERLINK(\"http://evil.example\",\"click\")";

beforeAll(async () => {
  const handle = await installTestDatabase();
  qa = await signedInUser("qa-lead", "Quinn QA");
  technician = await signedInUser("technician", "Tess Tech");
  engineer = await signedInUser("engineer", "Eli Engineer");
  const { batchId } = await cellTypeWithBatch({ id: engineer.id, name: "Eli Engineer" }, "LOT-EXP-1");
  await importSerials(batchId, ["EXP-0001", "EXP-0002"], { id: qa.id, name: "Quinn QA" });
  // An event whose recorded name is a spreadsheet formula, written the way the app writes (insert only).
  await handle.db.insert(auditEvent).values({ actorId: null, actorName: "system", action: "create", entity: "cell type", entityId: "not-a-uuid", after: { name: formula } });
});
afterAll(removeTestDatabase);

async function exportCsv(user: SignedInUser, params: Record<string, string> = {}): Promise<Response> {
  return GET(new Request(`http://localhost:3000/api/audit/export?${new URLSearchParams(params)}`, { headers: user.headers }));
}

/** The CSV's rows; it must start with the UTF-8 byte-order mark (EF BB BF), which Response.text() would hide. */
async function rowsOf(response: Response): Promise<string[][]> {
  const bytes = new Uint8Array(await response.arrayBuffer());
  expect([...bytes.subarray(0, 3)]).toEqual([0xef, 0xbb, 0xbf]);
  return Papa.parse<string[]>(new TextDecoder().decode(bytes), { skipEmptyLines: true }).data;
}

describe("GET /api/audit/export", () => {
  it("sends every event oldest first, the same ones the audit page lists", async () => {
    const response = await exportCsv(qa);
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toBe("text/csv; charset=utf-8");
    expect(response.headers.get("content-disposition")).toMatch(/^attachment; filename="kneepoint-audit-trail-\d{4}-\d{2}-\d{2}\.csv"$/);
    const [header, ...rows] = await rowsOf(response);
    expect(header).toEqual(["Event number", "Time (UTC, ISO 8601)", "Who", "User id", "Action", "Kind of record", "Record id", "Record", "Before (JSON)", "After (JSON)"]);
    const page = await listAuditEvents(auditListQuery.parse({ pageSize: 200 }));
    expect(rows.length).toBe(page.total);
    expect(rows.map((r) => Number(r[0])).sort((a, b) => a - b)).toEqual(page.items.map((e) => e.id).sort((a, b) => a - b));
    const times = rows.map((r) => Date.parse(r[1] ?? ""));
    expect(times).toEqual([...times].sort((a, b) => a - b));
    const imported = rows.find((r) => r[4] === "import" && r[7] === "EXP-0001");
    expect(imported?.[2]).toBe("Quinn QA");
    expect(JSON.parse(imported?.[9] ?? "null")).toMatchObject({ serial: "EXP-0001" });
  });

  it("applies the page's filters", async () => {
    const [, ...rows] = await rowsOf(await exportCsv(qa, { q: "EXP-0002" }));
    expect(rows.map((r) => r[7])).toEqual(["EXP-0002"]);
    const [, ...imports] = await rowsOf(await exportCsv(qa, { action: "import" }));
    expect(imports.map((r) => r[7]).sort()).toEqual(["EXP-0001", "EXP-0002"]);
  });

  it("neutralises a recorded value that a spreadsheet would run as a formula", async () => {
    const row = (await rowsOf(await exportCsv(qa, { entity: "cell type" }))).find((r) => r[6] === "not-a-uuid");
    expect(row?.[7]).toBe(`'${formula}`);
  });

  it("refuses roles that may not read the trail, and a reversed date range", async () => {
    expect((await exportCsv(technician)).status).toBe(403);
    expect((await exportCsv(engineer)).status).toBe(403);
    const reversed = await exportCsv(qa, { since: "2026-03-02T00:00:00Z", until: "2026-03-01T00:00:00Z" });
    expect(reversed.status).toBe(400);
  });

  it("answers nothing rather than a cut-off list when the events exceed the limit", async () => {
    const all = await auditEventsForExport(auditExportQuery.parse({}), 1000);
    expect(all?.length).toBeGreaterThan(2);
    expect(await auditEventsForExport(auditExportQuery.parse({}), 2)).toBeNull();
  });
});
