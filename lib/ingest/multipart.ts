import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { createWriteStream } from "node:fs";
import { rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import type { ReadableStream as NodeReadableStream } from "node:stream/web";
import busboy from "busboy";
import { AppError } from "@/lib/http/errors";

export interface ReceivedLog {
  fields: Record<string, string>;
  file: { path: string; name: string; type: string; size: number; sha256: string };
  /** Removes the temporary copy. */
  cleanup(): Promise<void>;
}

const tooLarge = (maxBytes: number) => new AppError("payload-too-large", `The log is larger than the ${Math.round(maxBytes / 1024 ** 2)} MB limit.`);

/**
 * Streams a multipart request with one `file` part to a temporary file, hashing it on the way,
 * so a 256 MB log never sits in memory. Text parts become `fields`.
 */
export async function receiveLogUpload(request: Request, maxBytes: number): Promise<ReceivedLog> {
  const contentType = request.headers.get("content-type") ?? "";
  if (!/^multipart\/form-data/i.test(contentType) || !request.body)
    throw new AppError("bad-request", "Send the log as multipart/form-data with a `file` part and the run's fields.");
  // Refuse at once what cannot fit; the multipart envelope adds a few kilobytes at most.
  const declared = Number(request.headers.get("content-length"));
  if (Number.isFinite(declared) && declared > maxBytes + 1024 * 1024) throw tooLarge(maxBytes);

  const tempPath = path.join(os.tmpdir(), `kneepoint-upload-${randomBytes(8).toString("hex")}`);
  const cleanup = () => rm(tempPath, { force: true });
  const fields: Record<string, string> = {};
  let file: ReceivedLog["file"] | null = null;
  let refusal: AppError | null = null;
  const writes: Promise<void>[] = [];

  const parser = busboy({
    headers: { "content-type": contentType },
    limits: { files: 1, fileSize: maxBytes, fields: 32, fieldSize: 64 * 1024 },
  });
  parser.on("field", (name, value) => {
    fields[name] = value;
  });
  parser.on("file", (name, stream, info) => {
    if (name !== "file" || file) {
      refusal ??= new AppError("bad-request", "Send exactly one file, in the part named `file`.");
      stream.resume();
      return;
    }
    const hash = createHash("sha256");
    const entry = { path: tempPath, name: info.filename || "log.csv", type: info.mimeType || "application/octet-stream", size: 0, sha256: "" };
    file = entry;
    stream.on("data", (chunk: Buffer) => {
      hash.update(chunk);
      entry.size += chunk.length;
    });
    stream.on("limit", () => {
      refusal = tooLarge(maxBytes);
    });
    writes.push(
      pipeline(stream, createWriteStream(tempPath)).then(() => {
        entry.sha256 = hash.digest("hex");
      }),
    );
  });
  parser.on("filesLimit", () => {
    refusal ??= new AppError("bad-request", "Send exactly one file per request.");
  });

  try {
    await pipeline(Readable.fromWeb(request.body as unknown as NodeReadableStream<Uint8Array>), parser);
    await Promise.all(writes);
  } catch (error) {
    await cleanup();
    if (refusal) throw refusal;
    throw new AppError("bad-request", `The multipart body could not be read: ${error instanceof Error ? error.message : String(error)}`);
  }
  if (refusal || !file) {
    await cleanup();
    throw refusal ?? new AppError("bad-request", "The request has no `file` part.", { fieldErrors: { file: ["Attach the log file"] } });
  }
  return { fields, file, cleanup };
}
