/**
 * Robustness of the running app (issue 7): 20 uploads at once through the bench API are each
 * stored exactly once; a kill -9 of the server in the middle of an analysis leaves no half-stored
 * run, the restarted server takes over the dead process's lock and finishes or fails the run; and
 * while a server runs, a second opener of its data directory is refused with the lock message.
 * Loopback only; every wait has a deadline.
 */
import { execFile } from "node:child_process";
import { mkdtempSync, openAsBlob, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { writeLog, type GeneratedLog } from "../bench/generate-log";
import { capacityCheckCsv } from "../support/bench-logs";
import { startAppServer, newDataRoot, type AppServer } from "./support/app-server";
import { BenchClient, dataDirOf, prepareDataRoot, settled, storedRuns, type RunState } from "./support/bench-client";
import { isAlive, nextServerPid } from "./support/process-tree";

const run = promisify(execFile);
const concurrentUploads = 20;

let dataRoot: string;
let serials: string[];
let token: string;
let app: AppServer | undefined;
let client: BenchClient;
let logDir: string;
/** Run ids of the concurrent uploads, by cell serial. */
const posted = new Map<string, string[]>();

async function startOn(root: string): Promise<void> {
  app = await startAppServer({}, { dataRoot: root });
  client = new BenchClient(app.url, token);
}

beforeAll(async () => {
  dataRoot = newDataRoot();
  logDir = mkdtempSync(join(tmpdir(), "kneepoint-robust-logs-"));
  ({ token, serials } = await prepareDataRoot(dataRoot));
  expect(serials.length).toBeGreaterThanOrEqual(3);
  await startOn(dataRoot);
});

afterAll(async () => {
  await app?.stop();
  rmSync(logDir, { recursive: true, force: true });
  rmSync(dataRoot, { recursive: true, force: true });
});

describe("20 uploads at once through the running server", () => {
  it("stores each exactly once and loses none", async () => {
    const cells = serials.slice(0, 2);
    const uploads = Array.from({ length: concurrentUploads }, (_, k) => ({
      serial: cells[k % cells.length] ?? "",
      // A different seed per upload: different bytes, so none is a duplicate of another.
      text: capacityCheckCsv(9100 + k, { logInterval_s: 30 }),
      name: `concurrent-${k}.csv`,
    }));
    const answers = await Promise.all(uploads.map((u) => client.post({ cellSerial: u.serial, purpose: "capacity check" }, new Blob([u.text], { type: "text/csv" }), u.name)));
    expect(answers.map((a) => a.status)).toEqual(uploads.map(() => 202));
    const ids = answers.map((a) => a.run?.id ?? "");
    expect(new Set(ids).size).toBe(concurrentUploads);
    answers.forEach((a, k) => {
      expect(a.run).toMatchObject({ cell_serial: uploads[k]?.serial, file: { name: uploads[k]?.name, size_bytes: Buffer.byteLength(uploads[k]?.text ?? "") } });
      const mine = posted.get(uploads[k]?.serial ?? "") ?? [];
      posted.set(uploads[k]?.serial ?? "", [...mine, ids[k] ?? ""]);
    });

    const done = await Promise.all(ids.map((id) => client.waitFor(id, settled, 240_000, 250)));
    expect(done.map((r) => r.status)).toEqual(ids.map(() => "complete"));
    // Each log's own charge: a 0.5C charge of a 1000 mAh cell from 2 % state of charge (the generator's scenario).
    for (const r of done) expect(r.key_numbers?.charged_mAh).toBeGreaterThan(900);

    // The cells list exactly these runs: none lost, none twice (the demo seed stores no runs on them).
    for (const [serial, expected] of posted) {
      const listed = (await client.cellRuns(serial)).map((r) => r.id);
      expect(listed).toHaveLength(expected.length);
      expect([...listed].sort()).toEqual([...expected].sort());
    }
  }, 300_000);
});

describe("kill -9 of the server during an analysis, then a restart on the same data", () => {
  let log: GeneratedLog;
  let interrupted: RunState;

  it("catches a large log while it is being analysed and kills the server there", async () => {
    if (!app) throw new Error("no server");
    // About 45 MB: its analysis lasts long enough (seconds) for the 20 ms polling below to see it under way.
    log = await writeLog(join(logDir, "large.csv"), 2_000_000);
    const answer = await client.post({ cellSerial: serials[2] ?? "", purpose: "cycle life" }, await openAsBlob(log.path, { type: "text/csv" }), "large.csv");
    expect(answer.status).toBe(202);
    interrupted = await client.waitFor(answer.run?.id ?? "", (r) => r.status !== "queued", 60_000, 20);
    // If it settled before we looked, this test proves nothing about an interrupted analysis: fail loudly.
    expect(interrupted.status).toBe("analysing");

    const serverPid = nextServerPid(app.process.pid ?? 0);
    process.kill(serverPid, "SIGKILL");
    // `npm start` sees its server die and exits too, closing the local services.
    await app.stop();
    expect(isAlive(serverPid)).toBe(false);
    app = undefined;
  }, 180_000);

  it("leaves the database openable, with the interrupted run holding no result rows", async () => {
    // This opener takes over the dead server's lock; a half-written transaction would show here as rows.
    const runs = await storedRuns(dataRoot, [interrupted.id]);
    expect(runs[interrupted.id]).toMatchObject({ status: "analysing", latestVersion: null, rows: { versions: 0, steps: 0, cycles: 0, findings: 0, series: 0 } });
  }, 120_000);

  it("restarts on the same data and finishes or fails the interrupted run, never leaving it analysing", async () => {
    await startOn(dataRoot);
    const after = await client.waitFor(interrupted.id, settled, 240_000, 250);
    expect(["complete", "failed"]).toContain(after.status);
    if (after.status === "failed") expect(after.error?.message.trim()).not.toBe("");
    else expect(after.latest_version).toBe(1);
    // The concurrent uploads stored before the kill are all still there.
    for (const [serial, expected] of posted) expect((await client.cellRuns(serial)).map((r) => r.id).sort()).toEqual([...expected].sort());
  }, 300_000);

  it("refuses a second opener of the data directory while the restarted server runs", async () => {
    if (!app) throw new Error("no server");
    const holder = nextServerPid(app.process.pid ?? 0);
    const second = await run("npm", ["run", "--silent", "db:migrate"], { env: { ...process.env, KNEEPOINT_DATA_DIR: dataDirOf(dataRoot) } }).then(
      () => ({ failed: false, output: "" }),
      (error: { stdout?: string; stderr?: string }) => ({ failed: true, output: `${error.stdout ?? ""}${error.stderr ?? ""}` }),
    );
    expect(second.failed).toBe(true);
    expect(second.output).toContain(`already in use by process ${holder}`);
    expect(second.output).toContain("Only one Kneepoint process may open it at a time");
  }, 120_000);

  it("stored the resumed run whole, or nothing of the failed one", async () => {
    if (!app) throw new Error("no server");
    const final = await client.get(interrupted.id);
    await app.stop();
    app = undefined;
    const stored = (await storedRuns(dataRoot, [interrupted.id]))[interrupted.id];
    if (final.status === "complete") {
      expect(stored).toMatchObject({ status: "complete", latestVersion: 1, rows: { versions: 1 } });
      expect(stored?.rows.steps).toBeGreaterThan(0);
      expect(stored?.rows.series).toBeGreaterThan(0);
    } else {
      expect(stored).toMatchObject({ status: "failed", latestVersion: null, rows: { versions: 0, steps: 0, cycles: 0, findings: 0, series: 0 } });
    }
  }, 120_000);
});
