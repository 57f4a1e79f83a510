import "server-only";
import { z } from "zod";

/**
 * The upload service's settings. The SDK falls back to the hosted service when the ingest or API
 * URL is missing, so both are required here: a missing one stops the app instead of sending lab
 * files somewhere nobody chose. Pointing these at the hosted service is the only change needed
 * to use it.
 */
const tokenSchema = z.object({
  apiKey: z.string().startsWith("sk_", "the token's apiKey must start with sk_"),
  appId: z.string().min(1),
  regions: z.array(z.string().min(1)).min(1),
});

const required = (name: string, why: string) => z.string({ error: `${name} is not set: ${why}` }).min(1, `${name} is empty: ${why}`);

const uploadEnvSchema = z.object({
  UPLOADTHING_TOKEN: required("UPLOADTHING_TOKEN", "the upload service cannot sign uploads without it").refine(decodesAsToken, {
    message: "UPLOADTHING_TOKEN is not a valid token (base64 of {apiKey, appId, regions})",
  }),
  UPLOADTHING_INGEST_URL: required("UPLOADTHING_INGEST_URL", "without it the SDK would silently send files to the hosted service").pipe(
    z.url("UPLOADTHING_INGEST_URL must be a URL"),
  ),
  UPLOADTHING_API_URL: required("UPLOADTHING_API_URL", "without it the SDK would silently call the hosted service").pipe(
    z.url("UPLOADTHING_API_URL must be a URL"),
  ),
  UPLOADTHING_UFS_HOST: z.string().min(1).optional(),
  UPLOADTHING_UFS_APP_ID_LOCATION: z.enum(["subdomain", "path"]).optional(),
  UPLOADTHING_CALLBACK_URL: z.url("UPLOADTHING_CALLBACK_URL must be a URL").optional(),
});

export type UploadEnv = z.output<typeof uploadEnvSchema>;

function decodesAsToken(token: string): boolean {
  try {
    return tokenSchema.safeParse(JSON.parse(Buffer.from(token.trim(), "base64").toString("utf8"))).success;
  } catch {
    return false;
  }
}

/** Problems with the upload settings in `env`, one line each; empty when they are usable. */
export function uploadEnvProblems(env: Record<string, string | undefined> = process.env): string[] {
  const parsed = uploadEnvSchema.safeParse(env);
  return parsed.success ? [] : parsed.error.issues.map((issue) => issue.message);
}

export class UploadServiceNotConfigured extends Error {
  constructor(problems: string[]) {
    super(`Kneepoint cannot start: the upload service is not configured\n${problems.map((p) => `  ${p}`).join("\n")}`);
    this.name = "UploadServiceNotConfigured";
  }
}

/**
 * Validated upload settings, read from the environment on each call (the SDK itself reads
 * process.env on each call too, so both always agree). Throws UploadServiceNotConfigured.
 */
export function uploadEnv(env: Record<string, string | undefined> = process.env): UploadEnv {
  const parsed = uploadEnvSchema.safeParse(env);
  if (!parsed.success) throw new UploadServiceNotConfigured(parsed.error.issues.map((issue) => issue.message));
  return parsed.data;
}
