import "server-only";
import { betterAuth } from "better-auth";
import { drizzleAdapter } from "better-auth/adapters/drizzle";
import { nextCookies } from "better-auth/next-js";
import { admin } from "better-auth/plugins";
import { getDb, type Database } from "@/lib/db/client";
import * as schema from "@/lib/db/schema";
import { serverEnv } from "@/lib/env";

/** The browser origins that may send the app state-changing requests (sign-in and every mutation). */
export function trustedOrigins(): string[] {
  const env = serverEnv();
  const origins = new Set<string>([env.BETTER_AUTH_URL]);
  // The same local server is reached as localhost and as 127.0.0.1; both are the lab's own.
  const url = new URL(env.BETTER_AUTH_URL);
  const port = url.port ? `:${url.port}` : "";
  if (url.hostname === "localhost") origins.add(`${url.protocol}//127.0.0.1${port}`);
  if (url.hostname === "127.0.0.1") origins.add(`${url.protocol}//localhost${port}`);
  for (const extra of env.KNEEPOINT_TRUSTED_ORIGINS.split(",")) if (extra.trim()) origins.add(extra.trim());
  return [...origins];
}

function createAuth(db: Database) {
  const env = serverEnv();
  return betterAuth({
    appName: "Kneepoint",
    baseURL: env.BETTER_AUTH_URL,
    secret: env.BETTER_AUTH_SECRET,
    trustedOrigins: trustedOrigins(),
    database: drizzleAdapter(db, {
      provider: "pg",
      schema: { user: schema.user, session: schema.session, account: schema.account, verification: schema.verification },
    }),
    emailAndPassword: {
      enabled: true,
      // Accounts are made by an administrator; nobody signs themselves up to a lab notebook.
      disableSignUp: true,
      minPasswordLength: 10,
      maxPasswordLength: 128,
    },
    session: { expiresIn: 60 * 60 * 12, updateAge: 60 * 60 },
    rateLimit: {
      enabled: env.NODE_ENV !== "test",
      window: 60,
      max: 300,
      customRules: { "/sign-in/email": { window: 60, max: 10 } },
    },
    plugins: [admin({ defaultRole: "technician", adminRoles: ["admin"] }), nextCookies()],
  });
}

export type Auth = ReturnType<typeof createAuth>;

const globalKey = Symbol.for("kneepoint.auth");
type AuthStore = { auth?: Promise<Auth> };
const store = ((globalThis as Record<symbol, unknown>)[globalKey] ??= {}) as AuthStore;

/** The process-wide auth instance; created lazily so that building the app opens no database. */
export function getAuth(): Promise<Auth> {
  store.auth ??= getDb().then(createAuth);
  return store.auth;
}

/** Forget the instance (tests install a fresh database per file). */
export function resetAuth(): void {
  store.auth = undefined;
}
