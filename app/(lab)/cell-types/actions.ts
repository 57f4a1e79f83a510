"use server";

import { revalidatePath } from "next/cache";
import { defineAction } from "@/lib/auth/action";
import { createCellType } from "@/lib/db/queries/registry";
import { cellTypeInput } from "@/lib/validations/registry";

export const createCellTypeAction = defineAction("cell-type.write", cellTypeInput, async (input, user) => {
  const created = await createCellType(input, { id: user.id, name: user.name });
  revalidatePath("/cell-types");
  return created;
});
