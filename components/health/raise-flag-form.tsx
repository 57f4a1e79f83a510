"use client";

import Link from "next/link";
import { useActionState, useState } from "react";
import { raiseFlagAction } from "@/app/(lab)/flags/actions";
import { Button } from "@/components/ui/button";
import { TextAreaField, TextField } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { Panel } from "@/components/ui/panel";
import type { ActionResult } from "@/lib/auth/action-result";
import { flagHref } from "@/lib/flags/links";

/** Raise a flag by hand with a reason; with `serial` the cell is fixed (a cell's own page). */
export function RaiseFlagForm({ serial }: { serial?: string }) {
  const [reason, setReason] = useState("");
  const [cellSerial, setCellSerial] = useState(serial ?? "");
  const [state, submit, pending] = useActionState<ActionResult<{ id: string; serial: string }> | null, FormData>(async (_prev, form) => {
    const result = await raiseFlagAction(form);
    if (result.ok) setReason("");
    return result;
  }, null);
  const errors = state && !state.ok ? (state.fieldErrors ?? {}) : {};
  return (
    <Panel title="Raise a flag by hand">
      <form action={submit} className="space-y-3" noValidate>
        {serial ? (
          <input type="hidden" name="cellSerial" value={serial} />
        ) : (
          <TextField label="Cell serial" name="cellSerial" required autoComplete="off" spellCheck={false} value={cellSerial} onChange={(e) => setCellSerial(e.target.value)} errors={errors.cellSerial} />
        )}
        <TextAreaField
          label="Reason"
          name="reason"
          required
          rows={3}
          value={reason}
          onChange={(e) => setReason(e.target.value)}
          errors={errors.reason}
          hint="What you saw and why the cell needs a look. Every engineer gets it by mail."
        />
        <FormMessage
          state={state}
          success={(raised) => (
            <>
              Flag raised on <span className="font-mono">{raised.serial}</span>.{" "}
              <Link href={flagHref(raised.id)} className="underline">
                Open it
              </Link>
            </>
          )}
        />
        <Button type="submit" tone="primary" disabled={pending}>
          {pending ? "Raising…" : "Raise flag"}
        </Button>
      </form>
    </Panel>
  );
}
