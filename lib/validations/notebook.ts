import { z } from "zod";
import { pageQuery, textField } from "./fields";
import { cellStatuses } from "./registry";

/** A note is a paragraph or a few, not a report: longer text belongs in an attached file. */
export const maxNoteLength = 4000;

const blankToUndefined = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);

export const addRunNoteInput = z.object({
  runId: z.uuid({ error: "Choose a run" }),
  text: textField("Note", maxNoteLength),
  /** The id of the note this one corrects; the corrected note is kept as written. */
  amends: z.preprocess(blankToUndefined, z.coerce.number({ error: "Choose the note to amend" }).int().positive().optional()),
});
export type AddRunNoteInput = z.output<typeof addRunNoteInput>;

export const batchCellSorts = ["serial", "status", "capacity", "soh", "dcir", "ce", "findings", "tested"] as const;
export type BatchCellSort = (typeof batchCellSorts)[number];

/** The batch page's cell table: search, status, sort and page, as the URL carries them. */
export const batchCellsQuery = z.object({
  ...pageQuery,
  sort: z.enum(batchCellSorts).default("serial"),
  dir: z.enum(["asc", "desc"]).default("asc"),
  status: z.enum(cellStatuses).optional(),
  /** "tested": cells with a delivered capacity; "untested": cells without one yet. */
  tested: z.enum(["tested", "untested"]).optional(),
});
export type BatchCellsQuery = z.output<typeof batchCellsQuery>;
