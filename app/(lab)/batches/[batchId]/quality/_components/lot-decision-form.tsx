"use client";

import { useActionState, useState } from "react";
import { SignatureFields } from "@/components/signature/signature-fields";
import { Button } from "@/components/ui/button";
import { TextAreaField } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { Panel } from "@/components/ui/panel";
import type { ActionResult } from "@/lib/auth/action-result";
import { signatureManifest } from "@/lib/auth/signature-manifest";
import type { SignatureMeaning } from "@/lib/validations/signature";
import { decideLotAction } from "../actions";

/** Each decision with the signature meaning it most often carries; the signer may pick another that does not contradict it. */
const choices = [
  { value: "accepted", label: "Accept the lot", meaning: "approved" },
  { value: "on hold", label: "Put the lot on hold", meaning: "reviewed" },
  { value: "rejected", label: "Reject the lot", meaning: "rejected" },
] as const satisfies readonly { value: string; label: string; meaning: SignatureMeaning }[];

const signingStatement =
  "By signing you confirm that this decision is yours and that you have looked at the figures and flags on this page. Your name, the time and the meaning are recorded with the decision.";

/** The QA lead's decision, made beside the figures it rests on; the server records those figures with it. */
export function LotDecisionForm({ batchId, disposition }: { batchId: string; disposition: string }) {
  const options = choices.filter((c) => c.value !== disposition);
  const [picked, setPicked] = useState<string>(options[0]?.value ?? "");
  // After a decision the lot's disposition changes and the one just made is no longer offered: choose again.
  const choice = options.some((c) => c.value === picked) ? picked : "";
  const [meaning, setMeaning] = useState<SignatureMeaning>(options[0]?.meaning ?? "reviewed");
  const [reason, setReason] = useState("");
  type Decided = { id: number; disposition: string; signature: { signerName: string; signedAt: Date; meaning: SignatureMeaning } };
  const [state, submit, pending] = useActionState<ActionResult<Decided> | null, FormData>(async (_prev, form) => {
    const result = await decideLotAction(form);
    if (result.ok) setReason("");
    return result;
  }, null);
  const errors = state && !state.ok ? (state.fieldErrors ?? {}) : {};
  return (
    <Panel title="Decide on the lot">
      <form action={submit} className="space-y-3" noValidate>
        <input type="hidden" name="batchId" value={batchId} />
        <input type="hidden" name="expectedDisposition" value={disposition} />
        <fieldset>
          <legend className="text-sm font-medium text-ink">Decision (now: {disposition})</legend>
          <div className="mt-1 space-y-1">
            {options.map((c) => (
              <label key={c.value} className="flex items-center gap-2 text-sm">
                <input
                  type="radio"
                  name="disposition"
                  value={c.value}
                  // Uncontrolled with the choice as default, so the reset after a refused signature keeps it.
                  defaultChecked={choice === c.value}
                  onChange={() => {
                    setPicked(c.value);
                    setMeaning(c.meaning);
                  }}
                />
                {c.label}
              </label>
            ))}
          </div>
          {errors.disposition ? (
            <p className="mt-1 text-xs font-medium text-danger" role="alert">
              {errors.disposition.join(" ")}
            </p>
          ) : null}
        </fieldset>
        <TextAreaField
          label="Reason"
          name="reason"
          required
          rows={3}
          value={reason}
          onChange={(e) => setReason(e.target.value)}
          errors={errors.reason}
          hint="Recorded with your name, the time and the figures on this page."
        />
        <SignatureFields statement={signingStatement} meaning={meaning} onMeaningChange={setMeaning} errors={errors} />
        <FormMessage state={state} success={(d) => `Recorded: the lot is ${d.disposition}. ${signatureManifest(d.signature)}.`} />
        <Button type="submit" tone={choice === "rejected" ? "danger" : "primary"} disabled={pending || !choice}>
          {pending ? "Signing…" : "Sign and record the decision"}
        </Button>
      </form>
    </Panel>
  );
}
