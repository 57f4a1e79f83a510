import { z } from "zod";
import { columnMapSchema } from "@/lib/analysis/types";
import { identifierField, optionalNumberField, optionalTextField, textField } from "./fields";

export const runPurposes = ["capacity check", "cycle life", "internal resistance", "formation", "other"] as const;
export const runStatuses = ["queued", "analysing", "complete", "failed"] as const;
export type RunPurpose = (typeof runPurposes)[number];
export type RunStatus = (typeof runStatuses)[number];

/** Bench logs are text; 256 MB covers about 1e7 rows. */
export const maxLogBytes = 256 * 1024 * 1024;
export const maxLogFilesPerUpload = 20;
/** MIME types browsers and bench PCs give CSV/TXT logs. */
export const logMimeTypes = ["text/csv", "text/plain", "text/tab-separated-values", "application/vnd.ms-excel", "application/octet-stream"] as const;
// ".bdf" is the Battery Data Format's own extension for text files (its README, "File extension").
const logExtensions = /\.(csv|txt|tsv|bdf)$/i;

/** Octet-stream says nothing about content, so only a log-like name makes it acceptable. */
export function isAcceptedLogFile(file: { name: string; type: string }): boolean {
  const type = file.type.split(";")[0]?.trim().toLowerCase() ?? "";
  if (type === "" || type === "application/octet-stream") return logExtensions.test(file.name);
  return (logMimeTypes as readonly string[]).includes(type);
}

const blankToUndefined = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);
const optionalUuid = (message: string) => z.preprocess(blankToUndefined, z.uuid({ error: message }).optional());

/** A column map given inline: an object, or its JSON text (multipart forms carry text). */
export const columnMapField = z.preprocess((v) => {
  if (typeof v !== "string") return v;
  try {
    return JSON.parse(v) as unknown;
  } catch {
    return v;
  }
}, columnMapSchema);

/** Earlier than this is a typing or clock error, not a lithium cell test we could be shown. */
const earliestTestEnd = Date.UTC(1991, 0, 1);
/** Bench PCs' clocks drift; a few minutes ahead is still "now". */
const clockSlackMs = 10 * 60 * 1000;

/** When the test ended: an ISO 8601 instant with its offset (the browser adds the reader's own). */
export const testEndedAtField = z.preprocess(
  blankToUndefined,
  z.iso
    .datetime({ offset: true, error: "Give the time the test ended as a date and time, e.g. 2026-11-30T16:45:00+01:00" })
    .refine((v) => Date.parse(v) >= earliestTestEnd, { error: "The test cannot have ended before 1991" })
    .refine((v) => Date.parse(v) <= Date.now() + clockSlackMs, { error: "The test cannot have ended in the future; check the date and the time zone" })
    .optional(),
);

/** The fields that go with a bench log, from the upload page or the bench API. */
export const runUploadInput = z
  .object({
    cellSerial: identifierField("Cell serial"),
    purpose: z.enum(runPurposes, { error: "Choose a test purpose" }),
    ambientTempC: optionalNumberField("Ambient temperature", { min: -60, max: 100 }),
    testEndedAt: testEndedAtField,
    operatorNote: optionalTextField("Operator note", 2000),
    columnMapId: optionalUuid("Choose a saved column map"),
    columnMap: z.preprocess(blankToUndefined, columnMapField.optional()),
    // Only used when the serial is new: where the new cell belongs.
    batchId: optionalUuid("Choose a batch"),
    cellTypeId: optionalUuid("Choose a cell type"),
  })
  .refine((v) => !(v.columnMapId && v.columnMap), { path: ["columnMap"], message: "Give a saved column map or a column map, not both" });
export type RunUploadInput = z.output<typeof runUploadInput>;

/** Start or restart the analysis of a stored run, optionally with a confirmed column map. */
export const analyseRunInput = z
  .object({
    runId: z.uuid({ error: "Choose a run" }),
    columnMapId: optionalUuid("Choose a saved column map"),
    columnMap: z.preprocess(blankToUndefined, columnMapField.optional()),
  })
  .refine((v) => !(v.columnMapId && v.columnMap), { path: ["columnMap"], message: "Give a saved column map or a column map, not both" });
export type AnalyseRunInput = z.output<typeof analyseRunInput>;

export const previewRunInput = z.object({
  runId: z.uuid({ error: "Choose a run" }),
  columnMap: z.preprocess(blankToUndefined, columnMapField.optional()),
});

export const saveColumnMapInput = z.object({
  name: textField("Name", 80),
  map: columnMapField,
});

export const createApiTokenInput = z.object({ name: textField("Name", 80) });
export const revokeApiTokenInput = z.object({ tokenId: z.uuid({ error: "Choose a token" }) });

/** The same fields as JSON from the browser's upload client (the SDK needs a JSON-typed input). */
export const benchLogInput = z
  .object({
    cellSerial: z.string(),
    purpose: z.enum(runPurposes),
    ambientTempC: z.number().optional(),
    testEndedAt: z.string().optional(),
    operatorNote: z.string().optional(),
    columnMapId: z.string().optional(),
    columnMap: columnMapSchema.optional(),
    batchId: z.string().optional(),
    cellTypeId: z.string().optional(),
  })
  .transform((value, ctx): RunUploadInput => {
    const parsed = runUploadInput.safeParse(value);
    if (parsed.success) return parsed.data;
    for (const issue of parsed.error.issues) ctx.addIssue({ code: "custom", path: issue.path, message: issue.message });
    return z.NEVER;
  });
export type BenchLogInput = z.input<typeof benchLogInput>;
