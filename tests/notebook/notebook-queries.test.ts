/**
 * The notebook's reads on real stored analyses: simulated logs through the real engine and the
 * ingest's storage (tests/support/analysed-runs.ts), then the batch table, the cell page's
 * figures and the overlay curves read back and checked against the stored cycles.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { GET as batchCells } from "@/app/api/batches/[batchId]/cells/route";
import { GET as batchCellsCsv } from "@/app/api/batches/[batchId]/cells/export/route";
import { GET as dischargeCurveRoute } from "@/app/api/runs/[id]/discharge-curve/route";
import { getBatchCellRows, getCellNotebook, getRunDischargeCurve } from "@/lib/db/queries/notebook";
import { createCell } from "@/lib/db/queries/registry";
import { getRunDetail } from "@/lib/db/queries/run-views";
import type { BatchCellRow, Page } from "@/lib/notebook/batch-rows";
import { storeAnalysedRun } from "../support/analysed-runs";
import { capacityCheckCsv } from "../support/bench-logs";
import { protocol, simulate, toCsv } from "../support/sim";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { signedInUser, type SignedInUser } from "../support/users";

vi.mock("next/cache", () => ({ revalidatePath: vi.fn() }));

let tech: SignedInUser;
let batchId: string;
const runs: Record<string, string> = {};

/** The stored discharge of a run's last full cycle: what every figure below must reproduce. */
async function storedDelivered(runId: string): Promise<{ mAh: number; ce: number | null }> {
  const detail = await getRunDetail(runId);
  const full = (detail?.cycles ?? []).filter((c) => (c.chargedMah ?? 0) > 0 && (c.dischargedMah ?? 0) > 0);
  const last = full[full.length - 1];
  if (!last?.dischargedMah) throw new Error(`run ${runId} has no full cycle`);
  return { mAh: last.dischargedMah, ce: last.coulombicEfficiency };
}

beforeAll(async () => {
  await installTestDatabase();
  tech = await signedInUser("technician");
  const actor = { id: tech.id, name: "Tech" };
  ({ batchId } = await cellTypeWithBatch(actor, "LOT-NB"));
  for (const serial of ["NB-0001", "NB-0002", "NB-0003", "NB-0004", "NB-0005"]) await createCell({ serial, batchId }, actor);
  runs.a = (await storeAnalysedRun(actor, { serial: "NB-0001", csv: capacityCheckCsv(11), purpose: "capacity check" })).runId;
  runs.bOld = (await storeAnalysedRun(actor, { serial: "NB-0002", csv: capacityCheckCsv(12), purpose: "capacity check" })).runId;
  runs.bNew = (await storeAnalysedRun(actor, { serial: "NB-0002", csv: capacityCheckCsv(13), purpose: "capacity check" })).runId;
  // The demo's invented resistance test: 0.2 It for 10 s, then 1 It for 1 s (IEC 61960-3 §7.7 sequence).
  const pulse = fs.readFileSync(path.join(process.cwd(), "public/demo-logs/PA-0003-internal-resistance.csv"), "utf8");
  runs.d = (await storeAnalysedRun(actor, { serial: "NB-0004", csv: pulse, purpose: "internal resistance" })).runId;
  // Charged to 4.35 V on a type limited to 4.2 V (4.2 V: common practice for polymer cells): an over-voltage finding.
  const over = simulate(protocol().ccCvCharge(0.5, 4.35, 0.05).rest(600).ccDischarge(0.5, 3.0).build(), { ratedCapacity_mAh: 1000, initialSoc: 0.02, logInterval_s: 10, seed: 5 });
  runs.e = (await storeAnalysedRun(actor, { serial: "NB-0005", csv: toCsv(over.samples), purpose: "capacity check" })).runId;
});
afterAll(removeTestDatabase);

const call = async <T>(handler: (r: Request, c: { params: Promise<Record<string, string>> }) => Promise<Response>, url: string, params: Record<string, string>) => {
  const response = await handler(new Request(`http://localhost:3000${url}`, { headers: tech.headers }), { params: Promise.resolve(params) });
  return { status: response.status, body: (response.headers.get("content-type")?.includes("json") ? await response.json() : await response.text()) as T };
};

describe("batch cell rows", () => {
  it("gives each cell the delivered capacity of its newest full cycle, SOH against rated and that cycle's CE", async () => {
    const notebook = await getBatchCellRows(batchId);
    const bySerial = new Map(notebook?.rows.map((r) => [r.serial, r]));
    const a = await storedDelivered(runs.a as string);
    const b = await storedDelivered(runs.bNew as string);
    expect(bySerial.get("NB-0001")).toMatchObject({ runs: 1, deliveredMah: a.mAh, deliveredRunId: runs.a, coulombicEfficiency: a.ce, openFlags: 0 });
    // SOH = 100 · Q_delivered / Q_rated (common practice); the fixture's cell type is rated 1000 mAh.
    expect(bySerial.get("NB-0001")?.sohPercent).toBeCloseTo((100 * a.mAh) / 1000, 9);
    // The newer of two runs stands for the cell.
    expect(bySerial.get("NB-0002")).toMatchObject({ runs: 2, deliveredMah: b.mAh, deliveredRunId: runs.bNew });
    expect(bySerial.get("NB-0003")).toMatchObject({ runs: 0, deliveredMah: null, sohPercent: null, dcirMohm: null, lastTestedAt: null });
    expect(bySerial.get("NB-0001")?.safetyFindings).toBe(0);
    expect(bySerial.get("NB-0005")?.safetyFindings ?? 0).toBeGreaterThanOrEqual(1);
    // A pulse test has resistance but no capacity.
    expect(bySerial.get("NB-0004")).toMatchObject({ runs: 1, deliveredMah: null, dcirMethod: "IEC 61960-3 DC" });
  });

  it("reports the IEC 61960-3 resistance the engine measured, R = (U1 − U2) / (I2 − I1)", async () => {
    const detail = await getRunDetail(runs.d as string);
    const iec = ((detail?.analysis?.report as { dcir: { method: string; u1_V: number; u2_V: number; i1_A: number; i2_A: number }[] }).dcir ?? []).filter((r) => r.method === "IEC 61960-3 DC");
    expect(iec.length).toBeGreaterThan(0);
    // IEC 61960-3 §7.7 (from memory, domain notes), from the stored voltages and currents; the demo log was made with 65 mΩ.
    const expected = iec.map((r) => ((r.u1_V - r.u2_V) / (Math.abs(r.i2_A) - Math.abs(r.i1_A))) * 1000).sort((x, y) => x - y);
    const median = expected[Math.floor(expected.length / 2)] ?? Number.NaN;
    const row = (await getBatchCellRows(batchId))?.rows.find((r) => r.serial === "NB-0004");
    expect(row?.dcirMohm).toBeCloseTo(median, 6);
    expect(row?.dcirMohm).toBeCloseTo(65, 0);
  });

  it("sorts with missing figures last, filters and pages through the route", async () => {
    const desc = await call<Page<BatchCellRow>>(batchCells, `/api/batches/${batchId}/cells?sort=capacity&dir=desc`, { batchId });
    expect(desc.status).toBe(200);
    const caps = desc.body.items.map((r) => r.deliveredMah);
    expect(caps.slice(0, 3).every((c) => c !== null)).toBe(true);
    expect((caps[0] ?? 0) >= (caps[1] ?? 0) && (caps[1] ?? 0) >= (caps[2] ?? 0)).toBe(true);
    expect(caps.slice(3)).toEqual([null, null]);
    const asc = await call<Page<BatchCellRow>>(batchCells, `/api/batches/${batchId}/cells?sort=capacity&dir=asc&pageSize=1&page=2`, { batchId });
    expect(asc.body).toMatchObject({ total: 5, page: 2, pageSize: 1 });
    expect(asc.body.items[0]?.deliveredMah).toBe(caps[1]);
    const untested = await call<Page<BatchCellRow>>(batchCells, `/api/batches/${batchId}/cells?tested=untested&q=nb-000`, { batchId });
    expect(untested.body.items.map((r) => r.serial)).toEqual(["NB-0003", "NB-0004"]);
    expect((await call(batchCells, "/api/batches/x/cells", { batchId: "not-a-uuid" })).status).toBe(404);
    expect((await call(batchCells, `/api/batches/${batchId}/cells?sort=weight`, { batchId })).status).toBe(400);
  });

  it("downloads the filtered table as CSV with numbers kept as numbers", async () => {
    const csv = await call<string>(batchCellsCsv, `/api/batches/${batchId}/cells/export?tested=tested&sort=serial`, { batchId });
    expect(csv.status).toBe(200);
    const lines = csv.body.replace(/^\uFEFF/, "").trim().split("\r\n");
    // A heading with a comma is quoted (RFC 4180 §2.6).
    expect(lines[0]).toBe(
      'Serial,Status,Runs (count),"Last tested at (UTC, ISO 8601)",Delivered capacity (mAh),SOH against rated capacity (%),DC resistance (mOhm),DC resistance method,Coulombic efficiency (%),Findings in the latest run (count),Safety findings in the latest run (count),Open flags (count)',
    );
    expect(lines).toHaveLength(4);
    const a = await storedDelivered(runs.a as string);
    expect(lines[1]?.split(",")[4]).toBe(String(a.mAh));
  });
});

describe("cell notebook and curves", () => {
  it("lists every run of the cell with its delivered capacity and voltage trace, newest first", async () => {
    const nb = await getCellNotebook("nb-0002");
    expect(nb?.runs.map((r) => r.id)).toEqual([runs.bNew, runs.bOld]);
    const b = await storedDelivered(runs.bNew as string);
    expect(nb?.figures.delivered).toMatchObject({ runId: runs.bNew, mAh: b.mAh });
    expect(nb?.runs[0]?.delivered?.mAh).toBe(b.mAh);
    expect(nb?.runs[0]?.voltage?.x.length).toBeGreaterThan(100);
    expect(nb?.openFlags).toBe(0);
    expect(await getCellNotebook("NB-9999")).toBeNull();
  });

  it("gives the discharge curve of the delivered-capacity cycle, ending at that capacity", async () => {
    const curve = await getRunDischargeCurve(runs.a as string);
    const a = await storedDelivered(runs.a as string);
    // The curve's last point is the step's last sample (lib/analysis/plot.ts keeps it exactly).
    expect(curve?.capacity_mAh.at(-1)).toBeCloseTo(a.mAh, 6);
    // Discharge ends at the simulator's 3.0 V cut-off (tests/support/bench-logs.ts; common practice for polymer cells).
    expect(curve?.voltage_V.at(-1)).toBeCloseTo(3.0, 1);
    const viaRoute = await call<{ curve: unknown }>(dischargeCurveRoute, `/api/runs/${runs.d}/discharge-curve`, { id: runs.d as string });
    expect(viaRoute).toMatchObject({ status: 200, body: { curve: null, serial: "NB-0004" } });
  });
});
