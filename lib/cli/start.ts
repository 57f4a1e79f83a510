/**
 * `npm start`: the whole lab on one machine. Prepares the data directory and secrets, applies
 * migrations, seeds the demo into an empty database, starts the local stand-ins for hosted
 * services, builds the app when its sources changed, and runs it until Ctrl-C.
 * `npm run dev` does the same with the Next.js development server instead of a build.
 */
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { closeDatabase, installDatabaseHandle, openDatabase, type DatabaseTarget } from "@/lib/db/client";
import { seedDemoRuns } from "@/lib/demo/seed-runs";
import { seedDemo } from "@/lib/db/seed";
import { stopAnalysis } from "@/lib/ingest/runner";
import { uploadEnvProblems, UploadServiceNotConfigured } from "@/lib/uploads/env";
import { startLocalServices, type LocalServices } from "./local-services";

const root = process.cwd();
const dev = process.argv.includes("--dev");
const port = Number(process.env.PORT ?? 3000);
const dataRoot = path.resolve(process.env.KNEEPOINT_DATA_ROOT ?? "data");
const nextBin = path.join(root, "node_modules", "next", "dist", "bin", "next");

function authSecret(): string {
  if (process.env.BETTER_AUTH_SECRET) return process.env.BETTER_AUTH_SECRET;
  const file = path.join(dataRoot, "auth-secret");
  if (!fs.existsSync(file)) {
    fs.mkdirSync(dataRoot, { recursive: true });
    fs.writeFileSync(file, randomBytes(32).toString("hex"), { mode: 0o600 });
  }
  return fs.readFileSync(file, "utf8").trim();
}

function newestSourceTime(): number {
  let newest = 0;
  const walk = (dir: string) => {
    for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, entry.name);
      if (entry.isDirectory()) walk(full);
      else newest = Math.max(newest, fs.statSync(full).mtimeMs);
    }
  };
  for (const dir of ["app", "components", "lib", "public", "drizzle"]) if (fs.existsSync(dir)) walk(path.join(root, dir));
  for (const file of ["package-lock.json", "next.config.ts", ".postcssrc.json"]) if (fs.existsSync(file)) newest = Math.max(newest, fs.statSync(file).mtimeMs);
  return newest;
}

function buildIfStale(env: NodeJS.ProcessEnv): void {
  const buildId = path.join(root, ".next", "BUILD_ID");
  if (fs.existsSync(buildId) && fs.statSync(buildId).mtimeMs > newestSourceTime()) return;
  console.log("Building the app (first start or changed sources; about a minute)…");
  const result = spawnSync(process.execPath, [nextBin, "build"], { stdio: "inherit", env });
  if (result.status !== 0) throw new Error("The build failed; see the messages above.");
}

async function main(): Promise<void> {
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    NODE_ENV: dev ? "development" : "production",
    NEXT_TELEMETRY_DISABLED: "1",
    // Our own SIGTERM/SIGINT handler closes the database before the server exits.
    NEXT_MANUAL_SIG_HANDLE: "true",
    KNEEPOINT_DATA_DIR: process.env.KNEEPOINT_DATA_DIR ?? path.join(dataRoot, "pglite"),
    BETTER_AUTH_SECRET: authSecret(),
    BETTER_AUTH_URL: process.env.BETTER_AUTH_URL ?? `http://localhost:${port}`,
  };

  const services: LocalServices = await startLocalServices(dataRoot, env);
  // Values set explicitly in the environment (e.g. the hosted upload service) win over local defaults.
  for (const [key, value] of Object.entries(services.env)) env[key] ??= value;
  // Half-configured upload settings would send lab files to the hosted service: refuse to start.
  const uploadProblems = uploadEnvProblems(env);
  if (uploadProblems.length > 0) {
    await services.close();
    throw new UploadServiceNotConfigured(uploadProblems);
  }

  // Migrate and seed before the server starts: a PGlite directory may have only one process at a time.
  const target: DatabaseTarget = env.DATABASE_URL ? { kind: "postgres", url: env.DATABASE_URL } : { kind: "pglite", dataDir: String(env.KNEEPOINT_DATA_DIR) };
  const handle = await openDatabase(target);
  installDatabaseHandle(handle);
  try {
    const seeded = await seedDemo(handle.db);
    console.log(seeded.seeded ? `Seeded the demo scenario (${seeded.users} users, ${seeded.cells} cells).` : "Database ready.");
    if (seeded.seeded && !process.argv.includes("--no-demo-runs")) {
      // The demo's runs go through the real upload service and analysis worker, configured as the app will be.
      Object.assign(process.env, services.env, { UPLOADTHING_CALLBACK_URL: env.UPLOADTHING_CALLBACK_URL });
      const stored = await seedDemoRuns(handle.db, (done, total) => {
        if (done === total || done % 10 === 0) console.log(`Analysing the demo's bench logs: ${done} of ${total}`);
      });
      console.log(`Stored and analysed ${stored} demo runs.`);
    }
  } finally {
    await stopAnalysis();
    await closeDatabase();
  }

  if (!dev) buildIfStale(env);
  const child: ChildProcess = spawn(process.execPath, [nextBin, dev ? "dev" : "start", "-p", String(port)], { stdio: "inherit", env });
  console.log(`Kneepoint: http://localhost:${port} (sign-in details for the demo users are in the README)`);

  const stop = (signal: NodeJS.Signals) => child.kill(signal);
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
  const code: number = await new Promise((resolve) => child.on("exit", (c) => resolve(c ?? 0)));
  await services.close();
  process.exit(code);
}

main().catch((error: unknown) => {
  console.error(error instanceof Error ? error.message : error);
  process.exit(1);
});
