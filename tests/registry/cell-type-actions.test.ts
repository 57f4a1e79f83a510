import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { createCellTypeAction } from "@/app/(lab)/cell-types/actions";
import { withRequestHeaders } from "@/lib/auth/request-headers";
import { listCellTypes } from "@/lib/db/queries/registry";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { auditOf, formData } from "../support/form";
import { signedInUser, type SignedInUser } from "../support/users";

vi.mock("next/cache", () => ({ revalidatePath: vi.fn() }));

// Values a person would type for a lithium-polymer pouch: 3.7 V nominal, 4.2 V charge limit,
// 3.0 V empty (common practice, no source); C/20 termination and 0–45 °C charging are seen in
// public polymer cell specifications (see /work/shared/notes/domain.md).
const pouch = {
  name: "Pouch 1200 test",
  chemistry: "LiPo",
  ratedCapacityMah: "1200",
  nominalVoltageV: "3,7",
  chargeVoltageLimitV: "4.2",
  dischargeCutoffV: "3.0",
  maxChargeC: "1",
  maxDischargeC: "2",
  terminationC: "0.05",
  chargeTempMinC: "0",
  chargeTempMaxC: "45",
  dischargeTempMinC: "-20",
  dischargeTempMaxC: "60",
  notes: "",
};

let engineer: SignedInUser;

beforeAll(async () => {
  await installTestDatabase();
  engineer = await signedInUser("engineer");
});
afterAll(removeTestDatabase);

const create = (fields: Record<string, string>) => withRequestHeaders(engineer.headers, () => createCellTypeAction(formData(fields)));

describe("createCellTypeAction", () => {
  it("refuses invalid input with 400 and the fields that need attention", async () => {
    const result = await create({ ...pouch, name: "  ", chargeVoltageLimitV: "3.6", terminationC: "twenty", chemistry: "lead" });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.status).toBe(400);
    expect(Object.keys(result.fieldErrors ?? {}).sort()).toEqual(["chemistry", "name", "terminationC"]);
    expect(await listCellTypes()).toHaveLength(0);
  });

  it("refuses a charge limit below the nominal voltage (the cross-field rule)", async () => {
    const result = await create({ ...pouch, chargeVoltageLimitV: "3.6" });
    expect(result).toMatchObject({ ok: false, status: 400, fieldErrors: { chargeVoltageLimitV: [expect.stringContaining("above the nominal")] } });
  });

  it("creates a cell type from form text (decimal comma included) and records who did it", async () => {
    const result = await create(pouch);
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const [stored] = await listCellTypes();
    expect(stored).toMatchObject({ id: result.data.id, name: "Pouch 1200 test", nominalVoltageV: 3.7, terminationC: 0.05, dischargeTempMinC: -20 });
    const trail = await auditOf("cell type", result.data.id);
    expect(trail).toHaveLength(1);
    expect(trail[0]).toMatchObject({ action: "create", actorId: engineer.id, after: { name: "Pouch 1200 test", chargeVoltageLimitV: 4.2 } });
  });

  it("refuses a second cell type of the same name with 409 on the name field", async () => {
    const result = await create({ ...pouch, chemistry: "NMC" });
    expect(result).toMatchObject({ ok: false, status: 409, fieldErrors: { name: ["This name is taken"] } });
    expect(await listCellTypes()).toHaveLength(1);
  });
});
