/**
 * Rate limits on personal API tokens: a steady per-token rate with a burst allowance, and a
 * budget of bad tokens per client address. A 429 carries Retry-After in whole seconds
 * (RFC 9110 §10.2.3) and the wait in milliseconds in the body.
 */
import { z } from "zod";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { clientAddress, createApiRateLimiter, defaultApiRateLimits } from "@/lib/auth/api-rate-limit";
import { newApiToken, userFromBearer } from "@/lib/auth/api-token";
import { defineRoute } from "@/lib/auth/route";
import { insertApiToken } from "@/lib/db/queries/api-tokens";
import { AppError } from "@/lib/http/errors";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { signedInUser, type SignedInUser } from "../support/users";

const bearer = (token: string, address = "192.0.2.10") => new Headers({ authorization: `Bearer ${token}`, "x-forwarded-for": address });
const small = { requestsPerSecond: 2, burst: 3, burstWindowSeconds: 60, badTokensPerWindow: 4, badTokenWindowSeconds: 60 };

async function codeOf(promise: Promise<unknown>): Promise<string> {
  try {
    await promise;
    return "ok";
  } catch (error) {
    return error instanceof AppError ? error.code : "other";
  }
}

describe("clientAddress", () => {
  it("takes the entry the nearest proxy appended, and says unknown when there is none", () => {
    expect(clientAddress(new Headers({ "x-forwarded-for": "203.0.113.9, 198.51.100.2" }))).toBe("198.51.100.2");
    expect(clientAddress(new Headers({ "x-real-ip": "198.51.100.7" }))).toBe("198.51.100.7");
    expect(clientAddress(new Headers())).toBe("unknown");
  });
});

describe("API token limits", () => {
  let tech: SignedInUser;
  let token: string;
  let otherToken: string;

  beforeAll(async () => {
    await installTestDatabase();
    tech = await signedInUser("technician");
    for (const name of ["bench 1", "bench 2"]) {
      const made = newApiToken();
      await insertApiToken({ name, tokenHash: made.tokenHash, prefix: made.prefix }, { id: tech.id, name: "Tess" });
      if (name === "bench 1") token = made.token;
      else otherToken = made.token;
    }
  });
  afterAll(removeTestDatabase);

  it("lets a token send its rate plus its burst, then answers rate-limited, per token", async () => {
    const limiter = createApiRateLimiter(small);
    const codes: string[] = [];
    for (let i = 0; i < 7; i++) codes.push(await codeOf(userFromBearer(bearer(token), limiter)));
    // 2 within the steady rate + 3 from the burst allowance, all inside one second.
    expect(codes).toEqual(["ok", "ok", "ok", "ok", "ok", "rate-limited", "rate-limited"]);
    // Another token of the same owner has its own count.
    expect(await codeOf(userFromBearer(bearer(otherToken), limiter))).toBe("ok");
  });

  it("recovers once the steady window has passed", async () => {
    const limiter = createApiRateLimiter({ ...small, burst: 1 });
    for (let i = 0; i < 3; i++) await codeOf(userFromBearer(bearer(token), limiter));
    expect(await codeOf(userFromBearer(bearer(token), limiter))).toBe("rate-limited");
    await new Promise((r) => setTimeout(r, 1100));
    expect(await codeOf(userFromBearer(bearer(token), limiter))).toBe("ok");
  });

  it("blocks an address that sends too many bad tokens, even when it then sends a good one", async () => {
    const limiter = createApiRateLimiter(small);
    const wrong = newApiToken().token;
    const codes: string[] = [];
    for (let i = 0; i < 4; i++) codes.push(await codeOf(userFromBearer(bearer(wrong, "198.51.100.66"), limiter)));
    codes.push(await codeOf(userFromBearer(bearer("kp_short", "198.51.100.66"), limiter)));
    codes.push(await codeOf(userFromBearer(bearer(token, "198.51.100.66"), limiter)));
    expect(codes).toEqual(["unauthenticated", "unauthenticated", "unauthenticated", "unauthenticated", "rate-limited", "rate-limited"]);
    // Other addresses are not affected.
    expect(await codeOf(userFromBearer(bearer(token, "198.51.100.67"), limiter))).toBe("ok");
  });

  it("answers 429 with Retry-After through a real route once a token's default budget is spent", async () => {
    const echo = defineRoute("registry.read", z.object({}), async ({ user }) => ({ by: user.id }), { auth: "session-or-token" });
    const statuses: number[] = [];
    let limited: Response | undefined;
    const budget = defaultApiRateLimits.requestsPerSecond + defaultApiRateLimits.burst;
    for (let i = 0; i < budget + 20 && !limited; i++) {
      const response = await echo(new Request("http://localhost:3000/api/echo", { headers: bearer(otherToken, "192.0.2.44") }));
      statuses.push(response.status);
      if (response.status === 429) limited = response;
    }
    expect(limited, `statuses: ${statuses.join(",")}`).toBeDefined();
    // At least the burst allowance passed before the first refusal (one was already used above).
    expect(statuses.filter((s) => s === 200).length).toBeGreaterThanOrEqual(defaultApiRateLimits.burst);
    const retryAfter = Number(limited?.headers.get("retry-after"));
    expect(retryAfter).toBeGreaterThanOrEqual(1);
    const body = (await limited?.json()) as { code: string; error: string; retryAfterMs: number };
    expect(body.code).toBe("rate-limited");
    expect(body.error).toMatch(/faster than allowed/);
    expect(body.retryAfterMs).toBeGreaterThan(0);
    expect(body.retryAfterMs).toBeLessThanOrEqual(defaultApiRateLimits.burstWindowSeconds * 1000);
  });
});
