import { z } from "zod";

/** Mirrors the SDK's token schema (`uploadthing/dist/shared-schemas-*.js`). */
const TokenSchema = z.object({
  apiKey: z.string().startsWith("sk_"),
  appId: z.string().min(1),
  regions: z.array(z.string().min(1)).min(1),
  ingestHost: z.string().optional(),
});

export type DecodedToken = z.output<typeof TokenSchema>;

export function makeFakeToken(options: { apiKey: string; appId: string; region: string }): string {
  const token = { apiKey: options.apiKey, appId: options.appId, regions: [options.region] };
  // Validate on the way out too, so a bad key is reported here and not as an opaque SDK error later.
  TokenSchema.parse(token);
  return Buffer.from(JSON.stringify(token), "utf8").toString("base64");
}

export function decodeToken(token: string): DecodedToken {
  let json: unknown;
  try {
    json = JSON.parse(Buffer.from(token.trim(), "base64").toString("utf8"));
  } catch {
    throw new Error("Upload token is not base64-encoded JSON");
  }
  const parsed = TokenSchema.safeParse(json);
  if (!parsed.success) {
    throw new Error(`Upload token is invalid: ${z.prettifyError(parsed.error)}`);
  }
  return parsed.data;
}
