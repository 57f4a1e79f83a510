import { randomBytes } from "node:crypto";
import { mkdir, readdir, readFile, rename, rm, writeFile } from "node:fs/promises";
import path from "node:path";
import { type AddressObject, simpleParser } from "mailparser";
import { z } from "zod";

const StoredMessageSchema = z.object({
  id: z.string(),
  receivedAt: z.string(),
  /** Header From, as "Name <address>" text. */
  from: z.string(),
  /** Header To and Cc addresses. */
  to: z.array(z.string()),
  cc: z.array(z.string()),
  /** Every address the sender named in RCPT TO, Bcc included. */
  envelopeTo: z.array(z.string()),
  envelopeFrom: z.string().nullable(),
  subject: z.string(),
  /** The Date header, ISO 8601; null when absent or unreadable. */
  date: z.string().nullable(),
  text: z.string(),
  html: z.string().nullable(),
  size: z.number().int().nonnegative(),
});

export type StoredMessage = z.output<typeof StoredMessageSchema>;

const MESSAGE_ID = /^[a-z0-9]+-[a-f0-9]+$/;

function addresses(field: AddressObject | AddressObject[] | undefined): string[] {
  const objects = field === undefined ? [] : Array.isArray(field) ? field : [field];
  const flat = objects.flatMap((object) => object.value).flatMap((entry) => [entry, ...(entry.group ?? [])]);
  return flat.map((entry) => entry.address).filter((address): address is string => Boolean(address));
}

/**
 * The inbox on disk: `<id>.eml` holds the message exactly as received and `<id>.json` what was
 * parsed from it. Both are written to `tmp/` and renamed, the JSON last, so a listed message
 * always has its raw source.
 */
export class MessageStore {
  private readonly messages = new Map<string, StoredMessage>();
  private lastStamp = 0;

  private constructor(private readonly dir: string) {}

  static async open(dataDir: string, log: (line: string) => void): Promise<MessageStore> {
    const store = new MessageStore(path.resolve(dataDir, "messages"));
    await mkdir(path.join(store.dir, "tmp"), { recursive: true });
    for (const name of await readdir(store.dir)) {
      if (!name.endsWith(".json")) continue;
      try {
        const message = StoredMessageSchema.parse(JSON.parse(await readFile(path.join(store.dir, name), "utf8")));
        store.messages.set(message.id, message);
        store.lastStamp = Math.max(store.lastStamp, Number.parseInt(message.id.split("-")[0] ?? "0", 36));
      } catch (error) {
        log(`skipping unreadable message record ${name}: ${error instanceof Error ? error.message : String(error)}`);
      }
    }
    return store;
  }

  async add(raw: Buffer, envelope: { from: string | null; to: string[] }): Promise<StoredMessage> {
    const parsed = await simpleParser(raw);
    const receivedAt = new Date();
    // A strictly increasing time stamp first, so ids sort in arrival order even within a millisecond.
    this.lastStamp = Math.max(receivedAt.getTime(), this.lastStamp + 1);
    const id = `${this.lastStamp.toString(36).padStart(10, "0")}-${randomBytes(4).toString("hex")}`;
    const message: StoredMessage = {
      id,
      receivedAt: receivedAt.toISOString(),
      from: parsed.from?.text ?? envelope.from ?? "",
      to: addresses(parsed.to),
      cc: addresses(parsed.cc),
      envelopeTo: envelope.to,
      envelopeFrom: envelope.from,
      subject: parsed.subject ?? "",
      date: parsed.date && !Number.isNaN(parsed.date.getTime()) ? parsed.date.toISOString() : null,
      text: parsed.text ?? "",
      html: typeof parsed.html === "string" ? parsed.html : null,
      size: raw.length,
    };
    await this.writeAtomically(`${id}.eml`, raw);
    await this.writeAtomically(`${id}.json`, JSON.stringify(message, null, 2));
    this.messages.set(id, message);
    return message;
  }

  /** Newest first; `to` matches any recipient (header To/Cc or envelope), ignoring case. */
  list(filter: { to?: string } = {}): StoredMessage[] {
    const wanted = filter.to?.trim().toLowerCase();
    return [...this.messages.values()]
      .filter((m) => !wanted || [...m.to, ...m.cc, ...m.envelopeTo].some((address) => address.toLowerCase() === wanted))
      .sort((a, b) => b.id.localeCompare(a.id));
  }

  get(id: string): StoredMessage | undefined {
    return MESSAGE_ID.test(id) ? this.messages.get(id) : undefined;
  }

  async raw(id: string): Promise<Buffer | undefined> {
    return this.get(id) ? readFile(path.join(this.dir, `${id}.eml`)) : undefined;
  }

  async clear(): Promise<number> {
    const ids = [...this.messages.keys()];
    for (const id of ids) {
      await rm(path.join(this.dir, `${id}.json`), { force: true });
      await rm(path.join(this.dir, `${id}.eml`), { force: true });
      this.messages.delete(id);
    }
    return ids.length;
  }

  private async writeAtomically(name: string, content: string | Buffer): Promise<void> {
    const temp = path.join(this.dir, "tmp", `${name}.${randomBytes(4).toString("hex")}`);
    await writeFile(temp, content);
    await rename(temp, path.join(this.dir, name));
  }
}
