/**
 * The audit trail is append-only twice over: no code in the app issues an UPDATE or DELETE on it
 * (checked by reading the source), and the database refuses one anyway (a trigger, migration 0003).
 */
import fs from "node:fs";
import path from "node:path";
import { eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { DatabaseHandle } from "@/lib/db/client";
import { recordAudit } from "@/lib/db/queries/audit";
import { auditEvent } from "@/lib/db/schema";
import { installTestDatabase, removeTestDatabase } from "../support/db";

let handle: DatabaseHandle;
beforeAll(async () => {
  handle = await installTestDatabase();
});
afterAll(removeTestDatabase);

/** Drizzle's postgres errors wrap the driver's error; the trigger's message is on the cause. */
function messageChain(error: unknown): string {
  const parts: string[] = [];
  let current: unknown = error;
  while (current instanceof Error) {
    parts.push(current.message);
    current = current.cause;
  }
  return parts.join(" | ");
}

async function refusal(run: () => Promise<unknown>): Promise<string> {
  try {
    await run();
  } catch (error) {
    return messageChain(error);
  }
  return "no error";
}

describe("audit_event in the database", () => {
  it("accepts inserts and refuses UPDATE and DELETE, through drizzle and through raw SQL", async () => {
    const { db } = handle;
    await recordAudit(db, { id: "u1", name: "Ada" }, { action: "create", entity: "cell", entityId: "c1", after: { serial: "KP-1" } });
    const [row] = await db.select().from(auditEvent).where(eq(auditEvent.entityId, "c1"));
    expect(row?.actorName).toBe("Ada");
    const id = row?.id ?? -1;

    expect(await refusal(() => db.update(auditEvent).set({ actorName: "Mallory" }).where(eq(auditEvent.id, id)))).toMatch(/append-only: UPDATE refused/);
    expect(await refusal(() => db.delete(auditEvent).where(eq(auditEvent.id, id)))).toMatch(/append-only: DELETE refused/);
    expect(await refusal(() => db.execute(sql`update audit_event set after = null`))).toMatch(/append-only: UPDATE refused/);
    expect(await refusal(() => db.execute(sql`delete from audit_event`))).toMatch(/append-only: DELETE refused/);

    const [after] = await db.select().from(auditEvent).where(eq(auditEvent.id, id));
    expect(after).toEqual(row);
    await recordAudit(db, null, { action: "create", entity: "cell", entityId: "c2" });
    const [{ n } = { n: 0 }] = await db.select({ n: sql<number>`count(*)::int` }).from(auditEvent);
    expect(n).toBe(2);
  });

  it("keeps a refused change inside a transaction from committing the rest of it", async () => {
    const { db } = handle;
    const before = await db.select().from(auditEvent);
    const outcome = await refusal(() =>
      db.transaction(async (tx) => {
        await recordAudit(tx, null, { action: "create", entity: "cell", entityId: "c3" });
        await tx.delete(auditEvent).where(sql`true`);
      }),
    );
    expect(outcome).toMatch(/DELETE refused/);
    expect(await db.select().from(auditEvent)).toEqual(before);
  });
});

/** Source files under lib/ and app/ (what the app runs). */
function sourceFiles(dir: string): string[] {
  const out: string[] = [];
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) out.push(...sourceFiles(full));
    else if (/\.(ts|tsx|js|mjs|sql)$/.test(entry.name)) out.push(full);
  }
  return out;
}

// Drizzle calls (update(auditEvent), delete(auditEvent)) and SQL text ("update audit_event", "delete from audit_event").
const forbidden = [
  /\b(update|delete)\s*\(\s*(schema\.)?auditEvent\b/,
  /\bupdate\s+"?audit_event"?\b/i,
  /\bdelete\s+from\s+"?audit_event"?\b/i,
  /\btruncate\s+(table\s+)?"?audit_event"?\b/i,
];

describe("app source", () => {
  it("never updates, deletes or truncates audit events", () => {
    const root = process.cwd();
    const files = [...sourceFiles(path.join(root, "lib")), ...sourceFiles(path.join(root, "app"))];
    expect(files.length).toBeGreaterThan(20);
    const hits: string[] = [];
    for (const file of files) {
      const text = fs.readFileSync(file, "utf8");
      text.split("\n").forEach((line, i) => {
        if (forbidden.some((pattern) => pattern.test(line))) hits.push(`${path.relative(root, file)}:${i + 1}: ${line.trim()}`);
      });
    }
    expect(hits).toEqual([]);
  });

  it("the patterns catch the calls they are meant to catch", () => {
    const samples = [
      "await tx.update(auditEvent).set({})",
      "db.delete( auditEvent ).where(x)",
      "db.update(schema.auditEvent)",
      'sql`UPDATE "audit_event" SET after = null`',
      "delete from audit_event where id = 1",
      "TRUNCATE TABLE audit_event",
    ];
    for (const sample of samples) expect(forbidden.some((p) => p.test(sample)), sample).toBe(true);
    expect(forbidden.some((p) => p.test("await tx.insert(auditEvent).values(rows)"))).toBe(false);
  });
});
