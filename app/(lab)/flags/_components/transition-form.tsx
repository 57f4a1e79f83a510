"use client";

import { useActionState, useState } from "react";
import { SignatureFields } from "@/components/signature/signature-fields";
import { Button } from "@/components/ui/button";
import { TextAreaField } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { Panel } from "@/components/ui/panel";
import type { ActionResult } from "@/lib/auth/action-result";
import { signatureManifest } from "@/lib/auth/signature-manifest";
import { flagSteps, stepLabels, stepNeedsSignature, type FlagState } from "@/lib/flags/vocabulary";
import type { SignatureMeaning } from "@/lib/validations/signature";
import { transitionFlagAction } from "../actions";

const signingStatement =
  "By signing you confirm that you have looked at this flag's evidence yourself and that the reason given is right. Your name, the time and the meaning are recorded with the step.";

type Stepped = { id: string; state: FlagState; closedAlso: number; signature: { signerName: string; signedAt: Date; meaning: SignatureMeaning } | null };

function steppedMessage(r: Stepped): string {
  const others = r.closedAlso ? `; ${r.closedAlso} other flag${r.closedAlso === 1 ? "" : "s"} of the cell closed with it` : "";
  return `The flag is ${r.state} now${others}.${r.signature ? ` ${signatureManifest(r.signature)}.` : ""}`;
}

/** The next step of a flag: one of the steps its state allows, with the reason recorded in its history. */
export function TransitionForm({ flagId, state }: { flagId: string; state: FlagState }) {
  const steps = flagSteps[state];
  const [picked, setTo] = useState<FlagState | "">(steps[0] ?? "");
  // After a step the page hands down the new state while this form stays mounted: a pick the
  // new state no longer allows (e.g. "acknowledge" once acknowledged) falls back to its first step.
  const to = picked && steps.includes(picked) ? picked : (steps[0] ?? "");
  const [reason, setReason] = useState("");
  const [meaning, setMeaning] = useState<SignatureMeaning>("reviewed");
  const [result, submit, pending] = useActionState<ActionResult<Stepped> | null, FormData>(async (_prev, form) => {
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
            {/* Uncontrolled, with the choice as their default: React resets the form after each
                submission (which empties the password), and a reset puts radios back to their default. */}
            {steps.map((s) => (
              <label key={s} className="flex items-center gap-2 text-sm">
                <input type="radio" name="to" value={s} defaultChecked={to === s} onChange={() => setTo(s)} />
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
        {to && stepNeedsSignature(to) ? <SignatureFields statement={signingStatement} meaning={meaning} onMeaningChange={setMeaning} errors={errors} /> : null}
        <FormMessage state={result} success={steppedMessage} />
        <Button type="submit" tone={to === "cell retired" ? "danger" : "primary"} disabled={pending || !to}>
          {pending ? "Saving…" : !to ? "Choose a step" : stepNeedsSignature(to) ? `Sign and ${stepLabels[to].toLowerCase()}` : stepLabels[to]}
        </Button>
      </form>
    </Panel>
  );
}
