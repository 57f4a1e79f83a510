import { BurstyRateLimiter, RateLimiterMemory, RateLimiterRes } from "rate-limiter-flexible";
import { AppError } from "@/lib/http/errors";

/**
 * Limits for personal API tokens, kept in this process's memory (one app process per data
 * directory; counts start again when it restarts).
 *
 * - Requests: a steady rate per token with room for a short burst, so a bench script that uploads
 *   a log and polls its status at a few hertz never notices, while a runaway loop is slowed down.
 * - Bad tokens: a budget of failures per client address, so tokens cannot be guessed at speed.
 */
export interface ApiRateLimits {
  requestsPerSecond: number;
  burst: number;
  burstWindowSeconds: number;
  badTokensPerWindow: number;
  badTokenWindowSeconds: number;
}

export const defaultApiRateLimits: ApiRateLimits = {
  requestsPerSecond: 10,
  burst: 200,
  burstWindowSeconds: 20,
  badTokensPerWindow: 20,
  badTokenWindowSeconds: 10 * 60,
};

export interface ApiRateLimiter {
  /** Counts one request by a valid token; throws a 429 AppError when it is over its rate. */
  takeRequest(tokenKey: string): Promise<void>;
  /** Throws a 429 AppError when this address has used up its bad-token budget. */
  assertMayTry(address: string): Promise<void>;
  /** Records a bad or revoked token from this address. */
  badToken(address: string): Promise<void>;
}

function tooMany(message: string, msBeforeNext: number): AppError {
  const retryAfterMs = Math.max(1, Math.ceil(msBeforeNext));
  return new AppError("rate-limited", `${message} Try again in ${Math.ceil(retryAfterMs / 1000)} s.`, { details: { retryAfterMs } });
}

export function createApiRateLimiter(limits: ApiRateLimits = defaultApiRateLimits): ApiRateLimiter {
  const requests = new BurstyRateLimiter(
    new RateLimiterMemory({ keyPrefix: "api-rate", points: limits.requestsPerSecond, duration: 1 }),
    new RateLimiterMemory({ keyPrefix: "api-burst", points: limits.burst, duration: limits.burstWindowSeconds }),
  );
  const failures = new RateLimiterMemory({ keyPrefix: "api-bad-token", points: limits.badTokensPerWindow, duration: limits.badTokenWindowSeconds });
  return {
    async takeRequest(tokenKey) {
      try {
        await requests.consume(tokenKey);
      } catch (rejection) {
        if (rejection instanceof RateLimiterRes) throw tooMany("This API token is sending requests faster than allowed.", rejection.msBeforeNext);
        throw rejection;
      }
    },
    async assertMayTry(address) {
      const seen = await failures.get(address);
      if (seen && seen.consumedPoints >= limits.badTokensPerWindow) {
        throw tooMany("Too many requests with a bad API token came from this address.", seen.msBeforeNext);
      }
    },
    async badToken(address) {
      // Over the budget the limiter rejects; the count is what matters here, not the rejection.
      await failures.consume(address).catch((rejection: unknown) => {
        if (!(rejection instanceof RateLimiterRes)) throw rejection;
      });
    },
  };
}

/**
 * The address a request came from, as the server in front of us reports it. Behind a proxy that
 * appends to X-Forwarded-For, the last entry is the one the proxy saw; a client cannot forge it.
 */
export function clientAddress(headers: Headers): string {
  const forwarded = headers.get("x-forwarded-for");
  const last = forwarded?.split(",").map((part) => part.trim()).filter(Boolean).at(-1);
  return last ?? headers.get("x-real-ip") ?? "unknown";
}
