import path from "node:path";
import { envPort, runUntilSignal } from "../shared/cli";
import { startUploadFake } from "./server";
import { decodeToken } from "./token";

/**
 * CLI: `tsx fakes/uploadthing/main.ts`. Reads the same token the app uses, so both sides agree on
 * the signing key. Env: UPLOADTHING_TOKEN (required), FAKE_UPLOAD_PORT (default 4001),
 * FAKE_UPLOAD_DIR (default data/fake-uploads), FAKE_UPLOAD_HOST (default 127.0.0.1),
 * FAKE_UPLOAD_PUBLIC_URL (default UPLOADTHING_INGEST_URL, else http://localhost:<port>).
 */
runUntilSignal(
  "upload fake",
  async () => {
    const token = process.env.UPLOADTHING_TOKEN;
    if (!token) throw new Error("UPLOADTHING_TOKEN is not set; make one with makeFakeToken() from fakes/uploadthing/token.ts");
    const { apiKey, appId } = decodeToken(token);
    const fake = await startUploadFake({
      port: envPort("FAKE_UPLOAD_PORT", 4001),
      host: process.env.FAKE_UPLOAD_HOST || undefined,
      dataDir: path.resolve(process.env.FAKE_UPLOAD_DIR ?? "data/fake-uploads"),
      apiKey,
      appId,
      publicUrl: process.env.FAKE_UPLOAD_PUBLIC_URL || process.env.UPLOADTHING_INGEST_URL || undefined,
    });
    const ingestUrl = process.env.UPLOADTHING_INGEST_URL;
    if (ingestUrl && new URL(ingestUrl).origin !== new URL(fake.url).origin) {
      console.error(`warning: UPLOADTHING_INGEST_URL (${ingestUrl}) is not this fake's URL; signed uploads will be refused`);
    }
    return { ...fake, appId };
  },
  (fake) => `upload fake listening on ${fake.url} (app ${fake.appId})`,
);
