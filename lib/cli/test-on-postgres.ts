/**
 * `npm run test:pg`: the integration suites again, on the PostgreSQL server named by
 * KNEEPOINT_TEST_PG_URL (`.ci/run` starts one). Without that variable it says so and does nothing,
 * so a developer without a server still gets a green `npm test` from the embedded database alone.
 * The URL reaches the suites as TEST_DATABASE_URL for this step only: the files share the server's
 * one database, so they run one at a time here, while the main suite runs in parallel on PGlite.
 */
import { spawnSync } from "node:child_process";
import path from "node:path";

const url = process.env.KNEEPOINT_TEST_PG_URL;
if (!url) {
  console.log("test:pg: KNEEPOINT_TEST_PG_URL is not set; the integration suites ran on the embedded database only.");
  process.exit(0);
}
const integrationDirs = ["tests/db", "tests/registry", "tests/security", "tests/ingest", "tests/audit", "tests/flags", "tests/notebook", "tests/export", "tests/robustness"];
console.log(`test:pg: running ${integrationDirs.join(", ")} on ${url.replace(/:[^:@/]+@/, ":***@")}`);
const vitest = path.join(process.cwd(), "node_modules", "vitest", "vitest.mjs");
const result = spawnSync(process.execPath, [vitest, "run", "--config", "tests/vitest.config.ts", "--no-file-parallelism", ...integrationDirs], {
  stdio: "inherit",
  env: { ...process.env, TEST_DATABASE_URL: url },
});
process.exit(result.status ?? 1);
