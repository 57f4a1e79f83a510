import { type IncomingMessage } from "node:http";
import { type CallbackCoordinator } from "./callbacks";
import { type FileStore } from "./file-store";

export interface FakeContext {
  store: FileStore;
  coordinator: CallbackCoordinator;
  apiKey: string;
  appId: string;
  /** Browser- and app-facing base URL, without a trailing slash; must equal the SDK's ingest URL. */
  publicUrl: string;
  limitBytes: number;
  log(line: string): void;
}

/** The origins a signed URL may have been built with: the advertised one and whatever Host the client used. */
export function requestOrigins(req: IncomingMessage, ctx: FakeContext): string[] {
  const origins = [new URL(ctx.publicUrl).origin];
  if (req.headers.host) origins.push(`http://${req.headers.host}`);
  return [...new Set(origins)];
}

export function fileUrls(ctx: FakeContext, key: string): { url: string; appUrl: string; ufsUrl: string } {
  const appUrl = `${ctx.publicUrl}/a/${encodeURIComponent(ctx.appId)}/${key}`;
  // Path mode (`UPLOADTHING_UFS_APP_ID_LOCATION=path`): the file host URL is the app URL.
  return { url: `${ctx.publicUrl}/f/${key}`, appUrl, ufsUrl: appUrl };
}
