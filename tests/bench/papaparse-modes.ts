/**
 * Measures papaparse's faster modes on a generated log, to choose how the
 * papaparse path parses and to compare it with the hand-written numeric path.
 * Run: npm run bench -- --papaparse [rows]
 */
import { createReadStream, readFileSync, statSync } from "node:fs";
import Papa from "papaparse";

export interface ModeResult {
  mode: string;
  seconds: number;
  /** User + system CPU time: steadier than wall time on a shared machine. */
  cpuSeconds: number;
  mbPerS: number;
  rows: number;
}

function sumNumbers(row: readonly string[]): number {
  let s = 0;
  for (const cell of row) s += Number(cell);
  return s;
}

async function streamChunks(path: string, config: { fastMode: boolean }): Promise<number> {
  let rows = 0;
  let carry = "";
  const decoder = new TextDecoder();
  for await (const chunk of createReadStream(path, { highWaterMark: 1 << 20 })) {
    const text = carry + decoder.decode(chunk as Buffer, { stream: true });
    const cut = text.lastIndexOf("\n");
    carry = text.slice(cut + 1);
    const result = Papa.parse<string[]>(text.slice(0, cut), { delimiter: ",", fastMode: config.fastMode });
    for (const row of result.data) sumNumbers(row);
    rows += result.data.length;
  }
  return rows;
}

function nodeStream(path: string): Promise<number> {
  return new Promise((resolve, reject) => {
    let rows = 0;
    const parser = Papa.parse(Papa.NODE_STREAM_INPUT, { delimiter: ",", fastMode: true });
    parser.on("data", (row: string[]) => {
      sumNumbers(row);
      rows++;
    });
    parser.on("end", () => resolve(rows));
    parser.on("error", reject);
    createReadStream(path, { highWaterMark: 1 << 20 }).pipe(parser);
  });
}

type ModeRun = (text: string, path: string) => Promise<number> | number;

const modes: ReadonlyArray<readonly [string, ModeRun]> = [
  [
    "whole string, default (auto fast mode), + Number()",
    (text) => {
      const r = Papa.parse<string[]>(text, { delimiter: "," });
      for (const row of r.data) sumNumbers(row);
      return r.data.length;
    },
  ],
  [
    "whole string, fastMode: false (quote-aware), + Number()",
    (text) => {
      const r = Papa.parse<string[]>(text, { delimiter: ",", fastMode: false });
      for (const row of r.data) sumNumbers(row);
      return r.data.length;
    },
  ],
  [
    "whole string, fastMode + dynamicTyping",
    (text) => Papa.parse<number[]>(text, { delimiter: ",", fastMode: true, dynamicTyping: true }).data.length,
  ],
  [
    "whole string, fastMode + step callback, + Number()",
    (text) => {
      let n = 0;
      Papa.parse<string[]>(text, {
        delimiter: ",",
        fastMode: true,
        step: (r) => {
          sumNumbers(r.data);
          n++;
        },
      });
      return n;
    },
  ],
  ["file stream, 1 MiB blocks cut at newline, fastMode, + Number()", (_t, path) => streamChunks(path, { fastMode: true })],
  ["file stream, 1 MiB blocks, fastMode: false, + Number()", (_t, path) => streamChunks(path, { fastMode: false })],
  ["NODE_STREAM_INPUT duplex, fastMode, + Number()", (_t, path) => nodeStream(path)],
];

export const papaparseModeCount = modes.length;

/** Runs one mode on an existing file (call it in a fresh process so modes do not share heap state). */
export async function measurePapaparseMode(index: number, path: string): Promise<ModeResult> {
  const entry = modes[index];
  if (!entry) throw new Error(`no papaparse mode ${index}`);
  const [mode, run] = entry;
  // Stream modes must not pay for a whole-file string sitting in the heap.
  const text = mode.startsWith("whole string") ? readFileSync(path, "utf8") : "";
  const bytes = statSync(path).size;
  const start = performance.now();
  const cpu = process.cpuUsage();
  const rows = await run(text, path);
  const seconds = (performance.now() - start) / 1000;
  const used = process.cpuUsage(cpu);
  return { mode, seconds, cpuSeconds: (used.user + used.system) / 1e6, mbPerS: bytes / 1e6 / seconds, rows };
}

export function formatModes(results: readonly ModeResult[]): string {
  const lines = ["| papaparse mode | rows | s | CPU s | MB/s (wall) | MB/s (CPU) |", "|---|---:|---:|---:|---:|---:|"];
  for (const r of results)
    lines.push(
      `| ${r.mode} | ${r.rows} | ${r.seconds.toFixed(2)} | ${r.cpuSeconds.toFixed(2)} | ${r.mbPerS.toFixed(1)} | ${(r.mbPerS * (r.seconds / r.cpuSeconds)).toFixed(1)} |`,
    );
  return lines.join("\n");
}
