import "server-only";
import { AppError } from "@/lib/http/errors";
import { trustedOrigins } from "./auth";

const safeMethods = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * Is this a state-changing request that a page of another origin made the browser send? Such a
 * request carries the sign-in cookie (cross-site request forgery), so it must not act on it.
 *
 * Browsers send `Origin` on every request whose method is not GET or HEAD (Fetch standard,
 * "append a request `Origin` header"), as "null" from opaque origins. A request without one comes
 * from a program, not a page, unless fetch metadata (`Sec-Fetch-Site`) says it crossed sites.
 * Origins compare exactly (scheme, host and port), as the browser serialises them.
 */
export function isCrossOriginMutation(request: Request, trusted: readonly string[]): boolean {
  if (safeMethods.has(request.method.toUpperCase())) return false;
  const origin = request.headers.get("origin");
  if (origin !== null) return !trusted.includes(origin);
  return request.headers.get("sec-fetch-site") === "cross-site";
}

/**
 * Refuses a cross-origin mutation with 403. For handlers that act on the session cookie; requests
 * authenticated by a bearer token are not forgeable by a page (a page cannot add the header to a
 * cross-origin request without a CORS grant the app never gives) and need not call it.
 */
export function assertSameOriginMutation(request: Request): void {
  if (isCrossOriginMutation(request, trustedOrigins()))
    throw new AppError("forbidden", "This request came from a page of another site, so it was refused.");
}
