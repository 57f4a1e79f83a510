/**
 * GET /api/runs/:id/bdf against a real database and the upload fake: runs uploaded through the
 * bench API and analysed by the real worker, then exported; the export uploaded again through the
 * same path is analysed like any log.
 */
import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { GET as getBdf } from "@/app/api/runs/[id]/bdf/route";
import { getRunDetail } from "@/lib/db/queries/run-views";
import { createCell } from "@/lib/db/queries/registry";
import { bdfLabels } from "@/lib/export/battery-data-format";
import { analysisIdle, stopAnalysis } from "@/lib/ingest/runner";
import { capacityCheckCsv, malformedCsv } from "../support/bench-logs";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { startUploadService, type UploadService } from "../support/upload-service";
import { signedInUser, type SignedInUser } from "../support/users";
import { postLog } from "../ingest/support/bench-api";

vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn(), updateTag: vi.fn() }));

let service: UploadService;
let technician: SignedInUser;
let qa: SignedInUser;
const serial = "KP-BDF-0001";

async function upload(text: string, name: string, type?: string): Promise<string> {
  const response = await postLog({ headers: technician.headers }, { cellSerial: serial, purpose: "capacity check", ambientTempC: "23" }, { name, text, type });
  if (response.status !== 202) throw new Error(`upload refused: ${response.status} ${await response.text()}`);
  return ((await response.json()) as { run: { id: string } }).run.id;
}

function fetchBdf(id: string, headers?: Headers) {
  return getBdf(new Request(`http://localhost:3000/api/runs/${id}/bdf`, { headers }), { params: Promise.resolve({ id }) });
}

async function totalsOf(runId: string) {
  const detail = await getRunDetail(runId);
  return { status: detail?.run.status, charged: detail?.run.chargedMah ?? NaN, discharged: detail?.run.dischargedMah ?? NaN };
}

beforeAll(async () => {
  await installTestDatabase();
  service = await startUploadService();
  technician = await signedInUser("technician");
  qa = await signedInUser("qa-lead");
  const admin = await signedInUser("admin");
  const actor = { id: admin.id, name: "Admin" };
  const { batchId } = await cellTypeWithBatch(actor, "LOT-BDF-1");
  await createCell({ serial, batchId }, actor);
});

afterAll(async () => {
  await stopAnalysis();
  await service.close();
  await removeTestDatabase();
});

describe("GET /api/runs/:id/bdf", () => {
  let exported = "";
  let original: { charged: number; discharged: number };

  it("streams a complete run as a BDF CSV attachment named after the cell and the file", async () => {
    const runId = await upload(capacityCheckCsv(11), "bench3 capacity.csv");
    await analysisIdle();
    original = await totalsOf(runId);
    expect(original).toMatchObject({ status: "complete" });
    const response = await fetchBdf(runId, qa.headers);
    expect(response.status).toBe(200);
    expect(response.headers.get("content-type")).toBe("text/csv; charset=utf-8");
    expect(response.headers.get("content-disposition")).toBe(
      `attachment; filename="${serial}-bench3 capacity.bdf.csv"; filename*=UTF-8''${encodeURIComponent(`${serial}-bench3 capacity.bdf.csv`)}`,
    );
    exported = await response.text();
    const parsed = Papa.parse<Record<string, string>>(exported, { header: true, skipEmptyLines: true });
    // The log has elapsed time and a temperature column; the run records 23 °C ambient.
    expect(parsed.meta.fields).toEqual([
      bdfLabels.testTime,
      bdfLabels.voltage,
      bdfLabels.current,
      bdfLabels.ambientTemperature,
      bdfLabels.surfaceTemperature,
      bdfLabels.chargingCapacity,
      bdfLabels.dischargingCapacity,
    ]);
    expect(parsed.data).toHaveLength(capacityCheckCsv(11).trim().split("\n").length - 1);
    expect(parsed.data[0]?.[bdfLabels.ambientTemperature]).toBe("23");
    const last = parsed.data[parsed.data.length - 1]!;
    expect(Math.abs(Number(last[bdfLabels.chargingCapacity]) * 1000 - original.charged) / original.charged).toBeLessThan(0.001);
    expect(Math.abs(Number(last[bdfLabels.dischargingCapacity]) * 1000 - original.discharged) / original.discharged).toBeLessThan(0.001);
  });

  it("imports the exported file through the bench API and analyses it to the same capacities (within 0.1 %)", async () => {
    expect(exported).not.toBe("");
    const runId = await upload(exported, `${serial}-bench3 capacity.bdf.csv`);
    await analysisIdle();
    const again = await totalsOf(runId);
    expect(again.status).toBe("complete");
    expect(Math.abs(again.charged - original.charged) / original.charged).toBeLessThan(0.001);
    expect(Math.abs(again.discharged - original.discharged) / original.discharged).toBeLessThan(0.001);
    const detail = await getRunDetail(runId);
    expect(detail?.analysis?.detection).toMatchObject({ columns: { time: { name: bdfLabels.testTime }, current: { name: bdfLabels.current, unit: "A" }, temperature: { name: bdfLabels.surfaceTemperature } } });
  });

  it("takes a file with BDF's own .bdf extension, sent with no telling MIME type", async () => {
    expect(exported).not.toBe("");
    // The same samples with the first row dropped, so the bytes differ from the upload before.
    const lines = exported.split("\n");
    const text = [lines[0], ...lines.slice(2)].join("\n");
    const runId = await upload(text, "exported.bdf", "application/octet-stream");
    await analysisIdle();
    const again = await totalsOf(runId);
    expect(again.status).toBe("complete");
    expect(Math.abs(again.discharged - original.discharged) / original.discharged).toBeLessThan(0.001);
  });

  it("adds Unix time when the log's timestamps name their zone", async () => {
    const start = Date.UTC(2026, 5, 1, 8, 0, 0); // ms since the epoch (ECMAScript Date.UTC)
    const rows = Array.from({ length: 60 }, (_, k) => `${new Date(start + k * 10_000).toISOString()},${(3.6 + k * 0.005).toFixed(3)},0.500`);
    const runId = await upload(["time,voltage_V,current_A", ...rows].join("\n") + "\n", "stamped.csv");
    await analysisIdle();
    const response = await fetchBdf(runId, technician.headers);
    expect(response.status).toBe(200);
    const parsed = Papa.parse<Record<string, string>>(await response.text(), { header: true, skipEmptyLines: true });
    expect(parsed.meta.fields?.slice(0, 4)).toEqual([bdfLabels.testTime, bdfLabels.voltage, bdfLabels.current, bdfLabels.unixTime]);
    expect(parsed.data.slice(0, 2).map((r) => [Number(r[bdfLabels.testTime]), Number(r[bdfLabels.unixTime])])).toEqual([
      [0, start / 1000],
      [10, start / 1000 + 10],
    ]);
  });

  it("answers 409 with the located error for a run whose analysis failed", async () => {
    const runId = await upload(malformedCsv, "broken.csv");
    await analysisIdle();
    const response = await fetchBdf(runId, technician.headers);
    expect(response.status).toBe(409);
    const body = (await response.json()) as { code: string; located: unknown };
    // "abc" stands in the voltage column (field 2) of physical line 6.
    expect(body).toMatchObject({ code: "conflict", located: { code: "non-numeric", line: 6, column: 2, file: "broken.csv" } });
  });

  it("answers 404 for an unknown run and 401 without a session", async () => {
    expect((await fetchBdf("00000000-0000-4000-8000-000000000000", technician.headers)).status).toBe(404);
    expect((await fetchBdf("not-a-uuid", technician.headers)).status).toBe(404);
    expect((await fetchBdf("00000000-0000-4000-8000-000000000000")).status).toBe(401);
  });
});
