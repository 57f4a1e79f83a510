import { type IncomingMessage, type ServerResponse } from "node:http";
import { z } from "zod";
import { HttpError, parseWith, readJson, sendJson } from "../shared/http";
import { fileUrls, type FakeContext } from "./context";
import { type StoredFile } from "./file-store";
import { signUrl } from "./signing";

/** Reply shapes follow the response schemas in `uploadthing/server/index.js` (class `UTApi`). */

const KeysBody = z.union([z.object({ fileKeys: z.array(z.string()) }), z.object({ customIds: z.array(z.string()) })]);
const ListBody = z.object({ limit: z.number().int().positive().optional(), offset: z.number().int().nonnegative().optional() });
const Target = z.union([z.object({ fileKey: z.string() }), z.object({ customId: z.string() })]);
const RenameBody = z.object({ updates: z.array(z.intersection(Target, z.object({ newName: z.string().min(1) }))) });
const AclBody = z.object({ updates: z.array(z.intersection(Target, z.object({ acl: z.enum(["public-read", "private"]) }))) });
const AccessBody = z.intersection(Target, z.object({ expiresIn: z.number().positive().max(7 * 86400).optional() }));

const DEFAULT_LIST_LIMIT = 500;
const DEFAULT_ACCESS_SECONDS = 3600;

function lookup(ctx: FakeContext, target: z.output<typeof Target>): StoredFile | undefined {
  return "fileKey" in target ? ctx.store.get(target.fileKey) : ctx.store.findByCustomId(target.customId);
}

function requireOne(ctx: FakeContext, target: z.output<typeof Target>): StoredFile {
  const record = lookup(ctx, target);
  if (!record) throw new HttpError(404, `No file with ${"fileKey" in target ? `key ${target.fileKey}` : `custom id ${target.customId}`}`);
  return record;
}

/** Checks every target before changing any, so a bad batch changes nothing. */
function requireAll<T extends z.output<typeof Target>>(ctx: FakeContext, targets: T[]): Array<[T, StoredFile]> {
  return targets.map((target) => [target, requireOne(ctx, target)]);
}

function matchKeys(ctx: FakeContext, body: z.output<typeof KeysBody>): StoredFile[] {
  const targets = "fileKeys" in body ? body.fileKeys.map((fileKey) => ({ fileKey })) : body.customIds.map((customId) => ({ customId }));
  return targets.map((target) => lookup(ctx, target)).filter((record): record is StoredFile => record !== undefined);
}

type ApiHandler = (ctx: FakeContext, body: unknown) => Promise<unknown>;

const handlers: Record<string, ApiHandler> = {
  async deleteFiles(ctx, body) {
    let deletedCount = 0;
    for (const record of matchKeys(ctx, parseWith(KeysBody, body, "deleteFiles body"))) {
      if (await ctx.store.delete(record.key)) deletedCount += 1;
    }
    return { success: true, deletedCount };
  },
  async getFileUrl(ctx, body) {
    const records = matchKeys(ctx, parseWith(KeysBody, body, "getFileUrl body"));
    return { data: records.map((record) => ({ key: record.key, url: fileUrls(ctx, record.key).url })) };
  },
  async listFiles(ctx, body) {
    const { limit = DEFAULT_LIST_LIMIT, offset = 0 } = parseWith(ListBody, body, "listFiles body");
    const all = ctx.store.list();
    const files = all.slice(offset, offset + limit).map((record) => ({
      id: record.id,
      customId: record.customId,
      key: record.key,
      name: record.name,
      size: record.size,
      status: "Uploaded" as const,
      uploadedAt: record.uploadedAt,
    }));
    return { hasMore: offset + limit < all.length, files };
  },
  async renameFiles(ctx, body) {
    const { updates } = parseWith(RenameBody, body, "renameFiles body");
    for (const [update, record] of requireAll(ctx, updates)) await ctx.store.update(record.key, { name: update.newName });
    return { success: true };
  },
  async updateACL(ctx, body) {
    const { updates } = parseWith(AclBody, body, "updateACL body");
    for (const [update, record] of requireAll(ctx, updates)) await ctx.store.update(record.key, { acl: update.acl });
    return { success: true };
  },
  async requestFileAccess(ctx, body) {
    const request = parseWith(AccessBody, body, "requestFileAccess body");
    const record = requireOne(ctx, request);
    const seconds = request.expiresIn ?? DEFAULT_ACCESS_SECONDS;
    const urls = fileUrls(ctx, record.key);
    return { url: signUrl(urls.url, ctx.apiKey, seconds), ufsUrl: signUrl(urls.ufsUrl, ctx.apiKey, seconds) };
  },
  async getUsageInfo(ctx) {
    const totalBytes = ctx.store.totalBytes();
    return { totalBytes, appTotalBytes: totalBytes, filesUploaded: ctx.store.list().length, limitBytes: ctx.limitBytes };
  },
};

/** `POST /v6/<name>`: the server-side UTApi, authenticated by the `x-uploadthing-api-key` header. */
export async function handleApi(req: IncomingMessage, res: ServerResponse, ctx: FakeContext, name: string): Promise<void> {
  const handler = Object.hasOwn(handlers, name) ? handlers[name] : undefined;
  if (!handler) throw new HttpError(404, `Unknown API endpoint /v6/${name}`);
  if (req.method !== "POST") throw new HttpError(405, "API endpoints take POST");
  if (req.headers["x-uploadthing-api-key"] !== ctx.apiKey) throw new HttpError(401, "Missing or wrong x-uploadthing-api-key");
  const { value } = await readJson(req);
  sendJson(res, 200, await handler(ctx, value));
}
