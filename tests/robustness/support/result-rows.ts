import { count, eq } from "drizzle-orm";
import type { Database } from "@/lib/db/client";
import { analysisVersion, plotSeries, run, runCycle, runFinding, runStep } from "@/lib/db/schema";

export interface StoredRun {
  status: string;
  latestVersion: number | null;
  error: { code: string; message: string; line?: number } | null;
  /** Rows of the run's analysis results, over all its versions. */
  rows: { versions: number; steps: number; cycles: number; findings: number; series: number };
}

/** What the database holds for one run, read straight from the tables rather than through the app's views. */
export async function storedRun(db: Database, runId: string): Promise<StoredRun | null> {
  const [header] = await db.select({ status: run.status, latestVersion: run.latestVersion, error: run.error }).from(run).where(eq(run.id, runId));
  if (!header) return null;
  const counted = async (table: typeof runStep | typeof runCycle | typeof runFinding | typeof plotSeries) =>
    (await db.select({ n: count() }).from(table).innerJoin(analysisVersion, eq(table.analysisId, analysisVersion.id)).where(eq(analysisVersion.runId, runId)))[0]?.n ?? 0;
  const versions = (await db.select({ n: count() }).from(analysisVersion).where(eq(analysisVersion.runId, runId)))[0]?.n ?? 0;
  return {
    status: header.status,
    latestVersion: header.latestVersion,
    error: header.error ? { code: header.error.code, message: header.error.message, line: header.error.line } : null,
    rows: { versions, steps: await counted(runStep), cycles: await counted(runCycle), findings: await counted(runFinding), series: await counted(plotSeries) },
  };
}
