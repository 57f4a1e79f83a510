import "server-only";
import { type z } from "zod";
import { AppError, errorResponse } from "@/lib/http/errors";
import { fieldErrorsOf } from "./action";
import { userFromBearer } from "./api-token";
import { assertSameOriginMutation } from "./origin";
import { can, type Capability } from "./roles";
import { sessionFromHeaders, type SessionUser } from "./session";

export interface RouteContext<Q> {
  user: SessionUser;
  query: Q;
  request: Request;
  params: Record<string, string | string[] | undefined>;
}

export interface RouteOptions {
  /**
   * "session" (default): the browser's sign-in cookie. "session-or-token": also a personal API
   * token (`Authorization: Bearer kp_…`), acting with its owner's role; a bad token is a 401
   * even when a cookie is present.
   */
  auth?: "session" | "session-or-token";
}

async function requestUser(request: Request, options: RouteOptions): Promise<SessionUser | null> {
  if (options.auth === "session-or-token") {
    const tokenUser = await userFromBearer(request.headers);
    if (tokenUser) return tokenUser;
  }
  // Only the cookie can be forged by another site's page: refuse its cross-origin mutations.
  assertSameOriginMutation(request);
  return sessionFromHeaders(request.headers);
}

/**
 * The one recipe for every route handler: session (or API token) → capability → validated query
 * → act → JSON. Errors become the same status codes and body shape everywhere; causes are
 * logged, not sent.
 */
export function defineRoute<S extends z.ZodType, T>(
  capability: Capability,
  querySchema: S,
  body: (ctx: RouteContext<z.output<S>>) => Promise<T | Response>,
  options: RouteOptions = {},
) {
  return async (request: Request, context?: { params?: Promise<Record<string, string | string[] | undefined>> }) => {
    try {
      const user = await requestUser(request, options);
      if (!user) throw new AppError("unauthenticated", "Sign in to use this endpoint.");
      if (!can(user.role, capability)) throw new AppError("forbidden", "Your role does not allow this request.");
      const url = new URL(request.url);
      const parsed = querySchema.safeParse(Object.fromEntries(url.searchParams.entries()));
      if (!parsed.success) {
        throw new AppError("bad-request", "The query is not valid.", { fieldErrors: fieldErrorsOf(parsed.error) });
      }
      const params = (await context?.params) ?? {};
      const result = await body({ user, query: parsed.data, request, params });
      return result instanceof Response ? result : Response.json(result);
    } catch (error) {
      return errorResponse(error);
    }
  };
}
