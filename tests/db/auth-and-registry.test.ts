import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sessionFromHeaders } from "@/lib/auth/session";
import { createBatch, createCell, createCellType, importSerials, listBatches, listCells } from "@/lib/db/queries/registry";
import { batchListQuery, cellListQuery } from "@/lib/validations/registry";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { pouchCellType } from "../support/registry-fixtures";
import { signedInUser } from "../support/users";

beforeAll(async () => {
  await installTestDatabase();
});
afterAll(removeTestDatabase);

const lipo = pouchCellType("Test pouch 1000");

describe("sign-in and registry on a migrated database", () => {
  it("signs a user in and reads the session back with its role", async () => {
    const tech = await signedInUser("technician");
    const session = await sessionFromHeaders(tech.headers);
    expect(session).toMatchObject({ id: tech.id, role: "technician" });
    expect(await sessionFromHeaders(new Headers())).toBeNull();
  });

  it("registers a cell type, a batch and cells, and lists them with filters", async () => {
    const actor = { id: (await signedInUser("engineer")).id, name: "Eng" };
    const { id: cellTypeId } = await createCellType(lipo, actor);
    const { id: batchId } = await createBatch(
      { lotCode: "LOT-A1", cellTypeId, supplier: "Acme", receivedOn: "2026-11-02", quantity: 3, capacityLslMah: 950, capacityUslMah: undefined, notes: "" },
      actor,
    );
    await createCell({ serial: "A1-0001", batchId, cellTypeId: undefined }, actor);
    await expect(createCell({ serial: "a1-0001", batchId, cellTypeId: undefined }, actor)).rejects.toMatchObject({ code: "conflict" });
    const result = await importSerials(batchId, ["A1-0002", "A1-0003", "A1-0002"], actor);
    expect(result).toEqual({ problems: [{ index: 3, serial: "A1-0002", message: "Repeats entry 1 of the list" }] });
    expect(await importSerials(batchId, ["A1-0002", "A1-0003"], actor)).toEqual({ created: 2 });

    const batches = await listBatches(batchListQuery.parse({ q: "lot-a" }));
    expect(batches.total).toBe(1);
    expect(batches.items[0]).toMatchObject({ lotCode: "LOT-A1", registeredCells: 3, disposition: "pending" });
    const cells = await listCells(cellListQuery.parse({ batchId, sort: "serial", dir: "desc", pageSize: 2 }));
    expect(cells.total).toBe(3);
    expect(cells.items.map((c) => c.serial)).toEqual(["A1-0003", "A1-0002"]);
  });
});
