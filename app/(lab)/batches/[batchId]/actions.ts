"use server";

import { revalidatePath } from "next/cache";
import { defineAction } from "@/lib/auth/action";
import { importSerials } from "@/lib/db/queries/registry";
import { AppError } from "@/lib/http/errors";
import { serialImportInput } from "@/lib/validations/registry";

/**
 * Registers a batch's serial list all at once or not at all. Problems come back as field errors
 * keyed "serials.<index>" (0-based, as zod keys an invalid entry), so the browser maps both kinds
 * back to the lines of the file the list came from.
 */
export const importSerialsAction = defineAction("cell.import", serialImportInput, async (input, user) => {
  const result = await importSerials(input.batchId, input.serials, { id: user.id, name: user.name });
  if ("problems" in result) {
    const fieldErrors: Record<string, string[]> = {};
    for (const problem of result.problems) (fieldErrors[`serials.${problem.index - 1}`] ??= []).push(problem.message);
    const n = result.problems.length;
    throw new AppError("conflict", `Nothing was registered: ${n} ${n === 1 ? "serial needs" : "serials need"} attention.`, { fieldErrors });
  }
  revalidatePath(`/batches/${input.batchId}`);
  revalidatePath("/cells");
  return result;
});
