/**
 * One benchmark measurement, run in a fresh child process so peak RSS belongs
 * to this size alone. Prints one JSON line on stdout.
 * Usage: tsx tests/bench/measure.ts <file> <rows> <"read + analyse" | "reader alone">
 */
import { createReadStream, statSync } from "node:fs";
import { prepareRun, type RunKind } from "./analysis";

export interface Measurement {
  rows: number;
  bytes: number;
  seconds: number;
  /** User + system CPU time of the run: steadier than wall time on a shared machine. */
  cpuSeconds: number;
  rowsPerSecond: number;
  mbPerSecond: number;
  peakRssMb: number;
  what: string;
  path: string;
}

async function main(): Promise<void> {
  const [file, rowsText, kind] = process.argv.slice(2);
  if (file === undefined || kind === undefined) throw new Error("usage: measure.ts <file> <rows> <kind>");
  const run = await prepareRun(kind as RunKind);
  if (run === null) {
    process.stdout.write("null\n");
    return;
  }
  const bytes = statSync(file).size;
  const start = performance.now();
  const cpu = process.cpuUsage();
  const result = await run(createReadStream(file, { highWaterMark: 1 << 20 }));
  const seconds = (performance.now() - start) / 1000;
  const used = process.cpuUsage(cpu);
  if (rowsText !== undefined && result.rows !== Number(rowsText)) throw new Error(`read ${result.rows} rows, expected ${rowsText}`);
  const m: Measurement = {
    rows: result.rows,
    bytes,
    seconds,
    cpuSeconds: (used.user + used.system) / 1e6,
    rowsPerSecond: result.rows / seconds,
    mbPerSecond: bytes / 1e6 / seconds,
    // maxRSS is in kilobytes (Node docs, process.resourceUsage).
    peakRssMb: process.resourceUsage().maxRSS / 1024,
    what: result.what,
    path: result.path,
  };
  process.stdout.write(`${JSON.stringify(m)}\n`);
}

main().catch((error: unknown) => {
  console.error(error);
  process.exit(1);
});
