"use server";

import { revalidatePath } from "next/cache";
import { defineAction } from "@/lib/auth/action";
import { addRunNote } from "@/lib/db/queries/notebook";
import { startAnalysis } from "@/lib/ingest/analysis-requests";
import { addRunNoteInput } from "@/lib/validations/notebook";
import { analyseRunInput } from "@/lib/validations/runs";

/** Analyses a finished (or failed) run again, e.g. with another column map; earlier versions are kept. */
export const reanalyseRunAction = defineAction("run.analyse", analyseRunInput, async (input, user) => {
  const started = await startAnalysis(input, user, { onlyWhenDone: true });
  revalidatePath(`/runs/${input.runId}`);
  revalidatePath(`/cells/${encodeURIComponent(started.serial)}`);
  return started;
});

/** Adds a note to a run, or amends an earlier one with a new note; notes are never changed or removed. */
export const addRunNoteAction = defineAction("note.write", addRunNoteInput, async (input, user) => {
  const note = await addRunNote(input, user);
  revalidatePath(`/runs/${input.runId}`);
  return note;
});
