import "server-only";
import fs from "node:fs";
import path from "node:path";
import { eq } from "drizzle-orm";
import type { Database } from "@/lib/db/client";
import { run, user } from "@/lib/db/schema";
import { demoUsers } from "@/lib/db/seed-users";
import { admitStoredFile } from "@/lib/ingest/intake";
import { analysisIdle } from "@/lib/ingest/runner";
import { storeFile } from "@/lib/uploads/storage";
import type { RunPurpose } from "@/lib/validations/runs";

const logsDir = path.join(process.cwd(), "public", "demo-logs");

interface DemoRun {
  file: string;
  serial: string;
  purpose: RunPurpose;
  note: string;
  /** When the invented test ended: the demo's logs were "uploaded" long after their benches finished. */
  testEndedAt: Date;
}

/** The demo lots' arrival days (lib/db/seed.ts); each cell's incoming check follows within days. */
const lotArrival: Record<string, string> = { "lot-PA": "2026-10-06", "lot-PB": "2026-11-03" };
/** Cells checked at once on the demo lab's bench channels. */
const channels = 8;

/** Day `days` after the ISO date, at `hour` UTC. */
const dayAfter = (isoDate: string, days: number, hour: number) => new Date(Date.parse(`${isoDate}T00:00:00Z`) + days * 86_400_000 + hour * 3_600_000);

/** The demo's stored runs: every cell of two lots checked on arrival, one cycle-life test, one resistance test. */
function demoRuns(): DemoRun[] {
  const runs: DemoRun[] = [];
  for (const lot of ["lot-PA", "lot-PB"]) {
    const arrival = lotArrival[lot] ?? "2026-10-01";
    fs.readdirSync(path.join(logsDir, lot))
      .sort()
      .forEach((file, k) => {
        const serial = file.replace(/-incoming-capacity\.csv$/, "");
        const testEndedAt = dayAfter(arrival, 2 + Math.floor(k / channels), 8 + (k % channels));
        runs.push({ file: path.join(lot, file), serial, purpose: "capacity check", note: "Demo data (invented): incoming capacity check, 0.2C discharge after a CC-CV charge.", testEndedAt });
      });
  }
  runs.push({ file: "PB-0019-cycle-life.tsv", serial: "PB-0019", purpose: "cycle life", note: "Demo data (invented): 75 cycles at 1C.", testEndedAt: dayAfter("2026-11-03", 17, 14) });
  runs.push({ file: "PA-0003-internal-resistance.csv", serial: "PA-0003", purpose: "internal resistance", note: "Demo data (invented): 0.2 It for 10 s, then 1 It for 1 s.", testEndedAt: dayAfter("2026-10-06", 6, 11) });
  return runs;
}

/**
 * Stores the demo's bench logs through the upload service and analyses them with the same intake
 * and worker the upload page uses. Runs only on a database without runs.
 */
export async function seedDemoRuns(db: Database, onProgress: (done: number, total: number) => void = () => {}): Promise<number> {
  if ((await db.$count(run)) > 0) return 0;
  const technician = demoUsers.find((u) => u.role === "technician");
  const [actor] = technician ? await db.select({ id: user.id, name: user.name }).from(user).where(eq(user.email, technician.email)) : [];
  if (!actor) throw new Error("seed: the demo technician is missing");

  const runs = demoRuns();
  let done = 0;
  for (const demo of runs) {
    const bytes = fs.readFileSync(path.join(logsDir, demo.file));
    const name = path.basename(demo.file);
    const stored = await storeFile(new Blob([new Uint8Array(bytes)]), name, name.endsWith(".tsv") ? "text/tab-separated-values" : "text/csv");
    await admitStoredFile(
      { key: stored.key, name, size: stored.size },
      { cellSerial: demo.serial, newCell: { batchId: undefined, cellTypeId: undefined }, mayCreateCell: false, purpose: demo.purpose, ambientTempC: 23, testEndedAt: demo.testEndedAt.toISOString(), operatorNote: demo.note, columnMap: null },
      "api",
      actor,
    );
    onProgress(++done, runs.length);
  }
  await analysisIdle();
  return runs.length;
}
