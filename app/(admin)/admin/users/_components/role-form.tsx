"use client";

import { useActionState, useId, useState } from "react";
import { Button } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import type { ActionResult } from "@/lib/auth/action-result";
import type { Role } from "@/lib/auth/roles";
import { setUserRoleAction } from "../actions";

interface Props {
  userId: string;
  name: string;
  role: string;
  options: { role: Role; label: string }[];
}

/** One person's role, changed in place; the server re-checks that the one asking may manage users. */
export function RoleForm({ userId, name, role, options }: Props) {
  const selectId = useId();
  const [selected, setSelected] = useState(role);
  const [state, submit, pending] = useActionState<ActionResult<{ userId: string; role: Role }> | null, FormData>(
    (_prev, form) => setUserRoleAction(form),
    null,
  );
  return (
    <form action={submit} className="flex flex-wrap items-center gap-2">
      <input type="hidden" name="userId" value={userId} />
      <label htmlFor={selectId} className="sr-only">
        Role of {name}
      </label>
      <select id={selectId} name="role" value={selected} onChange={(e) => setSelected(e.target.value)} className={`${inputClass} w-auto py-1.5`}>
        {options.map((o) => (
          <option key={o.role} value={o.role}>
            {o.label}
          </option>
        ))}
      </select>
      <Button type="submit" disabled={pending || selected === role} className="py-1.5">
        {pending ? "Saving…" : "Change role"}
      </Button>
      {state && !state.ok ? (
        <span role="alert" className="basis-full text-xs text-danger">
          {state.error}
        </span>
      ) : null}
      {state?.ok && state.data.role === role ? (
        <span role="status" className="text-xs text-ok">
          Saved
        </span>
      ) : null}
    </form>
  );
}
