"use server";

import { revalidatePath } from "next/cache";
import { defineAction } from "@/lib/auth/action";
import { verifySignature } from "@/lib/auth/e-signature";
import { decideLot } from "@/lib/db/queries/quality";
import { batchQualityHref } from "@/lib/flags/links";
import { batchHref } from "@/lib/registry/links";
import { lotDecisionInput } from "@/lib/validations/flags";

/**
 * A QA lead accepts, rejects or holds a lot with a reason and signs it with their password and a
 * meaning; the figures in view are recorded with it. The password is checked before anything is written.
 */
export const decideLotAction = defineAction("lot.decide", lotDecisionInput, async ({ password, meaning, ...decision }, user) => {
  const signer = await verifySignature(user.id, password);
  const decided = await decideLot(decision, { id: user.id, name: user.name }, { ...signer, meaning });
  revalidatePath(batchHref(decision.batchId));
  revalidatePath(batchQualityHref(decision.batchId));
  revalidatePath("/batches");
  return decided;
});
