"use client";

import { useActionState, useState } from "react";
import { Button } from "@/components/ui/button";
import { TextAreaField } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { Panel } from "@/components/ui/panel";
import type { ActionResult } from "@/lib/auth/action-result";
import { flagSteps, stepLabels, type FlagState } from "@/lib/flags/vocabulary";
import { transitionFlagAction } from "../actions";

/** The next step of a flag: one of the steps its state allows, with the reason recorded in its history. */
export function TransitionForm({ flagId, state }: { flagId: string; state: FlagState }) {
  const steps = flagSteps[state];
  const [to, setTo] = useState<FlagState | "">(steps[0] ?? "");
  const [reason, setReason] = useState("");
  const [result, submit, pending] = useActionState<ActionResult<{ id: string; state: FlagState; closedAlso: number }> | null, FormData>(async (_prev, form) => {
    const outcome = await transitionFlagAction(form);
    if (outcome.ok) setReason("");
    return outcome;
  }, null);
  const errors = result && !result.ok ? (result.fieldErrors ?? {}) : {};
  if (steps.length === 0) return null;
  return (
    <Panel title="Next step">
      <form action={submit} className="space-y-3" noValidate>
        <input type="hidden" name="flagId" value={flagId} />
        <input type="hidden" name="expectedState" value={state} />
        <fieldset>
          <legend className="text-sm font-medium text-ink">Step</legend>
          <div className="mt-1 space-y-1">
            {steps.map((s) => (
              <label key={s} className="flex items-center gap-2 text-sm">
                <input type="radio" name="to" value={s} checked={to === s} onChange={() => setTo(s)} />
                {stepLabels[s]}
                {s === "cell retired" ? <span className="text-xs text-ink-soft">(closes every flag of the cell and marks it retired)</span> : null}
              </label>
            ))}
          </div>
          {errors.to ? (
            <p className="mt-1 text-xs font-medium text-danger" role="alert">
              {errors.to.join(" ")}
            </p>
          ) : null}
        </fieldset>
        <TextAreaField label="Reason" name="reason" required rows={3} value={reason} onChange={(e) => setReason(e.target.value)} errors={errors.reason} hint="Recorded with your name and the time; the history cannot be changed later." />
        <FormMessage state={result} success={(r) => `The flag is ${r.state} now${r.closedAlso ? `; ${r.closedAlso} other flag${r.closedAlso === 1 ? "" : "s"} of the cell closed with it` : ""}.`} />
        <Button type="submit" tone={to === "cell retired" ? "danger" : "primary"} disabled={pending || !to}>
          {pending ? "Saving…" : to ? stepLabels[to] : "Choose a step"}
        </Button>
      </form>
    </Panel>
  );
}
