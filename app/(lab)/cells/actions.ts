"use server";

import { revalidatePath } from "next/cache";
import { defineAction } from "@/lib/auth/action";
import { createCell } from "@/lib/db/queries/registry";
import { cellInput } from "@/lib/validations/registry";

export const createCellAction = defineAction("cell.write", cellInput, async (input, user) => {
  const created = await createCell(input, { id: user.id, name: user.name });
  revalidatePath("/cells");
  if (input.batchId) revalidatePath(`/batches/${input.batchId}`);
  return created;
});
