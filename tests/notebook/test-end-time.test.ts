/**
 * A run's stated test end: fade points take their dates from it (less the time from the
 * discharge's end to the log's end) and count cycles in the order the tests ran, not the order
 * the logs were uploaded; a run without one falls back to its upload time.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getCellHealth } from "@/lib/db/queries/fade";
import { getRunHeader } from "@/lib/db/queries/run-views";
import { createCell } from "@/lib/db/queries/registry";
import { capacityCheckOf, storeAnalysedRun } from "../support/analysed-runs";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { signedInUser } from "../support/users";

const later = new Date("2026-11-20T14:00:00Z");
const earlier = new Date("2026-11-05T09:00:00Z");
let firstUploaded: string;
let secondUploaded: string;
let unstated: string;

beforeAll(async () => {
  await installTestDatabase();
  const admin = await signedInUser("admin");
  const actor = { id: admin.id, name: "Ada Admin" };
  const { batchId } = await cellTypeWithBatch(actor, "LOT-WHEN-1");
  await createCell({ serial: "KP-WHEN-1", batchId }, actor);
  await createCell({ serial: "KP-WHEN-2", batchId }, actor);
  // Uploaded first, tested last: the later, faded measurement.
  ({ runId: firstUploaded } = await storeAnalysedRun(actor, { serial: "KP-WHEN-1", csv: capacityCheckOf(900, 1), purpose: "capacity check", testEndedAt: later }));
  ({ runId: secondUploaded } = await storeAnalysedRun(actor, { serial: "KP-WHEN-1", csv: capacityCheckOf(1000, 2), purpose: "capacity check", testEndedAt: earlier }));
  ({ runId: unstated } = await storeAnalysedRun(actor, { serial: "KP-WHEN-2", csv: capacityCheckOf(1000, 3), purpose: "capacity check" }));
});
afterAll(removeTestDatabase);

describe("the stated end of a test", () => {
  it("orders a cell's capacity points by when the tests ran and dates them from the stated end", async () => {
    const health = await getCellHealth("KP-WHEN-1");
    const points = health?.measurements.capacity ?? [];
    expect(points.map((p) => p.runId)).toEqual([secondUploaded, firstUploaded]);
    expect(points.map((p) => p.cycle)).toEqual([1, 2]);
    // The later test's cell was modelled with less capacity: its point is the lower one.
    expect(points[1]?.capacity_mAh ?? NaN).toBeLessThan(points[0]?.capacity_mAh ?? NaN);
    // Each point is dated at its discharge's end: on or before the stated end, within the log's length (hours).
    for (const [point, end] of [
      [points[0], earlier],
      [points[1], later],
    ] as const) {
      const at = Date.parse(point?.date ?? "");
      expect(at).toBeLessThanOrEqual(end.getTime());
      expect(end.getTime() - at).toBeLessThan(12 * 3_600_000);
    }
  });

  it("keeps the stated end on the run, and falls back to the upload time without one", async () => {
    expect((await getRunHeader(firstUploaded))?.testEndedAt?.toISOString()).toBe(later.toISOString());
    const header = await getRunHeader(unstated);
    expect(header?.testEndedAt).toBeNull();
    const point = (await getCellHealth("KP-WHEN-2"))?.measurements.capacity[0];
    const uploaded = header?.createdAt.getTime() ?? NaN;
    expect(Date.parse(point?.date ?? "")).toBeLessThanOrEqual(uploaded);
    expect(uploaded - Date.parse(point?.date ?? "")).toBeLessThan(12 * 3_600_000);
  });
});
