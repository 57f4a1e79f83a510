"use server";

import { revalidatePath } from "next/cache";
import { defineAction } from "@/lib/auth/action";
import { createRule, saveLabSettings, updateRule } from "@/lib/db/queries/flags";
import { evaluateFlagsEverywhere } from "@/lib/flags/evaluate";
import { createRuleInput, labSettingsInput, updateRuleInput } from "@/lib/validations/flags";

/**
 * A changed rule is evaluated on every cell at once, after its own transaction has committed. If
 * that evaluation fails the change still stands; the answer says so and the next analysis retries.
 */
async function evaluateAfterChange(ruleIds?: string[]): Promise<{ opened: number; evaluated: boolean }> {
  try {
    const result = await evaluateFlagsEverywhere(ruleIds);
    return { opened: result.opened.length, evaluated: true };
  } catch (error) {
    console.error("Evaluating flag rules after a change failed", error);
    return { opened: 0, evaluated: false };
  }
}

function revalidateFlagPages(): void {
  revalidatePath("/flags");
  revalidatePath("/flags/rules");
}

export const createRuleAction = defineAction("flag.rule.write", createRuleInput, async (input, user) => {
  const { id } = await createRule(input, { id: user.id, name: user.name });
  const evaluation = await evaluateAfterChange([id]);
  revalidateFlagPages();
  return { id, ...evaluation };
});

export const updateRuleAction = defineAction("flag.rule.write", updateRuleInput, async (input, user) => {
  const { id } = await updateRule(input, { id: user.id, name: user.name });
  const evaluation = input.enabled ? await evaluateAfterChange([id]) : { opened: 0, evaluated: false };
  revalidateFlagPages();
  return { id, ...evaluation };
});

/** The end-of-life threshold feeds the state-of-health rule and every projection, so all rules run again. */
export const saveLabSettingsAction = defineAction("flag.rule.write", labSettingsInput, async (input, user) => {
  const settings = await saveLabSettings(input, { id: user.id, name: user.name });
  const evaluation = await evaluateAfterChange();
  revalidateFlagPages();
  return { eolThresholdPct: settings.eolThresholdPct, digestEnabled: settings.digestEnabled, digestHour: settings.digestHour, ...evaluation };
});
