import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { countUsersByRole, listCellTypeCellCounts, listPendingBatches, listRecentCellsBy } from "@/lib/db/queries/overview";
import { createCell, createCellType, importSerials } from "@/lib/db/queries/registry";
import { getDb } from "@/lib/db/client";
import { batch, cell } from "@/lib/db/schema";
import { eq } from "drizzle-orm";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { cellTypeWithBatch, pouchCellType } from "../support/registry-fixtures";
import { signedInUser } from "../support/users";

beforeAll(installTestDatabase);
afterAll(removeTestDatabase);

describe("start page reads", () => {
  it("count, list and group what each role's first screen shows", async () => {
    const tech = await signedInUser("technician", "Tess Tech");
    const other = await signedInUser("technician", "Otto Other");
    const qa = await signedInUser("qa-lead");
    const techActor = { id: tech.id, name: "Tess Tech" };

    // Nothing registered yet: every block has its empty state to show.
    expect(await listRecentCellsBy(tech.id)).toEqual([]);
    expect(await listPendingBatches()).toEqual({ items: [], total: 0 });
    expect(await listCellTypeCellCounts()).toEqual([]);

    const older = await cellTypeWithBatch(techActor, "LOT-OLD", { receivedOn: "2026-09-01", quantity: 4 });
    const newer = await cellTypeWithBatch(techActor, "LOT-NEW", { receivedOn: "2026-11-01", quantity: 6 });
    const { id: spareType } = await createCellType(pouchCellType("Spare type"), techActor);
    await importSerials(older.batchId, ["OLD-1", "OLD-2", "OLD-3"], techActor);
    await createCell({ serial: "NEW-1", batchId: newer.batchId, cellTypeId: undefined }, { id: other.id, name: "Otto Other" });
    const db = await getDb();
    await db.update(cell).set({ status: "flagged" }).where(eq(cell.serial, "OLD-2"));
    await db.update(cell).set({ status: "retired" }).where(eq(cell.serial, "OLD-3"));
    await db.update(batch).set({ disposition: "accepted" }).where(eq(batch.id, newer.batchId));

    const recent = await listRecentCellsBy(tech.id);
    expect(recent.map((c) => c.serial).sort()).toEqual(["OLD-1", "OLD-2", "OLD-3"]);
    expect(recent[0]).toMatchObject({ lotCode: "LOT-OLD", cellTypeName: "Type for LOT-OLD" });
    expect(await listRecentCellsBy(tech.id, 2)).toHaveLength(2);

    const pending = await listPendingBatches();
    expect(pending).toEqual({
      total: 1,
      items: [{ id: older.batchId, lotCode: "LOT-OLD", cellTypeName: "Type for LOT-OLD", receivedOn: "2026-09-01", quantity: 4, registeredCells: 3 }],
    });

    const counts = await listCellTypeCellCounts();
    expect(counts.map(({ name, active, flagged, retired }) => ({ name, active, flagged, retired }))).toEqual([
      { name: "Spare type", active: 0, flagged: 0, retired: 0 },
      { name: "Type for LOT-NEW", active: 1, flagged: 0, retired: 0 },
      { name: "Type for LOT-OLD", active: 1, flagged: 1, retired: 1 },
    ]);
    expect(counts[0]?.id).toBe(spareType);

    expect(qa.role).toBe("qa-lead");
    expect(await countUsersByRole()).toEqual([
      { role: "qa-lead", users: 1 },
      { role: "technician", users: 2 },
    ]);
  });
});
