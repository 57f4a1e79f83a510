import { createHash, type Hash } from "node:crypto";
import { createReadStream } from "node:fs";
import { type IncomingMessage, type ServerResponse } from "node:http";
import { pipeline } from "node:stream/promises";
import { HttpError, sendJson } from "../shared/http";
import { type UploadedFileData } from "./callbacks";
import { fileUrls, type FakeContext, requestOrigins } from "./context";
import { type Acl, isSafeKey, type StoredFile } from "./file-store";
import { ClientAbortedError, receiveFilePart } from "./multipart-receiver";
import { checkSignedUrl } from "./signing";

interface UploadTicket {
  key: string;
  declaredSize: number;
  name: string;
  type: string;
  slug: string | undefined;
  customId: string | null;
  contentDisposition: StoredFile["contentDisposition"];
  acl: Acl;
}

/** Reads and checks the presigned URL the SDK built (`generateSignedURL` in `@uploadthing/shared`). */
function readTicket(req: IncomingMessage, ctx: FakeContext, key: string): UploadTicket {
  if (!isSafeKey(key)) throw new HttpError(400, "The file key is not valid");
  const check = checkSignedUrl(req.url ?? "/", requestOrigins(req, ctx), ctx.apiKey);
  if (!check.ok) throw new HttpError(check.status, check.error);
  if (check.param("x-ut-identifier") !== ctx.appId) throw new HttpError(403, "The URL was signed for another app");
  const declaredSize = Number(check.param("x-ut-file-size"));
  if (!Number.isSafeInteger(declaredSize) || declaredSize < 0) {
    throw new HttpError(400, "The signed URL has no valid x-ut-file-size");
  }
  const contentDisposition = check.param("x-ut-content-disposition") ?? "inline";
  if (contentDisposition !== "inline" && contentDisposition !== "attachment") {
    throw new HttpError(400, "x-ut-content-disposition must be inline or attachment");
  }
  const acl = check.param("x-ut-acl") ?? "public-read";
  if (acl !== "public-read" && acl !== "private") throw new HttpError(400, "x-ut-acl must be public-read or private");
  return {
    key,
    declaredSize,
    name: check.param("x-ut-file-name") ?? key,
    type: check.param("x-ut-file-type") || "application/octet-stream",
    slug: check.param("x-ut-slug"),
    customId: check.param("x-ut-custom-id") ?? null,
    contentDisposition,
    acl,
  };
}

function rangeStart(header: string | undefined): number {
  if (!header) return 0;
  const match = /^bytes=(\d+)-$/.exec(header.trim());
  if (!match?.[1]) throw new HttpError(416, "Range must have the form bytes=<start>-");
  return Number(match[1]);
}

async function hashExisting(path: string, hash: Hash): Promise<void> {
  await pipeline(createReadStream(path), async function* (source: AsyncIterable<Buffer>) {
    for await (const chunk of source) hash.update(chunk);
  });
}

/** `HEAD <presigned>`: the browser asks how much of the file is already here before it PUTs the rest. */
export async function handleUploadHead(req: IncomingMessage, res: ServerResponse, ctx: FakeContext, key: string): Promise<void> {
  const ticket = readTicket(req, ctx, key);
  const start = ctx.store.get(ticket.key) ? 0 : await ctx.store.partialSize(ticket.key);
  res.writeHead(200, { "x-ut-range-start": String(start), "content-length": "0" });
  res.end();
}

export class UploadIngest {
  private readonly active = new Set<string>();

  constructor(private readonly ctx: FakeContext) {}

  /** `PUT <presigned>`: store the bytes, then (browser uploads) tell the app and relay its `serverData`. */
  async handlePut(req: IncomingMessage, res: ServerResponse, key: string): Promise<void> {
    const ticket = readTicket(req, this.ctx, key);
    if (this.ctx.store.get(ticket.key)) throw new HttpError(409, "A file with this key has already been uploaded");
    if (this.active.has(ticket.key)) throw new HttpError(409, "An upload for this key is already in progress");
    this.active.add(ticket.key);
    try {
      const record = await this.receive(req, ticket);
      if (!record) return;
      const reply = { ...fileUrls(this.ctx, record.key), fileHash: record.fileHash };
      const registration = ticket.slug ? await this.ctx.coordinator.waitForRegistration(ticket.key) : undefined;
      if (ticket.slug && !registration) {
        this.ctx.log(`upload ${ticket.key} is stored, but the app registered no route metadata for it`);
        throw new HttpError(400, "The file was stored, but the app never registered route metadata for it, so it cannot be told");
      }
      if (!registration) {
        sendJson(res, 200, reply);
        return;
      }
      const file: UploadedFileData = {
        name: record.name,
        size: record.size,
        type: record.type,
        customId: record.customId,
        key: record.key,
        ...reply,
      };
      const serverData = await this.ctx.coordinator.complete(registration, file);
      sendJson(res, 200, { ...reply, serverData });
    } finally {
      this.active.delete(ticket.key);
    }
  }

  /** Resolves to the stored record, or undefined when the client went away (the partial bytes stay). */
  private async receive(req: IncomingMessage, ticket: UploadTicket): Promise<StoredFile | undefined> {
    const { store } = this.ctx;
    // Checked before anything is written: a wrong offset must not cost the bytes already stored.
    const start = rangeStart(req.headers.range);
    const already = await store.partialSize(ticket.key);
    if (start !== 0 && start !== already) {
      throw new HttpError(416, `Cannot resume at byte ${start}: ${already} bytes of this file are stored`);
    }
    if (start > ticket.declaredSize) throw new HttpError(416, "The range starts beyond the declared file size");
    try {
      const hash = createHash("sha256");
      if (start > 0) await hashExisting(store.partialPath(ticket.key), hash);
      const received = await receiveFilePart(req, {
        destination: store.partialPath(ticket.key),
        append: start > 0,
        maxBytes: ticket.declaredSize - start,
        hash,
      });
      if (start + received !== ticket.declaredSize) {
        throw new HttpError(400, `Received ${start + received} bytes, but the signed URL declares ${ticket.declaredSize}`);
      }
      return await store.commit({
        key: ticket.key,
        customId: ticket.customId,
        name: ticket.name,
        size: ticket.declaredSize,
        type: ticket.type,
        acl: ticket.acl,
        contentDisposition: ticket.contentDisposition,
        fileHash: hash.digest("hex"),
      });
    } catch (error) {
      if (error instanceof ClientAbortedError) return undefined;
      await store.discardPartial(ticket.key).catch(() => undefined);
      // A refused request is the client's to fix and retry; only our own failure is reported to the app.
      const registration = ticket.slug && !(error instanceof HttpError) ? this.ctx.coordinator.registered(ticket.key) : undefined;
      if (registration) {
        const code = (error as NodeJS.ErrnoException).code;
        this.ctx.coordinator.fail(registration, `The upload fake could not store the file${code ? ` (${code})` : ""}`);
      }
      throw error;
    }
  }
}
