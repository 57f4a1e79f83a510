/**
 * Run notes are append-only: an amendment is a new row that points at the note it corrects, the
 * original stays exactly as written, and the database itself refuses to change or delete a note.
 */
import { eq, sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { addRunNoteAction } from "@/app/(lab)/runs/[runId]/actions";
import { withRequestHeaders } from "@/lib/auth/request-headers";
import type { DatabaseHandle } from "@/lib/db/client";
import { listRunNotes } from "@/lib/db/queries/notebook";
import { createCell } from "@/lib/db/queries/registry";
import { recordRun } from "@/lib/db/queries/runs";
import { runNote } from "@/lib/db/schema";
import { maxNoteLength } from "@/lib/validations/notebook";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { auditOf, formData } from "../support/form";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { signedInUser, type SignedInUser } from "../support/users";

vi.mock("next/cache", () => ({ revalidatePath: vi.fn() }));

let handle: DatabaseHandle;
let tech: SignedInUser;
let qa: SignedInUser;
let runId: string;
let otherRunId: string;

async function queuedRun(serial: string, sha: string): Promise<string> {
  const { runId } = await recordRun(
    { cellSerial: serial, mayCreateCell: false, source: "api", purpose: "capacity check", ambientTempC: null, operatorNote: "", fileKey: `test/${sha}`, fileName: `${serial}.csv`, fileSize: 10, sha256: sha.padEnd(64, "0"), columnMap: null },
    { id: tech.id, name: "Tech" },
  );
  return runId;
}

beforeAll(async () => {
  handle = await installTestDatabase();
  tech = await signedInUser("technician", "Tess Bench");
  qa = await signedInUser("qa-lead", "Quinn Review");
  const { batchId } = await cellTypeWithBatch({ id: tech.id, name: "Tech" }, "LOT-NOTES");
  await createCell({ serial: "N-0001", batchId }, { id: tech.id, name: "Tech" });
  runId = await queuedRun("N-0001", "a1");
  otherRunId = await queuedRun("N-0001", "b2");
});
afterAll(removeTestDatabase);

const as = <T>(user: SignedInUser, fn: () => Promise<T>) => withRequestHeaders(user.headers, fn);

describe("addRunNoteAction", () => {
  it("appends a note with its author and time, and an audit event in the same transaction", async () => {
    const result = await as(tech, () => addRunNoteAction(formData({ runId, text: "  Bench 3, cell in the blue fixture.  ", amends: "" })));
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.data).toMatchObject({ authorName: "Tess Bench", text: "Bench 3, cell in the blue fixture.", amends: null });
    expect(await listRunNotes(runId)).toEqual([result.data]);
    expect(await auditOf("run", runId)).toContainEqual({ action: "add note", actorId: tech.id, before: null, after: { noteId: result.data.id, amends: null, text: "Bench 3, cell in the blue fixture." } });
  });

  it("amends by adding a new row: the original stays unchanged and both are listed", async () => {
    const [original] = await listRunNotes(runId);
    if (!original) throw new Error("no note to amend");
    const [rowBefore] = await handle.db.select().from(runNote).where(eq(runNote.id, original.id));
    const result = await as(qa, () => addRunNoteAction({ runId, text: "Correction: bench 4, not bench 3.", amends: String(original.id) }));
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.data.id).not.toBe(original.id);
    expect(result.data).toMatchObject({ amends: original.id, authorName: "Quinn Review" });
    const [rowAfter] = await handle.db.select().from(runNote).where(eq(runNote.id, original.id));
    expect(rowAfter).toEqual(rowBefore);
    expect((await listRunNotes(runId)).map((n) => [n.id, n.amends])).toEqual([
      [original.id, null],
      [result.data.id, original.id],
    ]);
    expect((await auditOf("run", runId)).map((e) => e.action)).toEqual(["upload", "add note", "amend note"]);
  });

  it("refuses to amend a note of another run, and a note that does not exist, with 400 on amends", async () => {
    const [original] = await listRunNotes(runId);
    for (const amends of [String(original?.id), "999999"]) {
      const result = await as(tech, () => addRunNoteAction(formData({ runId: otherRunId, text: "Wrong place.", amends })));
      expect(result).toMatchObject({ ok: false, status: 400, fieldErrors: { amends: ["Choose a note of this run"] } });
    }
    expect(await listRunNotes(otherRunId)).toEqual([]);
  });

  it("refuses an empty note, one over the length limit, and a run that does not exist", async () => {
    expect(await as(tech, () => addRunNoteAction(formData({ runId, text: "   " })))).toMatchObject({ ok: false, status: 400, fieldErrors: { text: ["Note is required"] } });
    const long = await as(tech, () => addRunNoteAction(formData({ runId, text: "x".repeat(maxNoteLength + 1) })));
    expect(long).toMatchObject({ ok: false, status: 400, fieldErrors: { text: [`Note must be at most ${maxNoteLength} characters`] } });
    expect(await as(tech, () => addRunNoteAction(formData({ runId, text: "x".repeat(maxNoteLength) })))).toMatchObject({ ok: true });
    expect(await as(tech, () => addRunNoteAction(formData({ runId: "00000000-0000-4000-8000-000000000000", text: "Nobody's run." })))).toMatchObject({ ok: false, status: 404 });
    expect(await as(tech, () => addRunNoteAction(formData({ runId, text: "Amends nothing.", amends: "first" })))).toMatchObject({ ok: false, status: 400 });
  });

  it("is refused by the database when anything updates or deletes a note", async () => {
    const refusal = async (statement: () => Promise<unknown>) => {
      try {
        await statement();
      } catch (error) {
        const chain: string[] = [];
        for (let e: unknown = error; e instanceof Error; e = e.cause) chain.push(e.message);
        return chain.join(" | ");
      }
      return "no error";
    };
    const before = await listRunNotes(runId);
    expect(await refusal(() => handle.db.update(runNote).set({ text: "rewritten" }).where(eq(runNote.runId, runId)))).toMatch(/append-only: UPDATE refused/);
    expect(await refusal(() => handle.db.delete(runNote).where(eq(runNote.runId, runId)))).toMatch(/append-only: DELETE refused/);
    expect(await refusal(() => handle.db.execute(sql`delete from run_note`))).toMatch(/append-only: DELETE refused/);
    expect(await listRunNotes(runId)).toEqual(before);
  });
});
