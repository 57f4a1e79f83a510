import path from "node:path";
import { startUploadFake } from "./server";
import { decodeToken } from "./token";

/**
 * CLI: `tsx fakes/uploadthing/main.ts`. Reads the same token the app uses, so both sides agree on
 * the signing key. Env: UPLOADTHING_TOKEN (required), FAKE_UPLOAD_PORT (default 4001),
 * FAKE_UPLOAD_DIR (default data/fake-uploads), FAKE_UPLOAD_HOST (default 127.0.0.1),
 * FAKE_UPLOAD_PUBLIC_URL (default UPLOADTHING_INGEST_URL, else http://localhost:<port>).
 */
async function main(): Promise<void> {
  const token = process.env.UPLOADTHING_TOKEN;
  if (!token) throw new Error("UPLOADTHING_TOKEN is not set; make one with makeFakeToken() from fakes/uploadthing/token.ts");
  const { apiKey, appId } = decodeToken(token);
  const port = Number(process.env.FAKE_UPLOAD_PORT ?? "4001");
  if (!Number.isInteger(port) || port < 0 || port > 65535) throw new Error(`FAKE_UPLOAD_PORT is not a port number: ${process.env.FAKE_UPLOAD_PORT}`);
  const fake = await startUploadFake({
    port,
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
  console.log(`upload fake listening on ${fake.url} (app ${appId})`);
  const stop = () => {
    fake.close().then(
      () => process.exit(0),
      (error: unknown) => {
        console.error(`upload fake failed to close: ${error instanceof Error ? error.message : String(error)}`);
        process.exit(1);
      },
    );
  };
  process.once("SIGTERM", stop);
  process.once("SIGINT", stop);
}

main().catch((error: unknown) => {
  console.error(`upload fake failed to start: ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
});
