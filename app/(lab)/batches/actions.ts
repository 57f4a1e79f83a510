"use server";

import { revalidatePath } from "next/cache";
import { defineAction } from "@/lib/auth/action";
import { createBatch } from "@/lib/db/queries/registry";
import { batchInput } from "@/lib/validations/registry";

export const createBatchAction = defineAction("batch.write", batchInput, async (input, user) => {
  const created = await createBatch(input, { id: user.id, name: user.name });
  revalidatePath("/batches");
  return created;
});
