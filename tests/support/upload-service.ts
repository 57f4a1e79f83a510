import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { startUploadFake, type UploadFake } from "@/fakes/uploadthing/server";
import { makeFakeToken } from "@/fakes/uploadthing/token";

export const fakeApiKey = "sk_kneepoint_ingest_tests";
export const fakeAppId = "kneepointingest";

export interface UploadService {
  fake: UploadFake;
  dataDir: string;
  close(): Promise<void>;
}

/**
 * The local upload fake on a free port, with the SDK pointed at it through the same environment
 * variables the app reads (the SDK reads process.env on each call). `callbackUrl` is where the
 * fake posts completion callbacks in prod mode.
 */
export async function startUploadService(): Promise<UploadService> {
  const dataDir = await mkdtemp(path.join(os.tmpdir(), "kneepoint-ingest-fake-"));
  const fake = await startUploadFake({ port: 0, dataDir, apiKey: fakeApiKey, appId: fakeAppId, log: () => undefined });
  Object.assign(process.env, {
    UPLOADTHING_TOKEN: makeFakeToken({ apiKey: fakeApiKey, appId: fakeAppId, region: "local" }),
    UPLOADTHING_INGEST_URL: fake.url,
    UPLOADTHING_API_URL: fake.url,
    UPLOADTHING_UFS_HOST: new URL(fake.url).host,
    UPLOADTHING_UFS_APP_ID_LOCATION: "path",
    UPLOADTHING_IS_DEV: "false",
    UPLOADTHING_LOG_LEVEL: "Fatal",
  });
  return {
    fake,
    dataDir,
    async close() {
      await fake.close();
      await rm(dataDir, { recursive: true, force: true });
    },
  };
}

/** Which way the fake reports a finished upload: posting to the callback URL, or on the metadata stream. */
export function useCallbackMode(mode: "prod" | "dev", callbackUrl: string): void {
  process.env.UPLOADTHING_IS_DEV = mode === "dev" ? "true" : "false";
  process.env.UPLOADTHING_CALLBACK_URL = callbackUrl;
}
