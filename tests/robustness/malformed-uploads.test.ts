/**
 * Hostile files through the storage path (issue 7, robustness): each is posted to the bench API
 * like any log, analysed by the worker pool, and must end failed with the reader's own located
 * error and not one result row (no analysis version, step, cycle, finding or plot series).
 */
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { AnalysisRejected, type LocatedError } from "@/lib/analysis/types";
import { getDb } from "@/lib/db/client";
import { createCell } from "@/lib/db/queries/registry";
import { analysisIdle, stopAnalysis } from "@/lib/ingest/runner";
import { postLog } from "../ingest/support/bench-api";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { readAll } from "../support/log-forms";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { startUploadService, type UploadService } from "../support/upload-service";
import { signedInUser, type SignedInUser } from "../support/users";
import { storedRun } from "./support/result-rows";
import { fuzzCases } from "./support/fuzz-inputs";

vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn(), updateTag: vi.fn() }));

const serial = "KP-FUZZ-0001";
let service: UploadService;
let technician: SignedInUser;

/** The reader's verdict on the bytes alone, to compare the stored error with. */
async function readerRejection(bytes: Uint8Array): Promise<LocatedError | null> {
  try {
    await readAll(bytes);
    return null;
  } catch (error) {
    if (error instanceof AnalysisRejected) return error.detail;
    throw error;
  }
}

// Every family that must be refused for a known reason, plus the first few rejected noise files.
const all = fuzzCases(20261201);
const picked = [...all.filter((c) => c.rejects), ...all.filter((c) => /^random bytes|^log-like noise/.test(c.name)).slice(0, 6)];

beforeAll(async () => {
  await installTestDatabase();
  service = await startUploadService();
  technician = await signedInUser("technician");
  const admin = await signedInUser("admin");
  const { batchId } = await cellTypeWithBatch({ id: admin.id, name: "Admin" }, "LOT-FUZZ-1");
  await createCell({ serial, batchId }, { id: admin.id, name: "Admin" });
});

afterAll(async () => {
  await stopAnalysis();
  await service.close();
  await removeTestDatabase();
});

describe("a hostile upload leaves nothing stored but its error", () => {
  it.each(picked)("$name", async (c) => {
    const expected = await readerRejection(c.bytes);
    // Only files the reader refuses belong here; a generator change that made one readable must show.
    expect(expected).not.toBeNull();
    const response = await postLog({ headers: technician.headers }, { cellSerial: serial, purpose: "other" }, { name: "hostile.csv", text: new Uint8Array(c.bytes) });
    expect(response.status).toBe(202);
    const { run } = (await response.json()) as { run: { id: string } };
    await analysisIdle();
    const stored = await storedRun(await getDb(), run.id);
    expect(stored).toMatchObject({
      status: "failed",
      latestVersion: null,
      error: { code: expected?.code, line: expected?.line },
      rows: { versions: 0, steps: 0, cycles: 0, findings: 0, series: 0 },
    });
    expect(stored?.error?.message.trim()).not.toBe("");
  }, 60_000);
});
