/**
 * The bench API through its real route handlers, authenticated by personal tokens made with the
 * settings actions, storing through the real upload fake and analysing in the worker.
 */
import { createHash } from "node:crypto";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { createApiTokenAction, revokeApiTokenAction } from "@/app/(lab)/settings/actions";
import { analyzeLog } from "@/lib/analysis";
import { withRequestHeaders } from "@/lib/auth/request-headers";
import { getDb } from "@/lib/db/client";
import { createCell } from "@/lib/db/queries/registry";
import { apiToken } from "@/lib/db/schema";
import { cellLimitsOf } from "@/lib/ingest/limits";
import { receiveLogUpload } from "@/lib/ingest/multipart";
import { analysisIdle, stopAnalysis } from "@/lib/ingest/runner";
import { capacityCheckCsv } from "../support/bench-logs";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { cellTypeWithBatch, pouchCellType } from "../support/registry-fixtures";
import { startUploadService, type UploadService } from "../support/upload-service";
import { signedInUser, type SignedInUser } from "../support/users";
import { fetchCellRuns, fetchRaw, fetchRun, postLog } from "./support/bench-api";

vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn(), updateTag: vi.fn() }));

const fields = { cellSerial: "KP-API-0001", purpose: "capacity check", ambientTempC: "22.5", testEndedAt: "2026-11-30T16:45:00+01:00", operatorNote: "posted by the bench script" };

let service: UploadService;
let technician: SignedInUser;
let qaLead: SignedInUser;

async function tokenFor(user: SignedInUser, name: string): Promise<{ id: string; token: string }> {
  const result = await withRequestHeaders(user.headers, () => createApiTokenAction({ name }));
  if (!result.ok) throw new Error(result.error);
  return result.data;
}

beforeAll(async () => {
  await installTestDatabase();
  service = await startUploadService();
  technician = await signedInUser("technician");
  qaLead = await signedInUser("qa-lead");
  const admin = await signedInUser("admin");
  const { batchId } = await cellTypeWithBatch({ id: admin.id, name: "Admin" }, "LOT-API-1");
  await createCell({ serial: "KP-API-0001", batchId }, { id: admin.id, name: "Admin" });
});

afterAll(async () => {
  await stopAnalysis();
  await service.close();
  await removeTestDatabase();
});

describe("personal API tokens", () => {
  it("are shown once and stored only as their SHA-256", async () => {
    const { id, token } = await tokenFor(technician, "bench 2 script");
    expect(token).toMatch(/^kp_[A-Za-z0-9_-]{43}$/);
    const db = await getDb();
    const [row] = await db.select().from(apiToken).where(eq(apiToken.id, id));
    expect(row?.tokenHash).toBe(createHash("sha256").update(token).digest("hex"));
    expect(JSON.stringify(row)).not.toContain(token.slice(9));
    expect(row?.prefix).toBe(token.slice(0, 9));
  });

  it("answer 401 when missing, malformed, unknown or revoked, and 403 for a role that may not upload", async () => {
    const log = { name: "a.csv", text: capacityCheckCsv(100) };
    expect((await postLog(null, fields, log)).status).toBe(401);
    expect((await postLog({ token: "kp_short" }, fields, log)).status).toBe(401);
    expect((await postLog({ token: `kp_${"A".repeat(43)}` }, fields, log)).status).toBe(401);

    const { id, token } = await tokenFor(technician, "to be revoked");
    const revoked = await withRequestHeaders(technician.headers, () => revokeApiTokenAction({ tokenId: id }));
    expect(revoked.ok).toBe(true);
    const refused = await postLog({ token }, fields, log);
    expect(refused.status).toBe(401);
    expect(await refused.json()).toMatchObject({ code: "unauthenticated", error: expect.stringMatching(/revoked/) });

    // Someone else's token cannot be revoked by id.
    const other = await tokenFor(technician, "not yours");
    const foreign = await withRequestHeaders(qaLead.headers, () => revokeApiTokenAction({ tokenId: other.id }));
    expect(foreign).toMatchObject({ ok: false, status: 404 });

    const qa = await tokenFor(qaLead, "qa reader");
    const forbidden = await postLog({ token: qa.token }, fields, log);
    expect(forbidden.status).toBe(403);
  });
});

describe("POST /api/v1/runs and the reads", () => {
  it("accepts a log (202), analyses it, and reports it in the CLI's shape; the same bytes again are a 409", async () => {
    const { token } = await tokenFor(technician, "bench 4");
    const text = capacityCheckCsv(101);
    const posted = await postLog({ token }, fields, { name: "bench4-capacity.csv", text });
    expect(posted.status).toBe(202);
    const { run } = (await posted.json()) as { run: { id: string; status: string; cell_serial: string; links: { self: string } } };
    expect(run).toMatchObject({ status: expect.stringMatching(/^(queued|analysing)$/), cell_serial: "KP-API-0001", links: { self: `/api/v1/runs/${run.id}` } });
    expect(posted.headers.get("location")).toBe(`/api/v1/runs/${run.id}`);

    await analysisIdle();
    const got = await fetchRun({ token }, run.id);
    expect(got.status).toBe(200);
    const body = (await got.json()) as { run: Record<string, unknown>; analysis: { version: number }; report: Record<string, unknown> };
    expect(body.run).toMatchObject({ id: run.id, status: "complete", purpose: "capacity check", ambient_temperature_C: 22.5, test_ended_at: "2026-11-30T15:45:00.000Z", operator_note: "posted by the bench script", latest_version: 1 });
    expect(body.run.file).toEqual({ name: "bench4-capacity.csv", size_bytes: Buffer.byteLength(text), sha256: createHash("sha256").update(text).digest("hex") });
    expect(body.analysis.version).toBe(1);

    // The report is what the engine (and so the CLI) gives for these bytes with this cell type's limits.
    const direct = await analyzeLog(
      (async function* () {
        yield new TextEncoder().encode(text);
      })(),
      { fileName: "bench4-capacity.csv", limits: cellLimitsOf(pouchCellType("x")) },
    );
    expect(body.report).toEqual(JSON.parse(JSON.stringify(direct.report)));
    // And it has the fields the CLI contract names.
    expect(body.report).toMatchObject({
      status: "ok",
      detected: { delimiter: ",", decimal: ".", time_format: expect.any(String), current_sign: expect.any(String), columns: expect.any(Object) },
      totals: { charged_mAh: expect.any(Number), charged_Wh: expect.any(Number), discharged_mAh: expect.any(Number), discharged_Wh: expect.any(Number) },
      per_cycle_discharge_mAh: expect.any(Array),
      steps: expect.any(Array),
      findings: expect.any(Array),
      dcir: expect.any(Array),
    });
    const cycle = (body.report.cycles as Record<string, unknown>[])[0];
    expect(cycle).toMatchObject({
      cycle: 1,
      charge: { start_s: expect.any(Number), end_s: expect.any(Number), mAh: expect.any(Number), Wh: expect.any(Number), cc: { mAh: expect.any(Number) }, cv: { mAh: expect.any(Number), final_current_A: expect.any(Number) }, transition: { time_s: expect.any(Number), voltage_V: expect.any(Number), capacity_mAh: expect.any(Number) } },
      discharge: { start_s: expect.any(Number), end_s: expect.any(Number), mAh: expect.any(Number), Wh: expect.any(Number) },
    });

    const again = await postLog({ token }, fields, { name: "same-bytes-other-name.csv", text });
    expect(again.status).toBe(409);
    expect(await again.json()).toMatchObject({ code: "conflict", runId: run.id, run: { id: run.id, status: "complete" } });

    const list = await fetchCellRuns({ token }, "kp-api-0001");
    expect(list.status).toBe(200);
    const listed = (await list.json()) as { cell_serial: string; runs: { id: string; key_numbers: { charged_mAh: number } | null }[] };
    expect(listed.cell_serial).toBe("KP-API-0001");
    expect(listed.runs.find((r) => r.id === run.id)?.key_numbers?.charged_mAh).toBeCloseTo((body.report.totals as { charged_mAh: number }).charged_mAh, 9);

    // Reading needs only run.read: a QA lead's token may read what it may not upload.
    const qa = await tokenFor(qaLead, "qa");
    expect((await fetchRun({ token: qa.token }, run.id)).status).toBe(200);
    expect((await fetchRun({ token: qa.token }, "00000000-0000-4000-8000-000000000000")).status).toBe(404);
    expect((await fetchCellRuns({ token: qa.token }, "NO-SUCH-CELL")).status).toBe(404);

    const raw = await fetchRaw({ token: qa.token }, run.id);
    expect(raw.status).toBe(200);
    expect(await raw.text()).toBe(text);
  });

  it("refuses a body larger than the limit with 413, before reading it", async () => {
    const { token } = await tokenFor(technician, "big");
    const response = await postLog({ token }, fields, { name: "big.csv", text: "t,v,i\n" }, { "content-length": String(300 * 1024 * 1024) });
    expect(response.status).toBe(413);
    expect(await response.json()).toMatchObject({ code: "payload-too-large", error: expect.stringMatching(/256 MB/) });
  });

  it("stops reading a multipart file at the limit (413) and keeps nothing", async () => {
    const form = new FormData();
    form.set("file", new Blob(["x".repeat(5000)]), "long.csv");
    const request = new Request("http://localhost/api/v1/runs", { method: "POST", body: form });
    await expect(receiveLogUpload(request, 1000)).rejects.toMatchObject({ status: 413 });
  });

  it("checks the fields and the file kind", async () => {
    const { token } = await tokenFor(technician, "fields");
    const missing = await postLog({ token }, { cellSerial: "KP-API-0001" }, { name: "a.csv", text: "t,v,i\n" });
    expect(missing.status).toBe(400);
    expect(await missing.json()).toMatchObject({ fieldErrors: { purpose: expect.any(Array) } });
    const binary = await postLog({ token }, fields, { name: "scope.bin", text: new Uint8Array([1, 2, 3]), type: "application/octet-stream" });
    expect(binary.status).toBe(400);
    // A test end in the future, or without its offset from UTC, is a mistake to fix, not a time to guess.
    for (const testEndedAt of ["2999-01-01T00:00:00Z", "2026-11-30T16:45:00"]) {
      const wrongTime = await postLog({ token }, { ...fields, testEndedAt }, { name: "a.csv", text: "t,v,i\n" });
      expect(wrongTime.status, testEndedAt).toBe(400);
      expect(await wrongTime.json()).toMatchObject({ fieldErrors: { testEndedAt: [expect.stringMatching(/future|date and time/)] } });
    }
    const newCell = await postLog({ token }, { ...fields, cellSerial: "KP-API-UNKNOWN" }, { name: "a.csv", text: "t,v,i\n" });
    expect(newCell.status).toBe(400);
    expect(await newCell.json()).toMatchObject({ error: expect.stringMatching(/not registered/) });
  });
});
