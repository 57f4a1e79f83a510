import "server-only";
import { hashPassword, verifyPassword } from "better-auth/crypto";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/lib/db/client";
import type { Signer } from "@/lib/db/queries/signatures";
import { account, user } from "@/lib/db/schema";
import { AppError } from "@/lib/http/errors";
import { createFailureLimiter, type FailureLimiter } from "./failure-limiter";

/** Wrong passwords allowed per signer before signing pauses, and the window they are counted in. */
export const signatureAttemptLimit = { max: 5, windowMs: 10 * 60 * 1000 };

export const wrongPasswordMessage = "The password is not right; the record was not signed";

const globalKey = Symbol.for("kneepoint.signature-failures");
type Store = { limiter?: FailureLimiter; decoyHash?: Promise<string> };
// On globalThis so that a module reloaded in development keeps the counts.
const store = ((globalThis as Record<symbol, unknown>)[globalKey] ??= {}) as Store;
const limiter = (store.limiter ??= createFailureLimiter(signatureAttemptLimit));

/** A hash to check against when the account has no password, so that case takes as long as a wrong one. */
function decoyHash(): Promise<string> {
  store.decoyHash ??= hashPassword("kneepoint decoy: no credential to sign with");
  return store.decoyHash;
}

function isBanned(u: { banned: boolean | null; banExpires: Date | null }, now: Date): boolean {
  return Boolean(u.banned) && (u.banExpires === null || u.banExpires > now);
}

/**
 * Checks a signer's password again at the moment of signing (21 CFR 11.200(a)(1): a signature of
 * an identification code and a password) with better-auth's own scrypt verifier against the stored
 * credential hash. Returns who signs, by their current name. The password goes no further than here.
 */
export async function verifySignature(userId: string, password: string): Promise<Signer> {
  const waitMs = limiter.blockedFor(userId);
  if (waitMs > 0) {
    const minutes = Math.max(1, Math.ceil(waitMs / 60_000));
    throw new AppError(
      "rate-limited",
      `Too many wrong passwords: signing is paused for your account for ${minutes} minute${minutes === 1 ? "" : "s"}. Nothing was signed.`,
    );
  }
  const db = await getDb();
  const [found] = await db
    .select({ id: user.id, name: user.name, banned: user.banned, banExpires: user.banExpires, hash: account.password })
    .from(user)
    .leftJoin(account, and(eq(account.userId, user.id), eq(account.providerId, "credential")))
    .where(eq(user.id, userId))
    .limit(1);
  if (!found) throw new AppError("unauthenticated", "Please sign in again: your account was not found.");
  if (isBanned(found, new Date())) throw new AppError("forbidden", "Your account is suspended; it cannot sign records.");
  const matches = await verifyPassword({ hash: found.hash ?? (await decoyHash()), password });
  if (!matches || found.hash === null) {
    limiter.fail(userId);
    throw new AppError("bad-request", `${wrongPasswordMessage}.`, { fieldErrors: { password: [wrongPasswordMessage] } });
  }
  limiter.clear(userId);
  return { signerId: found.id, signerName: found.name };
}
