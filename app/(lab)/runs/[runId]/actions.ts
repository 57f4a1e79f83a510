"use server";

import { revalidatePath } from "next/cache";
import { defineAction } from "@/lib/auth/action";
import { startAnalysis } from "@/lib/ingest/analysis-requests";
import { analyseRunInput } from "@/lib/validations/runs";

/** Analyses a finished (or failed) run again, e.g. with another column map; earlier versions are kept. */
export const reanalyseRunAction = defineAction("run.analyse", analyseRunInput, async (input, user) => {
  const started = await startAnalysis(input, user, { onlyWhenDone: true });
  revalidatePath(`/runs/${input.runId}`);
  revalidatePath(`/cells/${encodeURIComponent(started.serial)}`);
  return started;
});
