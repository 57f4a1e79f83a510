import "server-only";
import type { z } from "zod";
import { AppError, type FieldErrors } from "@/lib/http/errors";
import type { ActionResult } from "./action-result";
import { can, type Capability } from "./roles";
import { currentUser, type SessionUser } from "./session";

export type { ActionResult };

export function formDataToObject(form: FormData): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [key, value] of form.entries()) {
    // Next adds hidden $ACTION_* fields to progressive forms; they are not user input.
    if (key.startsWith("$ACTION")) continue;
    out[key] = typeof value === "string" ? value : value;
  }
  return out;
}

export function fieldErrorsOf(error: z.ZodError): FieldErrors {
  const out: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.length ? issue.path.join(".") : "_form";
    (out[key] ??= []).push(issue.message);
  }
  return out;
}

function failure(error: unknown): ActionResult<never> {
  if (error instanceof AppError) {
    return { ok: false, status: error.status, error: error.message, fieldErrors: error.fieldErrors };
  }
  console.error(error);
  return { ok: false, status: 500, error: "Something went wrong on the server. The error was logged." };
}

/**
 * The one recipe for every server action: validate the input with zod, read the session, check
 * the capability map, then run the body with a typed user. The input may be FormData (a form
 * posting to the action) or a plain object (a client calling it).
 */
export function defineAction<S extends z.ZodType, T>(
  capability: Capability,
  schema: S,
  body: (input: z.output<S>, user: SessionUser) => Promise<T>,
): (input: FormData | z.input<S>) => Promise<ActionResult<T>> {
  return async (input) => {
    try {
      const user = await currentUser();
      if (!user) throw new AppError("unauthenticated", "Please sign in again: your session has ended.");
      if (!can(user.role, capability)) throw new AppError("forbidden", "Your role does not allow this action.");
      const raw = input instanceof FormData ? formDataToObject(input) : input;
      const parsed = schema.safeParse(raw);
      if (!parsed.success) {
        throw new AppError("bad-request", "Some fields need attention.", { fieldErrors: fieldErrorsOf(parsed.error) });
      }
      return { ok: true, data: await body(parsed.data, user) };
    } catch (error) {
      return failure(error);
    }
  };
}

/** Form-state flavour for `useActionState`: (previous state, form data) → result. */
export function formAction<S extends z.ZodType, T>(
  action: (input: FormData | z.input<S>) => Promise<ActionResult<T>>,
): (previous: ActionResult<T> | null, form: FormData) => Promise<ActionResult<T>> {
  return (_previous, form) => action(form);
}
