import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import { advertisedHost, closeServer, HttpError, listen, parseWith, readJson, sendError, sendJson } from "../shared/http";
import { handleApi } from "./api-routes";
import { CallbackCoordinator, CallbackResultSchema, RouteMetadataSchema } from "./callbacks";
import { type FakeContext } from "./context";
import { FileStore } from "./file-store";
import { handleUploadHead, UploadIngest } from "./ingest";
import { serveFile } from "./serve-file";

export interface UploadFakeOptions {
  /** 0 picks a free port. */
  port?: number;
  host?: string;
  dataDir: string;
  apiKey: string;
  appId: string;
  /** Base URL the SDK is configured with (ingest, API and file host); defaults to http://localhost:<port>. */
  publicUrl?: string;
  /** How long a PUT that names a route waits for the app to register its metadata (dev mode races). */
  metadataWaitMs?: number;
  /** How long a PUT waits for the app's `onUploadComplete` result. */
  callbackWaitMs?: number;
  /** Storage quota reported by getUsageInfo. */
  limitBytes?: number;
  log?: (line: string) => void;
}

export interface UploadFake {
  url: string;
  close(): Promise<void>;
}

const CORS_HEADERS = {
  "access-control-allow-origin": "*",
  "access-control-allow-methods": "GET,HEAD,PUT,POST,OPTIONS",
  "access-control-expose-headers": "x-ut-range-start, content-range, content-length, etag",
  "access-control-max-age": "600",
};

function decodeSegment(segment: string): string {
  try {
    return decodeURIComponent(segment);
  } catch {
    throw new HttpError(400, "Malformed percent-encoding in the path");
  }
}

function authorizeIngestCall(req: IncomingMessage, ctx: FakeContext): void {
  if (req.method !== "POST") throw new HttpError(405, "Use POST");
  if (req.headers["x-uploadthing-api-key"] !== ctx.apiKey) throw new HttpError(401, "Missing or wrong x-uploadthing-api-key");
}

async function route(req: IncomingMessage, res: ServerResponse, ctx: FakeContext, ingest: UploadIngest): Promise<void> {
  const { pathname } = new URL(req.url ?? "/", "http://placeholder.invalid");
  const segments = pathname.split("/").slice(1).map(decodeSegment);
  const method = req.method ?? "GET";
  if (method === "OPTIONS") {
    // Browsers preflight the PUT because of its Range and tracing headers.
    res.writeHead(204, { "access-control-allow-headers": req.headers["access-control-request-headers"] ?? "*" });
    res.end();
    return;
  }
  const [first, second, third] = segments;
  if (pathname === "/route-metadata") {
    authorizeIngestCall(req, ctx);
    ctx.coordinator.register(parseWith(RouteMetadataSchema, (await readJson(req)).value, "route metadata"), res);
    return;
  }
  if (pathname === "/callback-result") {
    authorizeIngestCall(req, ctx);
    ctx.coordinator.acceptResult(parseWith(CallbackResultSchema, (await readJson(req)).value, "callback result"));
    sendJson(res, 200, { ok: true });
    return;
  }
  if (first === "v6" && second && segments.length === 2) return handleApi(req, res, ctx, second);
  const isRead = method === "GET" || method === "HEAD";
  if (isRead && first === "f" && second && segments.length === 2) return serveFile(req, res, ctx, second);
  if (isRead && first === "a" && second && third && segments.length === 3) {
    if (second !== ctx.appId) throw new HttpError(404, "No such app");
    return serveFile(req, res, ctx, third);
  }
  if (first && segments.length === 1) {
    if (method === "HEAD") return handleUploadHead(req, res, ctx, first);
    if (method === "PUT") return ingest.handlePut(req, res, first);
  }
  throw new HttpError(404, `Nothing at ${method} ${pathname}`);
}

/**
 * A local stand-in for the hosted upload service that the real UploadThing SDK talks to when
 * `UPLOADTHING_INGEST_URL`, `UPLOADTHING_API_URL` and `UPLOADTHING_UFS_HOST` point here.
 */
export async function startUploadFake(options: UploadFakeOptions): Promise<UploadFake> {
  const log = options.log ?? ((line: string) => console.error(`[upload-fake] ${line}`));
  const host = options.host ?? "127.0.0.1";
  const store = await FileStore.open(options.dataDir, log);
  const server = createServer();
  const port = await listen(server, options.port ?? 0, host);
  const publicUrl = (options.publicUrl ?? `http://${advertisedHost(host)}:${port}`).replace(/\/+$/, "");
  if (new URL(publicUrl).pathname !== "/") throw new Error("publicUrl must be an origin without a path");
  const coordinator = new CallbackCoordinator({
    apiKey: options.apiKey,
    origin: publicUrl,
    metadataWaitMs: options.metadataWaitMs ?? 15_000,
    callbackWaitMs: options.callbackWaitMs ?? 300_000,
    // The SDK's presigned URLs live an hour by default; a registration needs no longer.
    registrationTtlMs: 3_600_000,
    log,
  });
  const ctx: FakeContext = {
    store,
    coordinator,
    apiKey: options.apiKey,
    appId: options.appId,
    publicUrl,
    limitBytes: options.limitBytes ?? 2 * 1024 ** 3,
    log,
  };
  const ingest = new UploadIngest(ctx);
  server.on("request", (req: IncomingMessage, res: ServerResponse) => {
    for (const [name, value] of Object.entries(CORS_HEADERS)) res.setHeader(name, value);
    route(req, res, ctx, ingest).catch((error: unknown) => sendError(res, error, log));
  });
  return {
    url: publicUrl,
    async close() {
      coordinator.close();
      await closeServer(server);
    },
  };
}
