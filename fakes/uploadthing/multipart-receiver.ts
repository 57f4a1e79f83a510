import { type Hash } from "node:crypto";
import { createWriteStream } from "node:fs";
import { type IncomingMessage } from "node:http";
import { type Readable, Transform, type TransformCallback } from "node:stream";
import { pipeline } from "node:stream/promises";
import busboy from "busboy";
import { HttpError } from "../shared/http";

/** The client went away mid-body; what arrived stays on disk so the upload can resume. */
export class ClientAbortedError extends Error {
  constructor() {
    super("The client closed the connection before the upload finished");
    this.name = "ClientAbortedError";
  }
}

class HashingCounter extends Transform {
  bytes = 0;

  constructor(
    private readonly hash: Hash,
    private readonly maxBytes: number,
  ) {
    super();
  }

  override _transform(chunk: Buffer, _encoding: BufferEncoding, callback: TransformCallback): void {
    this.bytes += chunk.length;
    if (this.bytes > this.maxBytes) {
      callback(new HttpError(413, `The file is larger than the ${this.maxBytes} bytes the signed URL allows`));
      return;
    }
    this.hash.update(chunk);
    callback(null, chunk);
  }
}

export interface ReceiveOptions {
  destination: string;
  /** Resuming: append to what an earlier, interrupted request left. */
  append: boolean;
  maxBytes: number;
  hash: Hash;
}

/**
 * Streams the multipart field `file` to disk without holding it in memory (uploads reach
 * hundreds of megabytes). Resolves to the number of bytes written by this request.
 */
export function receiveFilePart(req: IncomingMessage, options: ReceiveOptions): Promise<number> {
  return new Promise((resolve, reject) => {
    let parser: busboy.Busboy;
    try {
      parser = busboy({ headers: req.headers, limits: { files: 1, fields: 20, fieldSize: 64 * 1024 } });
    } catch {
      reject(new HttpError(400, "Expected a multipart/form-data body with a `file` field"));
      return;
    }
    let settled = false;
    let fileStream: Readable | undefined;
    let written: Promise<number> | undefined;
    const fail = (error: Error) => {
      if (settled) return;
      settled = true;
      req.unpipe(parser);
      req.resume();
      fileStream?.destroy(error);
      // Let the file stream shut its descriptor before the caller moves or deletes the file.
      (written ?? Promise.resolve(0)).catch(() => undefined).finally(() => reject(error));
    };

    parser.on("file", (name, stream) => {
      if (name !== "file" || fileStream) {
        stream.resume();
        return;
      }
      fileStream = stream;
      const counter = new HashingCounter(options.hash, options.maxBytes);
      written = pipeline(stream, counter, createWriteStream(options.destination, { flags: options.append ? "a" : "w" })).then(
        () => counter.bytes,
      );
      written.catch((error: unknown) => fail(error instanceof Error ? error : new Error(String(error))));
    });
    parser.on("error", () => fail(new HttpError(400, "The multipart body is malformed or incomplete")));
    parser.on("close", () => {
      if (!written) {
        fail(new HttpError(400, "The multipart body has no `file` field"));
        return;
      }
      written.then(
        (bytes) => {
          if (settled) return;
          settled = true;
          resolve(bytes);
        },
        () => undefined,
      );
    });
    req.on("close", () => {
      if (!req.complete) fail(new ClientAbortedError());
    });
    req.pipe(parser);
  });
}
