"use server";

import { revalidatePath } from "next/cache";
import { defineAction } from "@/lib/auth/action";
import { decideLot } from "@/lib/db/queries/quality";
import { batchQualityHref } from "@/lib/flags/links";
import { batchHref } from "@/lib/registry/links";
import { lotDecisionInput } from "@/lib/validations/flags";

/** A QA lead accepts, rejects or holds a lot with a reason; the figures in view are recorded with it. */
export const decideLotAction = defineAction("lot.decide", lotDecisionInput, async (input, user) => {
  const decided = await decideLot(input, { id: user.id, name: user.name });
  revalidatePath(batchHref(input.batchId));
  revalidatePath(batchQualityHref(input.batchId));
  revalidatePath("/batches");
  return decided;
});
