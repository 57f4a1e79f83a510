/**
 * The browser's path end to end: our real file route, the real upload fake on a free port, the
 * SDK's callbacks in both modes, the worker-thread analysis, and what ends up stored.
 */
import { createHash } from "node:crypto";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { getDb } from "@/lib/db/client";
import { getRunDetail, listRunsOfCell } from "@/lib/db/queries/run-views";
import { createCell } from "@/lib/db/queries/registry";
import { run } from "@/lib/db/schema";
import { analysisIdle, stopAnalysis } from "@/lib/ingest/runner";
import { putToPresigned } from "../fakes/support/browser-upload";
import { capacityCheckCsv, trapezoidTotals_mAh } from "../support/bench-logs";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { startUploadService, useCallbackMode, type UploadService } from "../support/upload-service";
import { signedInUser, type SignedInUser } from "../support/users";
import { presignedUploads, requestUpload, serveFileRoute } from "./support/upload-client";

vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn(), updateTag: vi.fn() }));

const sha256 = (text: string) => createHash("sha256").update(text).digest("hex");
const csvFile = (text: string, name: string) => new File([text], name, { type: "text/csv" });

let service: UploadService;
let route: { routeUrl: string; close(): Promise<void> };
let technician: SignedInUser;
let batchId: string;

beforeAll(async () => {
  await installTestDatabase();
  service = await startUploadService();
  route = await serveFileRoute();
  technician = await signedInUser("technician");
  const admin = await signedInUser("admin");
  ({ batchId } = await cellTypeWithBatch({ id: admin.id, name: "Admin" }, "LOT-UPLOAD-1"));
  await createCell({ serial: "KP-UP-0001", batchId }, { id: admin.id, name: "Admin" });
});

afterAll(async () => {
  await stopAnalysis();
  await route.close();
  await service.close();
  await removeTestDatabase();
});

describe("upload through the file route", () => {
  for (const [n, mode] of (["prod", "dev"] as const).entries()) {
    it(`stores, analyses and persists each run and its plot series (${mode} callback mode)`, async () => {
      useCallbackMode(mode, route.routeUrl);
      const texts = [capacityCheckCsv(10 + 2 * n), capacityCheckCsv(11 + 2 * n)];
      const files = texts.map((text, i) => csvFile(text, `${mode}-capacity-${i}.csv`));
      const presigned = await presignedUploads(route.routeUrl, files, { cellSerial: "KP-UP-0001", purpose: "capacity check", ambientTempC: 23, testEndedAt: "2026-11-30T16:45:00+01:00", operatorNote: `bench 3, ${mode}` }, technician.headers);
      expect(presigned).toHaveLength(2);

      const runIds: string[] = [];
      for (const [i, target] of presigned.entries()) {
        const file = files[i];
        if (!file) throw new Error("missing file");
        const put = await putToPresigned(target, file);
        expect(put.putStatus).toBe(200);
        expect(put.putBody.serverData).toMatchObject({ outcome: "queued", runId: expect.any(String), serial: "KP-UP-0001" });
        runIds.push((put.putBody.serverData as { runId: string }).runId);
      }
      await analysisIdle();

      for (const [i, runId] of runIds.entries()) {
        const text = texts[i] ?? "";
        const detail = await getRunDetail(runId);
        expect(detail?.run).toMatchObject({ status: "complete", serial: "KP-UP-0001", purpose: "capacity check", ambientTempC: 23, testEndedAt: new Date("2026-11-30T15:45:00Z"), source: "browser", sha256: sha256(text), fileSize: Buffer.byteLength(text), latestVersion: 1, error: null });
        expect(detail?.analysis?.version).toBe(1);
        const report = detail?.analysis?.report as { status: string; steps: unknown[]; cycles: unknown[]; totals: { charged_mAh: number; discharged_mAh: number } };
        expect(report.status).toBe("ok");
        // Stored rows are the report's own, one for one.
        expect(detail?.steps).toHaveLength(report.steps.length);
        expect(detail?.cycles).toHaveLength(report.cycles.length);
        expect(report.steps.length).toBeGreaterThanOrEqual(3);
        // The totals agree with an independent trapezoid count of the same CSV to 0.5 %.
        const reference = trapezoidTotals_mAh(text);
        expect(detail?.run.chargedMah).toBeCloseTo(report.totals.charged_mAh, 9);
        expect(Math.abs((detail?.run.chargedMah ?? 0) - reference.charged) / reference.charged).toBeLessThan(0.005);
        expect(Math.abs((detail?.run.dischargedMah ?? 0) - reference.discharged) / reference.discharged).toBeLessThan(0.005);
        // The CC→CV switch of a 4.2 V charge sits at the charge limit (common practice, no source).
        expect(detail?.run.switchVoltageV).toBeGreaterThan(4.1);
        expect(detail?.run.switchVoltageV).toBeLessThanOrEqual(4.25);
        const voltage = detail?.series.voltage as { x: number[]; y: number[] };
        expect(voltage.x.length).toBe(voltage.y.length);
        expect(voltage.x.length).toBeGreaterThan(10);
        expect(voltage.x.length).toBeLessThanOrEqual(2000);
      }
      const cell = await listRunsOfCell("kp-up-0001");
      expect(cell?.runs.map((r) => r.id)).toEqual(expect.arrayContaining(runIds));
    });
  }

  it("registers a new cell for an uploader who may, and refuses a duplicate of stored bytes", async () => {
    useCallbackMode("prod", route.routeUrl);
    const text = capacityCheckCsv(40);
    const input = { cellSerial: "KP-UP-NEW-7", purpose: "formation" as const, batchId };
    const [first] = await presignedUploads(route.routeUrl, [csvFile(text, "first.csv")], input, technician.headers);
    if (!first) throw new Error("no presigned URL");
    const put = await putToPresigned(first, csvFile(text, "first.csv"));
    const { runId } = put.putBody.serverData as { runId: string };
    expect(put.putBody.serverData).toMatchObject({ outcome: "queued", serial: "KP-UP-NEW-7" });

    const [again] = await presignedUploads(route.routeUrl, [csvFile(text, "again.csv")], input, technician.headers);
    if (!again) throw new Error("no presigned URL");
    const second = await putToPresigned(again, csvFile(text, "again.csv"));
    expect(second.putBody.serverData).toMatchObject({ outcome: "duplicate", runId });
    await analysisIdle();
    const db = await getDb();
    const rows = await db.select({ id: run.id }).from(run).where(eq(run.sha256, sha256(text)));
    expect(rows).toEqual([{ id: runId }]);
    // The refused copy does not linger in storage.
    expect((await fetch(`${service.fake.url}/f/${again.key}`)).status).toBe(404);
  });

  it("answers 401 signed out and 403 to a role that may not upload, before any storage request", async () => {
    const file = csvFile(capacityCheckCsv(50), "x.csv");
    const input = { cellSerial: "KP-UP-0001", purpose: "other" as const };
    expect((await requestUpload(route.routeUrl, [file], input, new Headers())).status).toBe(401);
    const qaLead = await signedInUser("qa-lead");
    expect((await requestUpload(route.routeUrl, [file], input, qaLead.headers)).status).toBe(403);
  });

  it("refuses files that are not logs and serials that cannot be registered", async () => {
    const input = { cellSerial: "KP-UP-0001", purpose: "other" as const };
    const image = new File([new Uint8Array([0x89, 0x50, 0x4e, 0x47])], "photo.png", { type: "image/png" });
    expect((await requestUpload(route.routeUrl, [image], input, technician.headers)).status).toBe(400);
    const octet = new File(["a"], "readme.bin", { type: "application/octet-stream" });
    expect((await requestUpload(route.routeUrl, [octet], input, technician.headers)).status).toBe(400);
    const unknown = await requestUpload(route.routeUrl, [csvFile("t,v,i\n", "a.csv")], { cellSerial: "KP-NOBODY-1", purpose: "other" }, technician.headers);
    expect(unknown.status).toBe(400);
    expect(JSON.stringify(await unknown.json())).toMatch(/not registered/);
  });
});

describe("cross-site requests", () => {
  it("refuses an upload request that another site's page made the browser send", async () => {
    const headers = new Headers(technician.headers);
    headers.set("origin", "https://elsewhere.example");
    const file = csvFile(capacityCheckCsv(60), "x.csv");
    expect((await requestUpload(route.routeUrl, [file], { cellSerial: "KP-UP-0001", purpose: "other" }, headers)).status).toBe(403);
  });
});
