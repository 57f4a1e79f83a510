import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { listCellsNearingEndOfLife, listRecentUploadsBy } from "@/lib/db/queries/overview";
import { createCell } from "@/lib/db/queries/registry";
import { capacityCheckOf, storeAnalysedRun } from "../support/analysed-runs";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { signedInUser } from "../support/users";

let tech: { id: string; name: string };

beforeAll(async () => {
  await installTestDatabase();
  const user = await signedInUser("technician");
  tech = { id: user.id, name: "Tech" };
  const { batchId } = await cellTypeWithBatch(tech, "LOT-START-1");
  for (const serial of ["ST-WORN", "ST-FINE"]) await createCell({ serial, batchId }, tech);
  // The test cell type is rated 1000 mAh; a model capacity of 700 mAh is far below 80 % of rated.
  await storeAnalysedRun(tech, { serial: "ST-WORN", csv: capacityCheckOf(700, 5), purpose: "capacity check" });
  await storeAnalysedRun(tech, { serial: "ST-FINE", csv: capacityCheckOf(1000, 6), purpose: "capacity check" });
});
afterAll(removeTestDatabase);

describe("the start page's work lists", () => {
  it("lists a technician's own uploads, newest first, with the delivered capacity", async () => {
    const uploads = await listRecentUploadsBy(tech.id);
    expect(uploads.map((u) => u.serial)).toEqual(["ST-FINE", "ST-WORN"]);
    expect(uploads.every((u) => u.status === "complete")).toBe(true);
    expect(uploads[1]?.dischargedMah).toBeGreaterThan(600);
    expect(await listRecentUploadsBy("someone-else")).toEqual([]);
  });

  it("lists only cells whose latest delivered capacity is within five points of end of life", async () => {
    const near = await listCellsNearingEndOfLife(0.8);
    expect(near.map((c) => c.serial)).toEqual(["ST-WORN"]);
    const worn = near[0];
    if (!worn) throw new Error("no row");
    // SOH = delivered / rated (domain notes, "End of life and fade").
    expect(worn.soh).toBeCloseTo(worn.latestMah / 1000, 10);
    expect(worn.soh).toBeLessThan(0.85);
  });
});
