/**
 * Prints, as one JSON line, what the database holds for the given runs (status, error, result
 * row counts), read straight from the tables. For tests that look at a data directory while no
 * server holds it, e.g. right after the server was killed.
 * Usage: KNEEPOINT_DATA_DIR=<dir> tsx --conditions=react-server tests/e2e/support/stored-runs-cli.ts <runId>...
 */
import { runMain, withDatabase } from "@/lib/cli/with-database";
import { storedRun, type StoredRun } from "../../robustness/support/result-rows";

runMain(async () => {
  const ids = process.argv.slice(2);
  const runs = await withDatabase(async (db) => {
    const out: Record<string, StoredRun | null> = {};
    for (const id of ids) out[id] = await storedRun(db, id);
    return out;
  });
  process.stdout.write(`${JSON.stringify(runs)}\n`);
});
