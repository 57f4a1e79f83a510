import type { ReactNode } from "react";
import type { ActionResult } from "@/lib/auth/action-result";

/** The outcome line under a form: the server's error as an alert, or what was saved as a status. */
export function FormMessage<T>({ state, success }: { state: ActionResult<T> | null; success: (data: T) => ReactNode }) {
  if (!state) return null;
  return state.ok ? (
    <p role="status" className="text-sm text-ok">
      {success(state.data)}
    </p>
  ) : (
    <p role="alert" className="text-sm text-danger">
      {state.error}
    </p>
  );
}
