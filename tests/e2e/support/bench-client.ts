/**
 * A client of the running app's bench API, as a lab script would use it: a personal API token
 * (prepared in the data directory before the server starts), multipart POSTs, status polling.
 */
import { execFile } from "node:child_process";
import path from "node:path";
import { promisify } from "node:util";
import type { StoredRun } from "../../robustness/support/result-rows";

const run = promisify(execFile);

export interface RunState {
  id: string;
  status: string;
  cell_serial: string;
  file: { name: string; size_bytes: number; sha256: string };
  error: { code: string; message: string; line?: number } | null;
  latest_version: number | null;
  key_numbers: { charged_mAh: number | null; discharged_mAh: number | null } | null;
}

/**
 * Seeds the demo's users and cells into `<dataRoot>/pglite` and returns a fresh API token of the
 * demo technician and a few of the demo's cell serials. Call it before the server starts: the server then holds the directory.
 */
export async function prepareDataRoot(dataRoot: string): Promise<{ token: string; serials: string[] }> {
  return JSON.parse(await dataRootScript(dataRoot, "prepare-data-root.ts", [])) as { token: string; serials: string[] };
}

/** What the data directory holds for these runs; only while no server holds it. */
export async function storedRuns(dataRoot: string, runIds: string[]): Promise<Record<string, StoredRun | null>> {
  return JSON.parse(await dataRootScript(dataRoot, "stored-runs-cli.ts", runIds)) as Record<string, StoredRun | null>;
}

/** Runs a script of this folder against `<dataRoot>/pglite`, as the app's own scripts run, and answers its last line. */
async function dataRootScript(dataRoot: string, script: string, args: string[]): Promise<string> {
  const { stdout } = await run(process.execPath, [path.join("node_modules", "tsx", "dist", "cli.mjs"), "--conditions=react-server", path.join("tests", "e2e", "support", script), ...args], {
    // The secret only has to pass the env check: seeding hashes passwords without it.
    env: { ...process.env, KNEEPOINT_DATA_DIR: dataDirOf(dataRoot), BETTER_AUTH_SECRET: "prepare-data-root-secret-only-hashes-passwords" },
    maxBuffer: 1 << 20,
  });
  return stdout.trim().split("\n").at(-1) ?? "";
}

/** Where `npm start` keeps the PGlite directory under a data root. */
export const dataDirOf = (dataRoot: string): string => path.join(dataRoot, "pglite");

export class BenchClient {
  constructor(
    readonly url: string,
    private readonly token: string,
  ) {}

  private headers(): Record<string, string> {
    return { authorization: `Bearer ${this.token}` };
  }

  /** Counts the 429s this client waited out, so a test can tell it met the API's rate limit. */
  rateLimitedCount = 0;

  /** One request, waiting out a 429 as a well-behaved bench script does (Retry-After, in ms from the body). */
  private async send(url: string, init: RequestInit = {}): Promise<Response> {
    for (;;) {
      const response = await fetch(url, { ...init, headers: this.headers() });
      if (response.status !== 429) return response;
      this.rateLimitedCount += 1;
      const body = (await response.json()) as { retryAfterMs?: number };
      const waitMs = body.retryAfterMs ?? Number(response.headers.get("retry-after") ?? "1") * 1000;
      await new Promise((r) => setTimeout(r, waitMs));
    }
  }

  /** POST /api/v1/runs with one log file; answers the status and the run (when one was made). */
  async post(fields: Record<string, string>, file: Blob, name: string): Promise<{ status: number; run: RunState | null }> {
    const form = new FormData();
    for (const [k, v] of Object.entries(fields)) form.set(k, v);
    form.set("file", file, name);
    const response = await this.send(`${this.url}/api/v1/runs`, { method: "POST", body: form });
    const body = (await response.json()) as { run?: RunState | null };
    return { status: response.status, run: body.run ?? null };
  }

  async get(runId: string): Promise<RunState> {
    const response = await this.send(`${this.url}/api/v1/runs/${runId}`);
    if (response.status !== 200) throw new Error(`GET run ${runId}: ${response.status} ${await response.text()}`);
    return ((await response.json()) as { run: RunState }).run;
  }

  async cellRuns(serial: string): Promise<RunState[]> {
    const response = await this.send(`${this.url}/api/v1/cells/${encodeURIComponent(serial)}/runs`);
    if (response.status !== 200) throw new Error(`GET runs of ${serial}: ${response.status}`);
    return ((await response.json()) as { runs: RunState[] }).runs;
  }

  /** Polls the run until `done` holds, or throws after `timeout_ms` naming the last status. */
  async waitFor(runId: string, done: (r: RunState) => boolean, timeout_ms: number, every_ms = 50): Promise<RunState> {
    const deadline = Date.now() + timeout_ms;
    for (;;) {
      const state = await this.get(runId);
      if (done(state)) return state;
      if (Date.now() > deadline) throw new Error(`run ${runId} still ${state.status} after ${timeout_ms} ms`);
      await new Promise((r) => setTimeout(r, every_ms));
    }
  }
}

export const settled = (r: RunState): boolean => r.status === "complete" || r.status === "failed";
