import type { FieldErrors } from "@/lib/http/errors";

/** What every server action returns: data, or an error with per-field messages. */
export type ActionResult<T> =
  | { ok: true; data: T }
  | { ok: false; status: number; error: string; fieldErrors?: FieldErrors };
