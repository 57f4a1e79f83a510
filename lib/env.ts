import "server-only";
import path from "node:path";
import { z } from "zod";

/** A whole number of at least 1, or unset (an empty value counts as unset). */
const optionalWholeNumber = (name: string) =>
  z.preprocess((v) => (v === "" ? undefined : v), z.coerce.number().int(`${name} must be a whole number`).min(1, `${name} must be at least 1`).optional());

/**
 * Server settings, read from the environment once and validated, so a mistyped variable stops
 * the app at start with a clear message instead of failing on some later request.
 */
const serverEnvSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  /** A postgres:// URL selects a PostgreSQL server; otherwise the embedded PGlite directory is used. */
  DATABASE_URL: z
    .string()
    .regex(/^postgres(ql)?:\/\//, "DATABASE_URL must start with postgres:// or postgresql://")
    .optional()
    .or(z.literal("").transform(() => undefined)),
  KNEEPOINT_DATA_DIR: z.string().min(1).default("./data/pglite"),
  BETTER_AUTH_SECRET: z.string().min(32, "BETTER_AUTH_SECRET must be at least 32 characters").optional(),
  BETTER_AUTH_URL: z.url().default("http://localhost:3000"),
  /** Extra browser origins allowed to post to the auth endpoints (comma-separated). */
  KNEEPOINT_TRUSTED_ORIGINS: z.string().default(""),
  /** The mail server for alerts, smtp://[user:pass@]host:port or smtps://…; without it mail waits in the outbox. */
  SMTP_URL: z
    .string()
    .regex(/^smtps?:\/\/[^/\s]+/, "SMTP_URL must look like smtp://host:port or smtps://host:port")
    .optional()
    .or(z.literal("").transform(() => undefined)),
  /** Requests a second each personal API token may send on average, and the burst it may send on top. */
  KNEEPOINT_API_REQUESTS_PER_SECOND: optionalWholeNumber("KNEEPOINT_API_REQUESTS_PER_SECOND"),
  KNEEPOINT_API_BURST: optionalWholeNumber("KNEEPOINT_API_BURST"),
  /** Sender of alert mail. */
  KNEEPOINT_MAIL_FROM: z.string().min(3).default("Kneepoint alerts <alerts@kneepoint.localhost>"),
  /** The local mail catcher's inbox page, set by `npm start` in development. */
  KNEEPOINT_DEV_INBOX_URL: z
    .url()
    .optional()
    .or(z.literal("").transform(() => undefined)),
});

export type ServerEnv = z.infer<typeof serverEnvSchema> & { dataDir: string };

let cached: ServerEnv | undefined;

export function serverEnv(): ServerEnv {
  if (cached) return cached;
  const parsed = serverEnvSchema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`);
    throw new Error(`Kneepoint cannot start: invalid environment\n${lines.join("\n")}`);
  }
  cached = { ...parsed.data, dataDir: path.resolve(parsed.data.KNEEPOINT_DATA_DIR) };
  return cached;
}
