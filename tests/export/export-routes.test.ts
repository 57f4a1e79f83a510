/** The cells and batches CSV downloads through their route handlers, with real sessions and a real database. */
import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as batchesExport } from "@/app/api/batches/export/route";
import { GET as cellsExport } from "@/app/api/cells/export/route";
import { createBatch, importSerials } from "@/lib/db/queries/registry";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { signedInUser, type SignedInUser } from "../support/users";

let tech: SignedInUser;
let batchA: string;

beforeAll(async () => {
  await installTestDatabase();
  tech = await signedInUser("technician");
  const actor = { id: tech.id, name: "Tess Tech" };
  let cellTypeId: string;
  ({ batchId: batchA, cellTypeId } = await cellTypeWithBatch(actor, "LOT-EXP-A"));
  const { id: batchB } = await createBatch(
    {
      lotCode: "LOT-EXP-B",
      cellTypeId,
      // A supplier name typed by a person is free text: the export must not let it become a formula.
      supplier: "=cmd|' /C calc'!A0",
      receivedOn: "2026-09-15",
      quantity: 4,
      capacityLslMah: 950,
      capacityUslMah: 1050,
      notes: "",
    },
    actor,
  );
  await importSerials(batchA, ["EXP-A-1", "EXP-A-2", "EXP-A-3"], actor);
  await importSerials(batchB, ["EXP-B-1"], actor);
});
afterAll(removeTestDatabase);

async function download(handler: (r: Request) => Promise<Response>, path: string, user: SignedInUser) {
  const response = await handler(new Request(`http://localhost:3000${path}`, { headers: user.headers }));
  const text = await response.text();
  const rows = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ""), { header: true, skipEmptyLines: true }).data;
  return { response, text, rows };
}

describe("GET /api/cells/export", () => {
  it("sends every cell the filters select as a CSV attachment, in the table's order", async () => {
    const { response, rows } = await download(cellsExport, "/api/cells/export?sort=serial&dir=desc", tech);
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toBe("text/csv; charset=utf-8");
    expect(response.headers.get("content-disposition")).toMatch(/^attachment; filename="kneepoint-cells-\d{4}-\d{2}-\d{2}\.csv"$/);
    expect(rows.map((r) => r.Serial)).toEqual(["EXP-B-1", "EXP-A-3", "EXP-A-2", "EXP-A-1"]);
    expect(Object.keys(rows[0] ?? {})).toEqual(["Serial", "Status", "Batch lot code", "Cell type", "Registered at (UTC, ISO 8601)"]);
    expect(rows[0]).toMatchObject({ Status: "active", "Batch lot code": "LOT-EXP-B" });
    expect(rows[0]?.["Registered at (UTC, ISO 8601)"]).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z$/);
  });

  it("applies the table's filters and ignores its paging", async () => {
    const { rows } = await download(cellsExport, `/api/cells/export?batchId=${batchA}&q=A-&page=2&pageSize=1`, tech);
    expect(rows.map((r) => r.Serial)).toEqual(["EXP-A-1", "EXP-A-2", "EXP-A-3"]);
    const bad = await cellsExport(new Request("http://localhost:3000/api/cells/export?status=melted", { headers: tech.headers }));
    expect(bad.status).toBe(400);
  });

  it("is refused without a session", async () => {
    expect((await cellsExport(new Request("http://localhost:3000/api/cells/export"))).status).toBe(401);
  });
});

describe("GET /api/batches/export", () => {
  it("writes plain headings with units, numbers as numbers and formula-like text neutralised", async () => {
    const { response, text, rows } = await download(batchesExport, "/api/batches/export?sort=lotCode&dir=asc", tech);
    expect(response.status).toBe(200);
    expect(response.headers.get("content-disposition")).toMatch(/filename="kneepoint-batches-/);
    expect(Object.keys(rows[0] ?? {})).toEqual([
      "Lot code",
      "Cell type",
      "Supplier",
      "Received on (date)",
      "Cells ordered (count)",
      "Cells registered (count)",
      "Lower capacity limit (mAh)",
      "Upper capacity limit (mAh)",
      "Decision",
    ]);
    expect(rows.map((r) => r["Lot code"])).toEqual(["LOT-EXP-A", "LOT-EXP-B"]);
    expect(rows[1]).toMatchObject({
      Supplier: "'=cmd|' /C calc'!A0",
      "Cells ordered (count)": "4",
      "Cells registered (count)": "1",
      "Lower capacity limit (mAh)": "950",
      "Upper capacity limit (mAh)": "1050",
    });
    expect(rows[0]?.["Upper capacity limit (mAh)"]).toBe("");
    expect(text).toContain(`"'=cmd|' /C calc'!A0"`);
  });

  it("filters by decision", async () => {
    const { rows } = await download(batchesExport, "/api/batches/export?disposition=accepted", tech);
    expect(rows).toEqual([]);
  });
});
