/**
 * npm run bench [-- --sizes 1e5,1e6,1e7] [-- --papaparse] [-- --ingest [--ingest-repeats 3]] [-- --no-reader]
 *
 * Generates logs of about 1e5, 1e6 and 1e7 rows in a temporary directory,
 * times the analysis of each in a fresh child process (so peak RSS is per
 * size), deletes the files, and prints rows/s, MB/s and peak RSS against the
 * targets: 1e7 rows in under 4 s with peak RSS under 256 MB.
 * --ingest adds the end-to-end ingest time through the built, started app (see ingest.ts);
 * --no-reader leaves out the reader sizes.
 */
import { execFile } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { loadavg, tmpdir } from "node:os";
import { join } from "node:path";
import { promisify } from "node:util";
import { writeLog } from "./generate-log";
import { benchIngest, formatIngest, ingestTarget } from "./ingest";
import type { Measurement } from "./measure";
import { formatModes, measurePapaparseMode, papaparseModeCount, type ModeResult } from "./papaparse-modes";

const run = promisify(execFile);
const targets = { rows: 1e7, seconds: 4, rssMb: 256 };

function option(name: string): string | undefined {
  const k = process.argv.indexOf(name);
  return k >= 0 ? process.argv[k + 1] : undefined;
}

/** Runs a bench script in a fresh Node process with the same TypeScript loader as this one. */
async function child(script: string, args: string[]): Promise<string> {
  const { stdout } = await run(process.execPath, [...process.execArgv, join(__dirname, script), ...args], {
    maxBuffer: 1 << 20,
    env: { ...process.env, KNEEPOINT_BENCH_CHILD: "1" },
  });
  return stdout.trim().split("\n").at(-1) ?? "";
}

function table(rows: Measurement[]): string {
  const lines = [
    "| rows | MB | what | path | s | CPU s | rows/s | MB/s | peak RSS MB |",
    "|---:|---:|---|---|---:|---:|---:|---:|---:|",
    ...rows.map(
      (m) =>
        `| ${m.rows.toExponential(0)} | ${(m.bytes / 1e6).toFixed(1)} | ${m.what} | ${m.path} | ${m.seconds.toFixed(2)} | ${m.cpuSeconds.toFixed(2)} | ${Math.round(m.rowsPerSecond).toLocaleString("en")} | ${m.mbPerSecond.toFixed(1)} | ${m.peakRssMb.toFixed(0)} |`,
    ),
  ];
  return lines.join("\n");
}

async function main(): Promise<void> {
  if (process.argv.includes("--measure-papaparse-mode")) {
    const r = await measurePapaparseMode(Number(option("--measure-papaparse-mode")), option("--file") ?? "");
    process.stdout.write(`${JSON.stringify(r)}\n`);
    return;
  }
  const dir = mkdtempSync(join(tmpdir(), "kneepoint-bench-"));
  try {
    if (process.argv.includes("--papaparse")) {
      const log = await writeLog(join(dir, "papaparse.csv"), 1_000_000);
      const results: ModeResult[] = [];
      for (let mode = 0; mode < papaparseModeCount; mode++)
        results.push(JSON.parse(await child("run.ts", ["--measure-papaparse-mode", String(mode), "--file", log.path])) as ModeResult);
      console.log(`papaparse on ${log.rows} rows (${(log.bytes / 1e6).toFixed(1)} MB), each mode in a fresh process:\n`);
      console.log(formatModes(results));
      rmSync(log.path);
      console.log("");
    }
    if (!process.argv.includes("--no-reader")) await benchReader(dir);
    if (process.argv.includes("--ingest")) {
      const result = await benchIngest(ingestTarget.rows, Number(option("--ingest-repeats") ?? 3), dir);
      console.log(`\n${formatIngest(result)}`);
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

async function benchReader(dir: string): Promise<void> {
  const sizes = (option("--sizes") ?? "1e5,1e6,1e7").split(",").map(Number);
  const results: Measurement[] = [];
  for (const rows of sizes) {
    const file = join(dir, `log-${rows}.csv`);
    await writeLog(file, rows);
    try {
      // The papaparse path is slow (see --papaparse): timed up to 1e6 rows only.
      const kinds = rows <= 1e6 ? (["reader alone", "reader, papaparse path", "read + analyse"] as const) : (["reader alone", "read + analyse"] as const);
      for (const kind of kinds) {
        const m = JSON.parse(await child("measure.ts", [file, String(rows), kind])) as Measurement | null;
        if (m) results.push(m);
      }
    } finally {
      rmSync(file, { force: true });
    }
  }
  console.log(table(results));
  console.log(`\n(s: wall time; CPU s: user + system time of the child; load average ${loadavg().map((x) => x.toFixed(1)).join(" ")})`);
  const big = results.find((m) => m.rows >= targets.rows && m.what === "read + analyse") ?? results.find((m) => m.rows >= targets.rows);
  if (big)
    console.log(
      `\ntarget for ${targets.rows.toExponential(0)} rows (${big.what}): < ${targets.seconds} s and < ${targets.rssMb} MB peak RSS -> ${big.seconds < targets.seconds ? "time met" : "time MISSED"}, ${big.peakRssMb < targets.rssMb ? "memory met" : "memory MISSED"}`,
    );
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});
