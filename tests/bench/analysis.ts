/**
 * What the benchmark times: the full analysis (read + analyse through
 * analyzeLog) once lib/analysis/index.ts provides it, and the reader alone.
 */
import { existsSync } from "node:fs";
import { join } from "node:path";
import { readLog } from "@/lib/analysis/read";

export type RunKind = "read + analyse" | "reader alone" | "reader, papaparse path";

export interface RunResult {
  rows: number;
  what: RunKind;
  path: string;
}

export type Run = (source: AsyncIterable<Uint8Array>) => Promise<RunResult>;

type AnalyzeLog = (source: AsyncIterable<Uint8Array>) => Promise<unknown>;

async function findAnalyzeLog(): Promise<AnalyzeLog | null> {
  const index = join(process.cwd(), "lib", "analysis", "index.ts");
  if (!existsSync(index)) return null;
  const mod = (await import(index)) as { analyzeLog?: AnalyzeLog };
  return typeof mod.analyzeLog === "function" ? mod.analyzeLog : null;
}

/** The reader's part of the report ({ rows, parser }), read defensively: the report shape is the analyser's. */
function readPartOf(output: unknown): { rows: number; parser: string } {
  const read = (output as { report?: { read?: { rows?: unknown; parser?: unknown } | null } } | null)?.report?.read;
  return {
    rows: typeof read?.rows === "number" ? read.rows : Number.NaN,
    parser: typeof read?.parser === "string" ? read.parser : "?",
  };
}

function readerAlone(what: RunKind, parser: "auto" | "papaparse"): Run {
  return async (source) => {
    // A consumer that touches every value, so no work can be skipped.
    let checksum = 0;
    const summary = await readLog(
      source,
      (b) => {
        for (let k = 0; k < b.length; k++) checksum += b.v[k]! + b.i[k]!;
      },
      { parser },
    );
    if (Number.isNaN(checksum)) throw new Error("NaN in the batches");
    return { rows: summary.rows, what, path: summary.path };
  };
}

/** Loads what is to be timed (module loading is not part of the measurement). */
export async function prepareRun(kind: RunKind): Promise<Run | null> {
  if (kind !== "read + analyse") return readerAlone(kind, kind === "reader alone" ? "auto" : "papaparse");
  const analyzeLog = await findAnalyzeLog();
  if (analyzeLog === null) return null;
  return async (source) => {
    const read = readPartOf(await analyzeLog(source));
    return { rows: read.rows, what: "read + analyse", path: read.parser };
  };
}
