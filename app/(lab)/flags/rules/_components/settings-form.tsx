"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import type { ActionResult } from "@/lib/auth/action-result";
import { saveLabSettingsAction } from "../actions";

type Saved = { eolThresholdPct: number; digestEnabled: boolean; digestHour: number; opened: number; evaluated: boolean };

export function SettingsForm({ settings }: { settings: { eolThresholdPct: number; digestEnabled: boolean; digestHour: number } }) {
  const [state, submit, pending] = useActionState<ActionResult<Saved> | null, FormData>((_prev, form) => saveLabSettingsAction(form), null);
  const errors = state && !state.ok ? (state.fieldErrors ?? {}) : {};
  return (
    <form action={submit} className="space-y-3" noValidate>
      <TextField
        label="End-of-life threshold (% of rated capacity)"
        name="eolThresholdPct"
        inputMode="decimal"
        defaultValue={settings.eolThresholdPct}
        errors={errors.eolThresholdPct}
        hint="80 % is the usual convention for lithium-ion cells; some programmes use another value."
      />
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" name="digestEnabled" defaultChecked={settings.digestEnabled} /> Mail engineers a daily digest of flags not yet closed
      </label>
      <TextField label="Digest hour (server clock, 0–23)" name="digestHour" inputMode="numeric" defaultValue={settings.digestHour} errors={errors.digestHour} />
      <FormMessage state={state} success={(s) => `Saved: end of life at ${s.eolThresholdPct} %, digest ${s.digestEnabled ? `daily after ${s.digestHour}:00` : "off"}. ${s.evaluated ? `${s.opened} new flag${s.opened === 1 ? "" : "s"}.` : ""}`} />
      <Button type="submit" tone="primary" disabled={pending}>
        {pending ? "Saving…" : "Save settings"}
      </Button>
    </form>
  );
}
