import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { findTokenOwner } from "@/lib/db/queries/api-tokens";
import { AppError } from "@/lib/http/errors";
import { serverEnv } from "@/lib/env";
import { clientAddress, createApiRateLimiter, defaultApiRateLimits, type ApiRateLimiter } from "./api-rate-limit";
import { isRole } from "./roles";
import type { SessionUser } from "./session";

/** Personal API tokens: `kp_` and 43 base64url characters (256 random bits). Only their SHA-256 is stored. */
const tokenPattern = /^kp_[A-Za-z0-9_-]{43}$/;

export function newApiToken(): { token: string; tokenHash: string; prefix: string } {
  const token = `kp_${randomBytes(32).toString("base64url")}`;
  // Enough to tell one's tokens apart on the settings page, far too little to guess the rest.
  return { token, tokenHash: hashApiToken(token), prefix: token.slice(0, 9) };
}

export function hashApiToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

const limiterKey = Symbol.for("kneepoint.api-rate-limiter");
// On globalThis so that a module reloaded in development keeps the counts.
const store = globalThis as Record<symbol, ApiRateLimiter | undefined>;
function limiter(): ApiRateLimiter {
  const env = serverEnv();
  store[limiterKey] ??= createApiRateLimiter({
    ...defaultApiRateLimits,
    requestsPerSecond: env.KNEEPOINT_API_REQUESTS_PER_SECOND ?? defaultApiRateLimits.requestsPerSecond,
    burst: env.KNEEPOINT_API_BURST ?? defaultApiRateLimits.burst,
  });
  return store[limiterKey];
}

/**
 * The user behind `Authorization: Bearer kp_…`, acting with the owner's current role.
 * Returns undefined when the request carries no bearer token; throws 401 for a bad or revoked one
 * and 429 when the token, or the address sending bad tokens, is over its rate.
 */
export async function userFromBearer(headers: Headers, limits: ApiRateLimiter = limiter()): Promise<SessionUser | undefined> {
  const header = headers.get("authorization");
  if (!header) return undefined;
  const address = clientAddress(headers);
  // Checked before the token is looked at, so a blocked address learns nothing from its guesses.
  await limits.assertMayTry(address);
  const match = /^Bearer\s+(\S+)\s*$/i.exec(header);
  const token = match?.[1];
  if (!token || !tokenPattern.test(token)) {
    await limits.badToken(address);
    throw new AppError("unauthenticated", "The API token is missing or malformed (expected Authorization: Bearer kp_…).");
  }
  const tokenHash = hashApiToken(token);
  const owner = await findTokenOwner(tokenHash);
  if (!owner || owner.banned || !isRole(owner.role)) {
    await limits.badToken(address);
    throw new AppError("unauthenticated", "This API token is not valid or has been revoked.");
  }
  await limits.takeRequest(tokenHash);
  return { id: owner.id, name: owner.name, email: owner.email, role: owner.role };
}
