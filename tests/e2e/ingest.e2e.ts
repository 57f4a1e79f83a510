/**
 * The ingest path on the built server started by the README's start command (`next start`, the
 * local upload service, the worker threads): bench API and browser-style uploads are analysed
 * off the request thread and stored; duplicates and malformed logs are refused as they should be.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { demoUsers } from "@/lib/db/seed-users";
import { putToPresigned, type PresignedUpload } from "../fakes/support/browser-upload";
import { capacityCheckCsv, malformedCsv } from "../support/bench-logs";
import { startAppServer, type AppServer } from "./support/app-server";

let app: AppServer;
let cookie: string;
let serial: string;

async function signIn(email: string, password: string): Promise<string> {
  const response = await fetch(`${app.url}/api/auth/sign-in/email`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: app.url },
    body: JSON.stringify({ email, password }),
  });
  if (response.status !== 200) throw new Error(`sign-in failed: ${response.status}`);
  return response.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
}

const authed = (init: RequestInit = {}): RequestInit => ({ ...init, headers: { ...(init.headers as Record<string, string>), cookie, origin: app.url } });

async function postLog(text: string, name: string): Promise<Response> {
  const form = new FormData();
  form.set("cellSerial", serial);
  form.set("purpose", "capacity check");
  form.set("file", new Blob([text], { type: "text/csv" }), name);
  return fetch(`${app.url}/api/v1/runs`, authed({ method: "POST", body: form }));
}

async function settled(runId: string): Promise<{ run: { status: string; error: { line?: number; code: string } | null }; report: { status: string; totals?: { charged_mAh: number } } | null }> {
  const deadline = Date.now() + 90_000;
  for (;;) {
    const body = (await (await fetch(`${app.url}/api/v1/runs/${runId}`, authed())).json()) as Awaited<ReturnType<typeof settled>>;
    if (body.run.status === "complete" || body.run.status === "failed") return body;
    if (Date.now() > deadline) throw new Error(`run ${runId} still ${body.run.status}\n${app.output()}`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

beforeAll(async () => {
  app = await startAppServer();
  const technician = demoUsers.find((u) => u.role === "technician");
  if (!technician) throw new Error("no demo technician");
  cookie = await signIn(technician.email, technician.password);
  const cells = (await (await fetch(`${app.url}/api/cells?pageSize=1`, authed())).json()) as { items: { serial: string }[] };
  serial = cells.items[0]?.serial ?? "";
  expect(serial).not.toBe("");
});
afterAll(async () => {
  await app?.stop();
});

describe("ingest on the built server", () => {
  it("analyses a log posted to the bench API in a worker thread, and refuses the same bytes again", async () => {
    const text = capacityCheckCsv(7001);
    const posted = await postLog(text, "e2e-capacity.csv");
    expect(posted.status).toBe(202);
    const { run } = (await posted.json()) as { run: { id: string } };
    const done = await settled(run.id);
    expect(done.run.status).toBe("complete");
    expect(done.report?.status).toBe("ok");
    expect(done.report?.totals?.charged_mAh).toBeGreaterThan(500);
    const again = await postLog(text, "e2e-capacity-again.csv");
    expect(again.status).toBe(409);
    expect(await again.json()).toMatchObject({ runId: run.id });
    const raw = await fetch(`${app.url}/api/runs/${run.id}/raw`, authed());
    expect(await raw.text()).toBe(text);
  });

  it("analyses a file sent the browser's way (presigned PUT to the upload service, then its callback)", async () => {
    const text = capacityCheckCsv(7002);
    const file = new File([text], "e2e-browser.csv", { type: "text/csv" });
    const response = await fetch(
      `${app.url}/api/uploadthing?actionType=upload&slug=benchLog`,
      authed({
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ input: { cellSerial: serial, purpose: "cycle life" }, files: [{ name: file.name, size: file.size, type: file.type, lastModified: 0 }] }),
      }),
    );
    expect(response.status).toBe(200);
    const [presigned] = (await response.json()) as PresignedUpload[];
    if (!presigned) throw new Error("no presigned URL");
    const put = await putToPresigned(presigned, file);
    expect(put.putStatus).toBe(200);
    const data = put.putBody.serverData as { outcome: string; runId: string };
    expect(data.outcome).toBe("queued");
    expect((await settled(data.runId)).run.status).toBe("complete");
  });

  it("takes a log of about 20 MB through the bench API (well past any default request-body limit)", async () => {
    const text = capacityCheckCsv(7003, { logInterval_s: 0.03 });
    expect(text.length).toBeGreaterThan(15 * 1024 * 1024);
    const posted = await postLog(text, "e2e-large.csv");
    expect(posted.status).toBe(202);
    const { run } = (await posted.json()) as { run: { id: string; file: { size_bytes: number } } };
    expect(run.file.size_bytes).toBe(Buffer.byteLength(text));
    expect((await settled(run.id)).run.status).toBe("complete");
  });

  it("keeps a malformed log's located error", async () => {
    const posted = await postLog(malformedCsv, "e2e-broken.csv");
    const { run } = (await posted.json()) as { run: { id: string } };
    const done = await settled(run.id);
    expect(done.run).toMatchObject({ status: "failed", error: { code: "non-numeric", line: 6 } });
    expect(done.report).toMatchObject({ status: "reject", code: "non-numeric", line: 6, column: 2 });
  });
});
