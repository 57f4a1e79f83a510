import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import { openDatabase, type DatabaseHandle } from "@/lib/db/client";
import { DataDirectoryInUseError } from "@/lib/db/lock";

const tsx = path.join(process.cwd(), "node_modules", "tsx", "dist", "cli.mjs");
let handle: DatabaseHandle | null = null;
afterEach(async () => {
  await handle?.close();
  handle = null;
});

function tempDir(): string {
  return fs.mkdtempSync(path.join(os.tmpdir(), "kneepoint-lock-"));
}

/** Runs `npm run db:migrate`'s entry point in a second process against the given directory. */
function secondProcess(dataDir: string) {
  return spawnSync(process.execPath, [tsx, "--conditions=react-server", "lib/cli/migrate.ts"], {
    cwd: process.cwd(),
    env: { ...process.env, KNEEPOINT_DATA_DIR: dataDir, DATABASE_URL: "" },
    encoding: "utf8",
    timeout: 60_000,
  });
}

describe("the data-directory lock", () => {
  it("makes a second process fail fast with a clear message while the first holds the directory", async () => {
    const dir = tempDir();
    handle = await openDatabase({ kind: "pglite", dataDir: dir });
    const second = secondProcess(dir);
    expect(second.status).toBe(1);
    expect(second.stderr).toContain(`The database directory ${dir} is already in use by process ${process.pid}`);
    expect(second.stderr).toContain("Only one Kneepoint process may open it at a time");
  });

  it("refuses a second opener inside the same process too", async () => {
    const dir = tempDir();
    handle = await openDatabase({ kind: "pglite", dataDir: dir });
    await expect(openDatabase({ kind: "pglite", dataDir: dir })).rejects.toBeInstanceOf(DataDirectoryInUseError);
  });

  it("lets the next process in once the first has closed, and keeps the rows", async () => {
    const dir = tempDir();
    handle = await openDatabase({ kind: "pglite", dataDir: dir });
    await handle.db.execute("create table probe (n int)");
    await handle.db.execute("insert into probe values (42)");
    await handle.close();
    handle = null;
    expect(fs.existsSync(path.join(dir, "kneepoint.lock"))).toBe(false);
    const second = secondProcess(dir);
    expect(second.stderr).toBe("");
    expect(second.status).toBe(0);
    handle = await openDatabase({ kind: "pglite", dataDir: dir });
    const result = (await handle.db.execute("select n from probe")) as unknown as { rows: unknown[] };
    expect(result.rows).toEqual([{ n: 42 }]);
  });

  it("takes over a lock left by a process that no longer runs (kill -9)", async () => {
    const dir = tempDir();
    // A pid far above pid_max on Linux cannot belong to a live process.
    fs.writeFileSync(path.join(dir, "kneepoint.lock"), JSON.stringify({ pid: 2 ** 30, host: os.hostname(), since: "2026-01-01T00:00:00Z" }));
    handle = await openDatabase({ kind: "pglite", dataDir: dir });
    const holder = JSON.parse(fs.readFileSync(path.join(dir, "kneepoint.lock"), "utf8")) as { pid: number };
    expect(holder.pid).toBe(process.pid);
  });
});
