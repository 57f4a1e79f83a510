"use server";

import { revalidatePath } from "next/cache";
import { defineAction } from "@/lib/auth/action";
import { verifySignature } from "@/lib/auth/e-signature";
import { raiseFlagByHand, transitionFlag } from "@/lib/db/queries/flags";
import { serverEnv } from "@/lib/env";
import { kickOutbox } from "@/lib/mail/sender";
import { cellHealthHref, flagHref } from "@/lib/flags/links";
import { stepNeedsSignature } from "@/lib/flags/vocabulary";
import { cellHref } from "@/lib/registry/links";
import { raiseFlagInput, transitionFlagInput } from "@/lib/validations/flags";

/** An engineer's flag on a cell, with a reason; every active engineer gets the alert. */
export const raiseFlagAction = defineAction("flag.raise", raiseFlagInput, async (input, user) => {
  const raised = await raiseFlagByHand(input, { id: user.id, name: user.name }, serverEnv().BETTER_AUTH_URL);
  kickOutbox();
  revalidatePath("/flags");
  revalidatePath(cellHref(raised.serial));
  revalidatePath(cellHealthHref(raised.serial));
  return raised;
});

/**
 * One step of a flag (acknowledge, request a retest, clear, retire the cell), with who, when and
 * why. Clearing is signed: the password is checked before anything is written.
 */
export const transitionFlagAction = defineAction("flag.transition", transitionFlagInput, async ({ password, meaning, ...step }, user) => {
  // The schema has made sure both are there when the step needs them.
  const signature = stepNeedsSignature(step.to) && password && meaning ? { ...(await verifySignature(user.id, password)), meaning } : undefined;
  const result = await transitionFlag(step, { id: user.id, name: user.name }, signature);
  revalidatePath("/flags");
  revalidatePath(flagHref(step.flagId));
  return result;
});
