/**
 * The whole path as the lab uses it: a bench log posted to the bench API, stored in the real
 * upload fake, analysed in the worker thread by the runner, which runs the flag rules once the
 * analysis is stored; the alert goes through the outbox to the real SMTP fake.
 */
import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import type { StoredMessage } from "@/fakes/smtp/message-store";
import { startSmtpFake, type SmtpFake } from "@/fakes/smtp/server";
import { flagsOf } from "@/lib/db/queries/flags";
import { createCell, getCellBySerial } from "@/lib/db/queries/registry";
import { analysisIdle, stopAnalysis } from "@/lib/ingest/runner";
import { OutboxSender, stopOutboxSender } from "@/lib/mail/sender";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { capacityCheckOf } from "../support/analysed-runs";
import { startUploadService, type UploadService } from "../support/upload-service";
import { signedInUser, type SignedInUser } from "../support/users";
import { postLog } from "../ingest/support/bench-api";

vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn(), updateTag: vi.fn() }));

let mailDir: string;
let fake: SmtpFake;
let service: UploadService;
let technician: SignedInUser;
let engineer: SignedInUser;

beforeAll(async () => {
  mailDir = await mkdtemp(path.join(os.tmpdir(), "kneepoint-runner-mail-"));
  fake = await startSmtpFake({ dataDir: mailDir, log: () => undefined });
  process.env.SMTP_URL = `smtp://127.0.0.1:${fake.smtpPort}`;
  await installTestDatabase();
  service = await startUploadService();
  technician = await signedInUser("technician");
  engineer = await signedInUser("engineer", "Ada Engineer");
  const admin = await signedInUser("admin");
  const { batchId } = await cellTypeWithBatch({ id: admin.id, name: "Admin" }, "LOT-RUNNER-1");
  await createCell({ serial: "KP-RUN-0001", batchId }, { id: admin.id, name: "Admin" });
});

afterAll(async () => {
  await stopAnalysis();
  await stopOutboxSender();
  await service.close();
  await removeTestDatabase();
  await fake.close();
  await rm(mailDir, { recursive: true, force: true });
  delete process.env.SMTP_URL;
});

describe("the analysis runner", () => {
  it("runs the flag rules after storing an analysis, and the engineer gets the alert", async () => {
    // A simulated capacity check of a cell with a 650 mAh model capacity against its type's 1000 mAh rating.
    const posted = await postLog({ headers: technician.headers }, { cellSerial: "KP-RUN-0001", purpose: "capacity check" }, { name: "low.csv", text: capacityCheckOf(650, 9) });
    expect(posted.status).toBe(202);
    await analysisIdle();

    const cell = await getCellBySerial("KP-RUN-0001");
    const flags = await flagsOf({ cellId: cell?.id ?? "" });
    expect(flags.map((f) => [f.kind, f.state])).toContainEqual(["soh-below", "open"]);
    expect(cell?.status).toBe("flagged");

    await stopOutboxSender();
    await new OutboxSender({ digest: false }).runOnce();
    const messages = (await (await fetch(`${fake.httpUrl}/api/messages?to=${encodeURIComponent(engineer.email)}`)).json()) as StoredMessage[];
    const alert = messages.find((m) => m.subject === "Flag on cell KP-RUN-0001: State of health below a bound");
    expect(alert?.to).toEqual([engineer.email]);
    expect(alert?.text).toContain("http://localhost:3000/cells/KP-RUN-0001");
  });
});
