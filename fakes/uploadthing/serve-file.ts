import { createReadStream } from "node:fs";
import { type IncomingMessage, type ServerResponse } from "node:http";
import { pipeline } from "node:stream/promises";
import { HttpError } from "../shared/http";
import { type FakeContext, requestOrigins } from "./context";
import { isSafeKey, type StoredFile } from "./file-store";
import { checkSignedUrl } from "./signing";

interface ByteRange {
  start: number;
  /** Inclusive, as in Content-Range. */
  end: number;
}

/**
 * One byte range per RFC 9110 §14.1.2. A header we do not understand (or several ranges) is
 * ignored and the whole file sent, which the RFC allows.
 */
export function parseRange(header: string | undefined, size: number): ByteRange | "unsatisfiable" | undefined {
  const match = header ? /^bytes=(\d*)-(\d*)$/.exec(header.trim()) : null;
  if (!match) return undefined;
  const [, first = "", last = ""] = match;
  if (first === "" && last === "") return undefined;
  if (first === "") {
    const suffix = Number(last);
    return suffix === 0 || size === 0 ? "unsatisfiable" : { start: Math.max(0, size - suffix), end: size - 1 };
  }
  const start = Number(first);
  if (last !== "" && Number(last) < start) return undefined;
  if (start >= size) return "unsatisfiable";
  return { start, end: last === "" ? size - 1 : Math.min(Number(last), size - 1) };
}

function contentDisposition(record: StoredFile): string {
  const fallback = record.name.replace(/[^\x20-\x7e]|["\\]/g, "_");
  const encoded = encodeURIComponent(record.name).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
  return `${record.contentDisposition}; filename="${fallback}"; filename*=UTF-8''${encoded}`;
}

/** `GET|HEAD /f/<key>` and `/a/<appId>/<key>`: public files as they are, private ones only with a valid signature. */
export async function serveFile(req: IncomingMessage, res: ServerResponse, ctx: FakeContext, key: string): Promise<void> {
  const record = isSafeKey(key) ? ctx.store.get(key) : undefined;
  if (!record) throw new HttpError(404, "No such file");
  if (record.acl === "private") {
    const check = checkSignedUrl(req.url ?? "/", requestOrigins(req, ctx), ctx.apiKey);
    if (!check.ok) throw new HttpError(check.status, `This file is private: ${check.error}`);
  }
  const headers: Record<string, string> = {
    "content-type": record.type,
    "content-disposition": contentDisposition(record),
    "accept-ranges": "bytes",
    etag: `"${record.fileHash}"`,
    "cache-control": record.acl === "private" ? "private, no-store" : "public, max-age=31536000, immutable",
  };
  const range = parseRange(req.headers.range, record.size);
  if (range === "unsatisfiable") {
    res.writeHead(416, { ...headers, "content-range": `bytes */${record.size}`, "content-length": "0" });
    res.end();
    return;
  }
  const status = range ? 206 : 200;
  const start = range?.start ?? 0;
  const end = range?.end ?? record.size - 1;
  if (range) headers["content-range"] = `bytes ${start}-${end}/${record.size}`;
  res.writeHead(status, { ...headers, "content-length": String(Math.max(0, end - start + 1)) });
  if (req.method === "HEAD" || record.size === 0) {
    res.end();
    return;
  }
  try {
    await pipeline(createReadStream(ctx.store.filePath(record.key), { start, end }), res);
  } catch (error) {
    // A reader that stops early (a video seek, a cancelled download) is normal, not a fault.
    if ((error as NodeJS.ErrnoException).code !== "ERR_STREAM_PREMATURE_CLOSE") throw error;
  }
}
