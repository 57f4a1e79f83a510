"use server";

import { revalidatePath } from "next/cache";
import { defineAction } from "@/lib/auth/action";
import { saveColumnMap } from "@/lib/db/queries/column-maps";
import { previewStoredRun, startAnalysis } from "@/lib/ingest/analysis-requests";
import { analyseRunInput, previewRunInput, saveColumnMapInput } from "@/lib/validations/runs";

/** Detection and the first rows of an uploaded run's stored file, to confirm or correct the columns. */
export const previewUploadAction = defineAction("run.upload", previewRunInput, async (input) => previewStoredRun(input.runId, input.columnMap));

/** Starts (or restarts) a run's analysis with the confirmed column map; each completed analysis is a new version. */
export const analyseRunAction = defineAction("run.analyse", analyseRunInput, async (input, user) => {
  const started = await startAnalysis(input, user);
  revalidatePath(`/cells/${encodeURIComponent(started.serial)}`);
  return started;
});

/** Saves a corrected column map under a name (saving the same name again replaces it). */
export const saveColumnMapAction = defineAction("column-map.write", saveColumnMapInput, async (input, user) => {
  const saved = await saveColumnMap(input.name, input.map, { id: user.id, name: user.name });
  revalidatePath("/upload");
  return saved;
});
