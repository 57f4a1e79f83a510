/**
 * The worker pool on its own: jobs run in worker threads, urgent ones first, and a worker that
 * dies takes only its own job down.
 */
import { createHash } from "node:crypto";
import { createServer } from "node:http";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeServer, listen } from "@/fakes/shared/http";
import { WorkerCrashed, WorkerPool } from "@/lib/ingest/pool";

const body = Buffer.from("time_s,voltage_V,current_A\n".repeat(2000));
let url: string;
const server = createServer((req, res) => {
  if (req.url === "/hang") return; // never answers: the job stays running
  res.writeHead(200, { "content-type": "text/csv" });
  res.end(body);
});

beforeAll(async () => {
  url = `http://127.0.0.1:${await listen(server, 0, "127.0.0.1")}`;
});
afterAll(async () => {
  server.closeAllConnections();
  await closeServer(server);
});

describe("WorkerPool", () => {
  it("hashes a file in a worker thread (SHA-256 as node:crypto computes it)", async () => {
    const pool = new WorkerPool(1);
    try {
      const result = await pool.run({ kind: "hash", url: `${url}/file.csv` });
      expect(result).toEqual({ sha256: createHash("sha256").update(body).digest("hex"), bytes: body.length });
    } finally {
      await pool.close();
    }
  });

  it("fails the running job with WorkerCrashed when its worker is stopped, and keeps serving", async () => {
    const pool = new WorkerPool(1);
    try {
      const hanging = pool.run({ kind: "hash", url: `${url}/hang` });
      const later = pool.run({ kind: "hash", url: `${url}/file.csv` });
      // Stop every worker from outside, as an out-of-memory kill would.
      await new Promise((r) => setTimeout(r, 1500));
      await (pool as unknown as { slots: Set<{ worker: { terminate(): Promise<number> } }> }).slots.values().next().value?.worker.terminate();
      await expect(hanging).rejects.toBeInstanceOf(WorkerCrashed);
      await expect(later).resolves.toMatchObject({ bytes: body.length });
    } finally {
      await pool.close();
    }
  });
});
