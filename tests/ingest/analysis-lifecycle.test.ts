/**
 * What happens to a run after upload: a malformed file fails with its located error and leaves
 * no result rows; re-analysis adds versions and keeps the old; a restart resumes interrupted
 * runs; the raw download re-checks the bytes.
 */
import { count, eq, inArray } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { reanalyseRunAction } from "@/app/(lab)/runs/[runId]/actions";
import { analyseRunAction, previewUploadAction, saveColumnMapAction } from "@/app/(lab)/upload/actions";
import { withRequestHeaders } from "@/lib/auth/request-headers";
import { getDb } from "@/lib/db/client";
import { getRunDetail } from "@/lib/db/queries/run-views";
import { createCell } from "@/lib/db/queries/registry";
import { analysisVersion, plotSeries, run, runCycle, runFinding, runStep } from "@/lib/db/schema";
import { analysisIdle, recoverRuns, stopAnalysis } from "@/lib/ingest/runner";
import { capacityCheckCsv, malformedCsv } from "../support/bench-logs";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { startUploadService, type UploadService } from "../support/upload-service";
import { signedInUser, type SignedInUser } from "../support/users";
import { fetchRaw, fetchRun, postLog } from "./support/bench-api";

vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn(), updateTag: vi.fn() }));

let service: UploadService;
let technician: SignedInUser;
const fields = { cellSerial: "KP-LIFE-0001", purpose: "capacity check" };

async function upload(text: string, name = "log.csv"): Promise<string> {
  const response = await postLog({ headers: technician.headers }, fields, { name, text });
  if (response.status !== 202) throw new Error(`upload refused: ${response.status} ${await response.text()}`);
  return ((await response.json()) as { run: { id: string } }).run.id;
}

/** Result rows stored for any analysis version of the run. */
async function resultRows(runId: string) {
  const db = await getDb();
  const versions = (await db.select({ id: analysisVersion.id }).from(analysisVersion).where(eq(analysisVersion.runId, runId))).map((v) => v.id);
  if (versions.length === 0) return { versions: 0, steps: 0, cycles: 0, findings: 0, series: 0 };
  const n = async (table: typeof runStep | typeof runCycle | typeof runFinding | typeof plotSeries) =>
    (await db.select({ n: count() }).from(table).where(inArray(table.analysisId, versions)))[0]?.n ?? 0;
  return { versions: versions.length, steps: await n(runStep), cycles: await n(runCycle), findings: await n(runFinding), series: await n(plotSeries) };
}

const as = <T>(user: SignedInUser, fn: () => Promise<T>) => withRequestHeaders(user.headers, fn);

beforeAll(async () => {
  await installTestDatabase();
  service = await startUploadService();
  technician = await signedInUser("technician");
  const admin = await signedInUser("admin");
  const { batchId } = await cellTypeWithBatch({ id: admin.id, name: "Admin" }, "LOT-LIFE-1");
  await createCell({ serial: "KP-LIFE-0001", batchId }, { id: admin.id, name: "Admin" });
});

afterAll(async () => {
  await stopAnalysis();
  await service.close();
  await removeTestDatabase();
});

describe("a malformed file", () => {
  it("fails with its located error, stores no result rows, and keeps the raw file", async () => {
    const runId = await upload(malformedCsv, "broken.csv");
    await analysisIdle();
    const detail = await getRunDetail(runId);
    // "abc" stands in the voltage column (field 2) of physical line 6.
    expect(detail?.run).toMatchObject({ status: "failed", latestVersion: null, error: { code: "non-numeric", line: 6, column: 2, file: "broken.csv" } });
    expect(detail?.run.error?.message).toMatch(/\S/);
    expect(await resultRows(runId)).toEqual({ versions: 0, steps: 0, cycles: 0, findings: 0, series: 0 });
    const raw = await fetchRaw({ headers: technician.headers }, runId);
    expect(raw.status).toBe(200);
    expect(raw.headers.get("content-disposition")).toContain('filename="broken.csv"');
    expect(await raw.text()).toBe(malformedCsv);
    // The bench API answers with the CLI's rejection JSON for it.
    const api = (await (await fetchRun({ headers: technician.headers }, runId)).json()) as { report: unknown };
    expect(api.report).toEqual({ status: "reject", reason: detail?.run.error?.message, code: "non-numeric", line: 6, column: 2 });
  });
});

describe("re-analysis", () => {
  it("adds a version with another column map and keeps the earlier one; a failing map keeps it too", async () => {
    const runId = await upload(capacityCheckCsv(200), "cap.csv");
    await analysisIdle();
    const first = await getRunDetail(runId);
    expect(first?.run.status).toBe("complete");
    const firstRows = await resultRows(runId);
    expect(firstRows.versions).toBe(1);

    // The preview gives the detected map; state it explicitly and save it under a name.
    const preview = await as(technician, () => previewUploadAction({ runId }));
    if (!preview.ok || !preview.data.detection) throw new Error("no preview");
    expect(preview.data.header).toEqual(["time_s", "voltage_V", "current_A", "temperature_degC"]);
    const map = preview.data.detection.columnMap;
    const saved = await as(technician, () => saveColumnMapAction({ name: "Bench 3 export", map: JSON.stringify(map) }));
    if (!saved.ok) throw new Error(saved.error);

    const again = await as(technician, () => reanalyseRunAction({ runId, columnMapId: saved.data.id }));
    expect(again).toMatchObject({ ok: true, data: { status: "queued" } });
    await analysisIdle();
    const second = await getRunDetail(runId);
    expect(second?.run).toMatchObject({ status: "complete", latestVersion: 2 });
    expect(second?.versions.map((v) => v.version)).toEqual([2, 1]);
    expect(second?.analysis?.columnMap).toEqual(map);
    // Same bytes, same map: the same numbers, and version 1's rows are still there.
    expect(second?.run.chargedMah).toBeCloseTo(first?.run.chargedMah ?? NaN, 9);
    expect((await resultRows(runId)).steps).toBe(2 * firstRows.steps);
    expect((await getRunDetail(runId, 1))?.steps).toEqual(first?.steps);

    // Voltage read from the time column: the reader refuses it, version 2 stays the latest.
    const wrong = { ...map, voltage: { index: 0, unit: "V" as const } };
    expect(await as(technician, () => analyseRunAction({ runId, columnMap: JSON.stringify(wrong) }))).toMatchObject({ ok: true });
    await analysisIdle();
    const third = await getRunDetail(runId);
    expect(third?.run.status).toBe("failed");
    expect(third?.run.error?.code).toEqual(expect.any(String));
    expect(third?.run.latestVersion).toBe(2);
    expect((await resultRows(runId)).versions).toBe(2);
  });

  it("refuses a re-analysis while one is queued or running", async () => {
    const runId = await upload(capacityCheckCsv(201), "busy.csv");
    const refused = await as(technician, () => reanalyseRunAction({ runId }));
    expect(refused).toMatchObject({ ok: false, status: 409 });
    await analysisIdle();
  });
});

describe("start-up recovery", () => {
  it("queues runs a restart left analysing, and fails those out of attempts", async () => {
    const resumable = await upload(capacityCheckCsv(300), "resume.csv");
    const exhausted = await upload(capacityCheckCsv(301), "exhausted.csv");
    await analysisIdle();
    // As a crash would leave them: mid-analysis, one on its last attempt.
    await stopAnalysis();
    const db = await getDb();
    await db.update(run).set({ status: "analysing", attempts: 1 }).where(eq(run.id, resumable));
    await db.update(run).set({ status: "analysing", attempts: 2 }).where(eq(run.id, exhausted));

    await recoverRuns();
    await analysisIdle();
    expect((await getRunDetail(resumable))?.run).toMatchObject({ status: "complete", latestVersion: 2 });
    expect((await getRunDetail(exhausted))?.run).toMatchObject({ status: "failed", latestVersion: 1, error: { code: "analysis-interrupted" } });
  });
});

describe("the raw download", () => {
  it("breaks off when the stored bytes no longer match the recorded SHA-256", async () => {
    const text = capacityCheckCsv(400);
    const runId = await upload(text, "checked.csv");
    await analysisIdle();
    const good = await fetchRaw({ headers: technician.headers }, runId);
    expect(good.headers.get("repr-digest")).toMatch(/^sha-256=:[A-Za-z0-9+/]+=*:$/);
    expect(await good.text()).toBe(text);

    const db = await getDb();
    const [row] = await db.select({ sha256: run.sha256 }).from(run).where(eq(run.id, runId));
    await db.update(run).set({ sha256: "0".repeat(64) }).where(eq(run.id, runId));
    const errors = vi.spyOn(console, "error").mockImplementation(() => undefined);
    const bad = await fetchRaw({ headers: technician.headers }, runId);
    expect(bad.status).toBe(200);
    await expect(bad.text()).rejects.toThrow();
    expect(errors).toHaveBeenCalledWith(expect.stringMatching(/hashes to .* download broken off/));
    errors.mockRestore();
    await db.update(run).set({ sha256: row?.sha256 ?? "" }).where(eq(run.id, runId));
  });
});
