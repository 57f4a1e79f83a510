"use client";

import { useActionState, useState } from "react";
import { Button } from "@/components/ui/button";
import { SelectField, TextField } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import type { ActionResult } from "@/lib/auth/action-result";
import { flagRuleKinds, ruleKindInfo, type FlagRuleKind } from "@/lib/flags/vocabulary";
import { createRuleAction, updateRuleAction } from "../actions";

type Saved = { id: string; opened: number; evaluated: boolean };

interface Props {
  /** An existing rule to edit; without it the form adds a rule. */
  rule?: { id: string; kind: FlagRuleKind; bound: number | null; enabled: boolean; note: string };
}

function savedMessage(r: Saved): string {
  if (!r.evaluated) return "Saved. (The rule is switched off, or evaluating it failed and waits for the next analysis.)";
  return `Saved and run on every cell: ${r.opened} new flag${r.opened === 1 ? "" : "s"}.`;
}

export function RuleForm({ rule }: Props) {
  const [kind, setKind] = useState<FlagRuleKind>(rule?.kind ?? "soh-below");
  const info = ruleKindInfo[kind];
  const [state, submit, pending] = useActionState<ActionResult<Saved> | null, FormData>((_prev, form) => (rule ? updateRuleAction(form) : createRuleAction(form)), null);
  const errors = state && !state.ok ? (state.fieldErrors ?? {}) : {};
  return (
    <form action={submit} className="space-y-3" noValidate>
      {rule ? <input type="hidden" name="ruleId" value={rule.id} /> : null}
      {rule ? (
        <input type="hidden" name="kind" value={rule.kind} />
      ) : (
        <SelectField label="What the rule checks" name="kind" value={kind} onChange={(e) => setKind(e.target.value as FlagRuleKind)} errors={errors.kind}>
          {flagRuleKinds.map((k) => (
            <option key={k} value={k}>
              {ruleKindInfo[k].title}
            </option>
          ))}
        </SelectField>
      )}
      {info.boundRange ? (
        <TextField
          key={kind}
          label={info.boundLabel}
          name="bound"
          inputMode="decimal"
          defaultValue={rule?.bound ?? info.defaultBound ?? ""}
          errors={errors.bound}
          hint={info.boundOptional ? "Leave blank to use the end-of-life threshold setting." : `Between ${info.boundRange.min} and ${info.boundRange.max}.`}
        />
      ) : null}
      <TextField label="Note" name="note" defaultValue={rule?.note ?? ""} errors={errors.note} />
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" name="enabled" defaultChecked={rule?.enabled ?? true} /> Rule is on
      </label>
      <FormMessage state={state} success={savedMessage} />
      <Button type="submit" tone="primary" disabled={pending}>
        {pending ? "Saving…" : rule ? "Save rule" : "Add rule"}
      </Button>
    </form>
  );
}
