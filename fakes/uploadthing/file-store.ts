import { randomUUID } from "node:crypto";
import { mkdir, readdir, readFile, rename, rm, stat, writeFile } from "node:fs/promises";
import path from "node:path";
import { z } from "zod";

const StoredFileSchema = z.object({
  id: z.string(),
  key: z.string(),
  customId: z.string().nullable(),
  name: z.string(),
  size: z.number().int().nonnegative(),
  type: z.string(),
  acl: z.enum(["public-read", "private"]),
  contentDisposition: z.enum(["inline", "attachment"]),
  fileHash: z.string(),
  uploadedAt: z.number(),
});

export type StoredFile = z.output<typeof StoredFileSchema>;
export type Acl = StoredFile["acl"];

// Keys the SDK generates are sqids (letters and digits); anything path-like is refused outright.
const SAFE_KEY = /^[A-Za-z0-9][A-Za-z0-9._-]{0,254}$/;

export function isSafeKey(key: string): boolean {
  return SAFE_KEY.test(key);
}

/**
 * Bytes and metadata on disk under one directory: `files/<key>` (complete uploads),
 * `partial/<key>` (interrupted uploads, for resuming), `meta/<key>.json`. Metadata is written
 * to `tmp/` and renamed into place, so a crash never leaves half a record.
 */
export class FileStore {
  private readonly records = new Map<string, StoredFile>();

  private constructor(private readonly dataDir: string) {}

  static async open(dataDir: string, log: (line: string) => void): Promise<FileStore> {
    const store = new FileStore(path.resolve(dataDir));
    for (const dir of ["files", "partial", "meta", "tmp"]) await mkdir(store.dir(dir), { recursive: true });
    for (const name of await readdir(store.dir("meta"))) {
      if (!name.endsWith(".json")) continue;
      try {
        const record = StoredFileSchema.parse(JSON.parse(await readFile(path.join(store.dir("meta"), name), "utf8")));
        await stat(store.filePath(record.key));
        store.records.set(record.key, record);
      } catch (error) {
        log(`skipping unreadable upload record ${name}: ${error instanceof Error ? error.message : String(error)}`);
      }
    }
    return store;
  }

  private dir(name: string): string {
    return path.join(this.dataDir, name);
  }

  filePath(key: string): string {
    return path.join(this.dir("files"), key);
  }

  partialPath(key: string): string {
    return path.join(this.dir("partial"), key);
  }

  async partialSize(key: string): Promise<number> {
    try {
      const info = await stat(this.partialPath(key));
      return info.isFile() ? info.size : 0;
    } catch {
      return 0;
    }
  }

  async discardPartial(key: string): Promise<void> {
    await rm(this.partialPath(key), { force: true, recursive: true });
  }

  get(key: string): StoredFile | undefined {
    return this.records.get(key);
  }

  findByCustomId(customId: string): StoredFile | undefined {
    for (const record of this.records.values()) if (record.customId === customId) return record;
    return undefined;
  }

  /** Newest first, as a listing of recent uploads is usually read. */
  list(): StoredFile[] {
    return [...this.records.values()].sort((a, b) => b.uploadedAt - a.uploadedAt || a.key.localeCompare(b.key));
  }

  /** Moves a fully received partial upload into place and records it. */
  async commit(record: Omit<StoredFile, "id" | "uploadedAt">): Promise<StoredFile> {
    const full: StoredFile = { ...record, id: randomUUID(), uploadedAt: Date.now() };
    await rename(this.partialPath(record.key), this.filePath(record.key));
    await this.writeRecord(full);
    return full;
  }

  async update(key: string, patch: Partial<Pick<StoredFile, "name" | "acl">>): Promise<StoredFile> {
    const current = this.records.get(key);
    if (!current) throw new Error(`No stored file ${key}`);
    const next = { ...current, ...patch };
    await this.writeRecord(next);
    return next;
  }

  async delete(key: string): Promise<boolean> {
    if (!this.records.has(key)) return false;
    // Record first: if the process dies in between, the orphaned bytes are ignored at start-up.
    await rm(this.metaPath(key), { force: true });
    await rm(this.filePath(key), { force: true });
    this.records.delete(key);
    return true;
  }

  totalBytes(): number {
    let total = 0;
    for (const record of this.records.values()) total += record.size;
    return total;
  }

  private metaPath(key: string): string {
    return path.join(this.dir("meta"), `${key}.json`);
  }

  private async writeRecord(record: StoredFile): Promise<void> {
    const temp = path.join(this.dir("tmp"), `${record.key}.${randomUUID()}.json`);
    await writeFile(temp, JSON.stringify(record, null, 2));
    await rename(temp, this.metaPath(record.key));
    this.records.set(record.key, record);
  }
}
