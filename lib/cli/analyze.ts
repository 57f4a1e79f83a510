/**
 * Command line: analyse one log file and print the report as JSON.
 *
 *   npm run analyze -- <file> [--rated-mah N] [--chemistry lco|nmc|lipo|li-ion|lfp|nimh] [--map mapping.json]
 *
 * Exit 0 with the report on stdout when the file is accepted. When it is rejected, exit 2 with
 * {"status":"reject","reason":...,"line":N} on stdout and a human message on stderr.
 * Usage errors (bad arguments, unreadable files) exit 1 with a message on stderr.
 */
import { accessSync, constants, createReadStream, readFileSync } from "node:fs";
import { basename } from "node:path";
import { analyzeLog, chemistries, chemistryDefaults, isChemistry, type CellLimits } from "@/lib/analysis";
import type { ColumnMapInput } from "@/lib/analysis/read";
import { AnalysisRejected } from "@/lib/analysis/types";

interface Args {
  file: string;
  ratedMah?: number;
  chemistry?: string;
  map?: string;
}

class UsageError extends Error {}

const usage = "usage: npm run analyze -- <file> [--rated-mah N] [--chemistry " + chemistries.join("|") + "] [--map mapping.json]";

function parseArgs(argv: string[]): Args {
  let file: string | undefined;
  const out: Partial<Args> = {};
  for (let k = 0; k < argv.length; k++) {
    const a = argv[k] ?? "";
    const value = (): string => {
      const v = argv[++k];
      if (v === undefined) throw new UsageError(`${a} needs a value`);
      return v;
    };
    if (a === "--rated-mah") {
      const n = Number(value());
      if (!(n > 0) || !Number.isFinite(n)) throw new UsageError("--rated-mah must be a positive number");
      out.ratedMah = n;
    } else if (a === "--chemistry") out.chemistry = value().toLowerCase();
    else if (a === "--map") out.map = value();
    else if (a === "--help" || a === "-h") throw new UsageError(usage);
    else if (a.startsWith("--")) throw new UsageError(`unknown option ${a}`);
    else if (file === undefined) file = a;
    else throw new UsageError("only one file at a time");
  }
  if (file === undefined) throw new UsageError(usage);
  return { file, ...out };
}

function limitsFrom(args: Args): CellLimits {
  let limits: CellLimits = {};
  if (args.chemistry !== undefined) {
    if (!isChemistry(args.chemistry)) throw new UsageError(`unknown chemistry "${args.chemistry}" (one of ${chemistries.join(", ")})`);
    limits = { ...chemistryDefaults[args.chemistry] };
  }
  if (args.ratedMah !== undefined) limits.ratedCapacity_mAh = args.ratedMah;
  return limits;
}

async function main(): Promise<number> {
  let args: Args;
  let limits: CellLimits;
  let columnMap: unknown;
  try {
    args = parseArgs(process.argv.slice(2));
    limits = limitsFrom(args);
    if (args.map !== undefined) {
      try {
        columnMap = JSON.parse(readFileSync(args.map, "utf8"));
      } catch (e) {
        throw new UsageError(`cannot read the column map ${args.map}: ${(e as Error).message}`);
      }
    }
    accessSync(args.file, constants.R_OK); // fail early and plainly on a missing file
  } catch (e) {
    process.stderr.write(`${(e as Error).message}\n`);
    return 1;
  }
  try {
    const { report } = await analyzeLog(createReadStream(args.file), {
      fileName: basename(args.file),
      limits,
      // The reader validates the map and rejects a bad one with a located error.
      ...(columnMap !== undefined ? { columnMap: columnMap as ColumnMapInput } : {}),
    });
    process.stdout.write(JSON.stringify(report) + "\n");
    return 0;
  } catch (e) {
    if (e instanceof AnalysisRejected) {
      const d = e.detail;
      process.stdout.write(JSON.stringify({ status: "reject", reason: d.message, code: d.code, line: d.line ?? null, column: d.column ?? null }) + "\n");
      const where = d.line !== undefined ? ` (line ${d.line}${d.column !== undefined ? `, column ${d.column}` : ""})` : "";
      process.stderr.write(`The log was not accepted${where}: ${d.message}\n`);
      return 2;
    }
    throw e;
  }
}

main().then(
  (code) => {
    process.exitCode = code;
  },
  (e: unknown) => {
    process.stderr.write(`${e instanceof Error ? (e.stack ?? e.message) : String(e)}\n`);
    process.exitCode = 1;
  },
);
