/**
 * The local stand-ins for hosted services that `npm start` runs beside the app: the file-upload
 * service (spoken to through the real UploadThing SDK) and an SMTP server with a viewable inbox.
 * A stand-in is skipped when the environment already points the app at a real service, so
 * switching to the hosted upload service or the lab's mail server is a change of env alone.
 */
import { randomBytes } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { startSmtpFake } from "@/fakes/smtp/server";
import { startUploadFake } from "@/fakes/uploadthing/server";
import { decodeToken, makeFakeToken } from "@/fakes/uploadthing/token";

export interface LocalServices {
  env: Record<string, string>;
  close(): Promise<void>;
}

function port(env: NodeJS.ProcessEnv, name: string, fallback: number): number {
  const value = Number(env[name] ?? fallback);
  if (!Number.isInteger(value) || value < 0 || value > 65535) throw new Error(`${name} is not a port number: ${env[name]}`);
  return value;
}

/** The local upload token is made once per data directory, so stored file URLs stay valid across restarts. */
function localUploadToken(dataRoot: string): string {
  const file = path.join(dataRoot, "upload-token");
  if (!fs.existsSync(file)) {
    fs.mkdirSync(dataRoot, { recursive: true });
    const token = makeFakeToken({ apiKey: `sk_local_${randomBytes(24).toString("hex")}`, appId: "kneepoint-local", region: "local" });
    fs.writeFileSync(file, token, { mode: 0o600 });
  }
  return fs.readFileSync(file, "utf8").trim();
}

export async function startLocalServices(dataRoot: string, env: NodeJS.ProcessEnv): Promise<LocalServices> {
  const out: Record<string, string> = {};
  const closers: (() => Promise<void>)[] = [];

  if (!env.UPLOADTHING_INGEST_URL && !env.UPLOADTHING_API_URL) {
    const token = env.UPLOADTHING_TOKEN ?? localUploadToken(dataRoot);
    const { apiKey, appId } = decodeToken(token);
    const fake = await startUploadFake({ port: port(env, "FAKE_UPLOAD_PORT", 4001), dataDir: path.join(dataRoot, "uploads"), apiKey, appId });
    closers.push(fake.close);
    const host = new URL(fake.url).host;
    Object.assign(out, {
      UPLOADTHING_TOKEN: token,
      UPLOADTHING_INGEST_URL: fake.url,
      UPLOADTHING_API_URL: fake.url,
      UPLOADTHING_UFS_HOST: host,
      UPLOADTHING_UFS_APP_ID_LOCATION: "path",
      UPLOADTHING_LOG_LEVEL: "Error",
    });
    console.log(`Local upload service: ${fake.url}`);
  }
  if (env.BETTER_AUTH_URL && !env.UPLOADTHING_CALLBACK_URL) out.UPLOADTHING_CALLBACK_URL = `${env.BETTER_AUTH_URL}/api/uploadthing`;

  if (!env.SMTP_URL) {
    const smtp = await startSmtpFake({
      smtpPort: port(env, "FAKE_SMTP_PORT", 2525),
      httpPort: port(env, "FAKE_SMTP_HTTP_PORT", 8025),
      dataDir: path.join(dataRoot, "mail"),
    });
    closers.push(smtp.close);
    Object.assign(out, { SMTP_URL: `smtp://127.0.0.1:${smtp.smtpPort}`, KNEEPOINT_DEV_INBOX_URL: smtp.httpUrl });
    console.log(`Local mail inbox: ${smtp.httpUrl}`);
  }

  return {
    env: out,
    async close() {
      await Promise.allSettled(closers.map((close) => close()));
    },
  };
}
