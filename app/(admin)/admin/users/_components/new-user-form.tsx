"use client";

import { useActionState, useState } from "react";
import { Button } from "@/components/ui/button";
import { SelectField, TextField } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { Panel } from "@/components/ui/panel";
import type { ActionResult } from "@/lib/auth/action-result";
import type { Role } from "@/lib/auth/roles";
import { createUserAction } from "../actions";

const blank = { name: "", email: "", password: "", role: "technician" };

export function NewUserForm({ options }: { options: { role: Role; label: string }[] }) {
  const [values, setValues] = useState(blank);
  const [shown, setShown] = useState(false);
  const [created, setCreated] = useState("");
  const [state, submit, pending] = useActionState<ActionResult<{ id: string }> | null, FormData>(async (_prev, form) => {
    const result = await createUserAction(form);
    if (result.ok) {
      setCreated(String(form.get("email") ?? ""));
      setValues(blank);
      setShown(false);
    }
    return result;
  }, null);
  const errors = state && !state.ok ? (state.fieldErrors ?? {}) : {};
  const set = (key: keyof typeof blank, value: string) => setValues((v) => ({ ...v, [key]: value }));

  return (
    <Panel title="Create an account">
      <form action={submit} className="space-y-3" noValidate>
        <TextField label="Name" name="name" required autoComplete="off" value={values.name} onChange={(e) => set("name", e.target.value)} errors={errors.name} />
        <TextField
          label="E-mail"
          name="email"
          type="email"
          required
          autoComplete="off"
          value={values.email}
          onChange={(e) => set("email", e.target.value)}
          errors={errors.email}
          hint="The person signs in with this address."
        />
        <TextField
          label="Initial password"
          name="password"
          type={shown ? "text" : "password"}
          required
          autoComplete="new-password"
          value={values.password}
          onChange={(e) => set("password", e.target.value)}
          errors={errors.password}
          hint="At least 10 characters. Hand it over in person, not by e-mail."
        />
        <Button onClick={() => setShown((s) => !s)} aria-pressed={shown} className="py-1 text-xs">
          {shown ? "Hide password" : "Show password"}
        </Button>
        <SelectField label="Role" name="role" required value={values.role} onChange={(e) => set("role", e.target.value)} errors={errors.role}>
          {options.map((o) => (
            <option key={o.role} value={o.role}>
              {o.label}
            </option>
          ))}
        </SelectField>
        <FormMessage state={state} success={() => `Account created for ${created}.`} />
        <Button type="submit" tone="primary" disabled={pending}>
          {pending ? "Creating…" : "Create account"}
        </Button>
      </form>
    </Panel>
  );
}
