import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { importSerialsAction } from "@/app/(lab)/batches/[batchId]/actions";
import { createCellAction } from "@/app/(lab)/cells/actions";
import { withRequestHeaders } from "@/lib/auth/request-headers";
import { getCellBySerial, listCells } from "@/lib/db/queries/registry";
import { cellListQuery } from "@/lib/validations/registry";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { auditOf, formData } from "../support/form";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { signedInUser, type SignedInUser } from "../support/users";

vi.mock("next/cache", () => ({ revalidatePath: vi.fn() }));

let tech: SignedInUser;
let batchId: string;
let cellTypeId: string;
let otherBatchId: string;

beforeAll(async () => {
  await installTestDatabase();
  tech = await signedInUser("technician");
  ({ batchId, cellTypeId } = await cellTypeWithBatch({ id: tech.id, name: "Tech" }, "LOT-C1"));
  ({ batchId: otherBatchId } = await cellTypeWithBatch({ id: tech.id, name: "Tech" }, "LOT-C2"));
});
afterAll(removeTestDatabase);

const asTech = <T>(fn: () => Promise<T>) => withRequestHeaders(tech.headers, fn);
const cellsOf = async (id: string) => (await listCells(cellListQuery.parse({ batchId: id, pageSize: 200 }))).items.map((c) => c.serial).sort();

describe("createCellAction", () => {
  it("refuses a serial with spaces or markup with 400 on the serial field", async () => {
    for (const serial of ["C1 0001", "<b>C1</b>", "-C1", ""]) {
      const result = await asTech(() => createCellAction(formData({ serial, batchId, cellTypeId: "" })));
      expect(result).toMatchObject({ ok: false, status: 400 });
      if (!result.ok) expect(Object.keys(result.fieldErrors ?? {})).toEqual(["serial"]);
    }
  });

  it("refuses a cell with neither batch nor cell type, and a batch id that is not a uuid, with 400", async () => {
    expect(await asTech(() => createCellAction(formData({ serial: "C1-0001", batchId: "", cellTypeId: "" })))).toMatchObject({
      ok: false,
      status: 400,
      fieldErrors: { batchId: [expect.any(String)] },
    });
    expect(await asTech(() => createCellAction(formData({ serial: "C1-0001", batchId: "LOT-C1" })))).toMatchObject({
      ok: false,
      status: 400,
      fieldErrors: { batchId: ["Choose a batch"] },
    });
  });

  it("registers a cell in a batch, takes the batch's cell type and records an audit event", async () => {
    const result = await asTech(() => createCellAction(formData({ serial: "C1-0001", batchId, cellTypeId: "" })));
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(await getCellBySerial("c1-0001")).toMatchObject({ serial: "C1-0001", batchId, cellTypeId, status: "active", lotCode: "LOT-C1" });
    expect(await auditOf("cell", result.data.id)).toMatchObject([{ action: "create", actorId: tech.id, after: { serial: "C1-0001", batchId } }]);
  });

  it("registers a loose cell by its cell type alone", async () => {
    const result = await asTech(() => createCellAction(formData({ serial: "LOOSE-1", batchId: "", cellTypeId })));
    expect(result.ok).toBe(true);
    expect(await getCellBySerial("LOOSE-1")).toMatchObject({ batchId: null, cellTypeId });
  });

  it("refuses the same serial in other letter case with 409 on the serial field", async () => {
    const result = await asTech(() => createCellAction(formData({ serial: "c1-0001", batchId: otherBatchId })));
    expect(result).toMatchObject({ ok: false, status: 409, fieldErrors: { serial: ["This serial is registered already"] } });
  });
});

describe("importSerialsAction", () => {
  it("refuses an invalid serial with 400 keyed by its place in the list", async () => {
    const result = await asTech(() => importSerialsAction({ batchId, serials: ["C1-0100", "C1 0101", "C1-0102"] }));
    expect(result).toMatchObject({ ok: false, status: 400 });
    if (!result.ok) expect(Object.keys(result.fieldErrors ?? {})).toEqual(["serials.1"]);
    expect(await cellsOf(batchId)).toEqual(["C1-0001"]);
  });

  it("refuses an empty list and a missing batch id with 400", async () => {
    const result = await asTech(() => importSerialsAction({ batchId: "", serials: [] }));
    expect(result).toMatchObject({ ok: false, status: 400 });
    if (!result.ok) expect(Object.keys(result.fieldErrors ?? {}).sort()).toEqual(["batchId", "serials"]);
  });

  it("answers 404 for a batch that does not exist", async () => {
    const result = await asTech(() => importSerialsAction({ batchId: "00000000-0000-4000-8000-000000000000", serials: ["X-1"] }));
    expect(result).toMatchObject({ ok: false, status: 404 });
  });

  it("registers the whole list and writes one audit event per cell", async () => {
    const serials = ["C1-0002", "C1-0003", "C1-0004"];
    const result = await asTech(() => importSerialsAction({ batchId, serials }));
    expect(result).toEqual({ ok: true, data: { created: 3 } });
    expect(await cellsOf(batchId)).toEqual(["C1-0001", "C1-0002", "C1-0003", "C1-0004"]);
    const cell = await getCellBySerial("C1-0003");
    expect(await auditOf("cell", cell?.id ?? "")).toMatchObject([{ action: "import", actorId: tech.id, after: { serial: "C1-0003", batchId } }]);
  });

  it("refuses a list with registered or repeated serials with 409, names each place and registers none", async () => {
    const result = await asTech(() =>
      importSerialsAction({ batchId: otherBatchId, serials: ["C2-0001", "c1-0002", "C2-0002", "C2-0001"] }),
    );
    expect(result).toMatchObject({
      ok: false,
      status: 409,
      fieldErrors: { "serials.1": ["Already registered"], "serials.3": ["Repeats entry 1 of the list"] },
    });
    if (!result.ok) expect(Object.keys(result.fieldErrors ?? {}).sort()).toEqual(["serials.1", "serials.3"]);
    expect(await cellsOf(otherBatchId)).toEqual([]);
  });
});
