import { type IncomingMessage, type Server, type ServerResponse } from "node:http";
import { type AddressInfo, type Server as NetServer } from "node:net";
import { z } from "zod";

/** An error whose message is safe to show the caller; anything else becomes a generic 500. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    message: string,
  ) {
    super(message);
    this.name = "HttpError";
  }
}

export function sendJson(res: ServerResponse, status: number, body: unknown, headers: Record<string, string> = {}): void {
  const text = JSON.stringify(body);
  res.writeHead(status, {
    ...headers,
    "content-type": "application/json; charset=utf-8",
    "content-length": String(Buffer.byteLength(text)),
    "cache-control": "no-store",
  });
  res.end(text);
}

/**
 * Answers with `{ error }` and never a stack trace. An error reply can come before the request
 * body was read, so the connection is closed rather than left with unread bytes on it.
 */
export function sendError(res: ServerResponse, error: unknown, log: (line: string) => void): void {
  const status = error instanceof HttpError ? error.status : 500;
  const message = error instanceof HttpError ? error.message : "Internal error in the local fake";
  if (!(error instanceof HttpError)) log(`internal error: ${error instanceof Error ? error.message : String(error)}`);
  if (res.headersSent) {
    res.destroy();
    return;
  }
  sendJson(res, status, { error: message }, { connection: "close" });
}

export async function readBody(req: IncomingMessage, limitBytes: number): Promise<Buffer> {
  const chunks: Buffer[] = [];
  let total = 0;
  for await (const chunk of req) {
    const buffer = Buffer.isBuffer(chunk) ? chunk : Buffer.from(String(chunk));
    total += buffer.length;
    if (total > limitBytes) throw new HttpError(413, `Request body is larger than ${limitBytes} bytes`);
    chunks.push(buffer);
  }
  return Buffer.concat(chunks);
}

export async function readJson(req: IncomingMessage, limitBytes = 1024 * 1024): Promise<{ raw: string; value: unknown }> {
  const raw = (await readBody(req, limitBytes)).toString("utf8");
  try {
    return { raw, value: raw.trim() === "" ? {} : (JSON.parse(raw) as unknown) };
  } catch {
    throw new HttpError(400, "Request body is not valid JSON");
  }
}

export function parseWith<T extends z.ZodType>(schema: T, value: unknown, what: string): z.output<T> {
  const result = schema.safeParse(value);
  if (!result.success) throw new HttpError(400, `Invalid ${what}: ${z.prettifyError(result.error)}`);
  return result.data;
}

export function listen(server: NetServer, port: number, host: string): Promise<number> {
  return new Promise((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, host, () => {
      server.off("error", reject);
      resolve((server.address() as AddressInfo).port);
    });
  });
}

export function closeServer(server: Server): Promise<void> {
  return new Promise((resolve, reject) => {
    server.close((error) => (error ? reject(error) : resolve()));
    // Keep-alive sockets from SDK clients would otherwise hold close() open indefinitely.
    server.closeAllConnections();
  });
}

/** Host names that only this machine can reach, advertised as `localhost` (the SDK picks http only for hosts containing "local"). */
export function advertisedHost(host: string): string {
  return ["127.0.0.1", "::1", "0.0.0.0", "::", "localhost"].includes(host) ? "localhost" : host;
}
