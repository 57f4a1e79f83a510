/**
 * Following one cell from receipt to retirement: its report's record history holds, oldest first,
 * the cell's registration, its run's upload and analysis, a note, the flag's opening and steps,
 * and the status changes up to "retired"; nothing of another cell. Typing the serial on the
 * audit page finds the same events, the flag's among them, each with a link to its record.
 */
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { addRunNoteAction } from "@/app/(lab)/runs/[runId]/actions";
import { raiseFlagAction, transitionFlagAction } from "@/app/(lab)/flags/actions";
import { withRequestHeaders } from "@/lib/auth/request-headers";
import { listAuditEvents, listCellHistory } from "@/lib/db/queries/audit";
import { createCell, getCellBySerial } from "@/lib/db/queries/registry";
import { stopOutboxSender } from "@/lib/mail/sender";
import { auditListQuery } from "@/lib/validations/audit";
import { capacityCheckOf, storeAnalysedRun } from "../support/analysed-runs";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { signedInUser, type SignedInUser } from "../support/users";

vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn(), updateTag: vi.fn() }));

let engineer: SignedInUser;
let technician: SignedInUser;
let cellId: string;
let runId: string;
let flagId: string;
const as = <T>(who: SignedInUser, fn: () => Promise<T>) => withRequestHeaders(who.headers, fn);

beforeAll(async () => {
  await installTestDatabase();
  const admin = await signedInUser("admin", "Ada Admin");
  engineer = await signedInUser("engineer", "Eli Engineer");
  technician = await signedInUser("technician", "Tess Technician");
  const { batchId } = await cellTypeWithBatch({ id: admin.id, name: "Ada Admin" }, "LOT-LIFE-1");
  for (const serial of ["KP-LIFE-1", "KP-LIFE-2"]) await createCell({ serial, batchId }, { id: admin.id, name: "Ada Admin" });
  ({ runId, cellId } = await storeAnalysedRun({ id: technician.id, name: "Tess Technician" }, { serial: "KP-LIFE-1", csv: capacityCheckOf(2000, 1), purpose: "capacity check" }));
  await storeAnalysedRun({ id: technician.id, name: "Tess Technician" }, { serial: "KP-LIFE-2", csv: capacityCheckOf(2010, 2), purpose: "capacity check" });
  const note = await as(technician, () => addRunNoteAction({ runId, text: "Tab welded again before this run" }));
  expect(note.ok).toBe(true);
  const raised = await as(engineer, () => raiseFlagAction({ cellSerial: "KP-LIFE-1", reason: "Pouch swelled by 0.4 mm" }));
  if (!raised.ok) throw new Error(raised.error);
  flagId = raised.data.id;
  const retired = await as(engineer, () => transitionFlagAction({ flagId, to: "cell retired", expectedState: "open", reason: "Swollen pouch: taken out of service" }));
  expect(retired.ok, JSON.stringify(retired)).toBe(true);
});

afterAll(async () => {
  await stopOutboxSender();
  await removeTestDatabase();
});

describe("a cell's record history", () => {
  it("runs from registration to retirement, oldest first, with nothing of another cell", async () => {
    expect((await getCellBySerial("KP-LIFE-1"))?.status).toBe("retired");
    const { events, truncated } = await listCellHistory(cellId);
    expect(truncated).toBe(false);
    const steps = events.map((e) => `${e.entity}:${e.action}`);
    // Written out by hand: the life this test gave the cell.
    const expected = ["cell:create", "run:upload", "run:analyse", "run:add note", "flag:open", "cell:status", "flag:transition", "cell:status"];
    // Events of one transaction share a time; the order within it is the order they were written.
    expect(steps).toEqual(expected);
    const times = events.map((e) => Date.parse(e.at));
    expect([...times].sort((a, b) => a - b)).toEqual(times);
    expect(events.at(-1)?.after).toMatchObject({ status: "retired" });
    expect(events.find((e) => e.action === "transition")?.after).toMatchObject({ state: "cell retired", reason: "Swollen pouch: taken out of service" });
    expect(events.every((e) => e.entityHref !== null)).toBe(true);
    expect(JSON.stringify(events)).not.toContain("KP-LIFE-2");
  });

  it("is what the audit page finds for the serial, the flag's events labelled and linked", async () => {
    const page = await listAuditEvents(auditListQuery.parse({ q: "KP-LIFE-1", pageSize: 100 }));
    const history = await listCellHistory(cellId);
    expect(new Set(page.items.map((e) => e.id))).toEqual(new Set(history.events.map((e) => e.id)));
    const flagEvent = page.items.find((e) => e.entity === "flag" && e.action === "open");
    expect(flagEvent).toMatchObject({ entityLabel: "Raised by hand, cell KP-LIFE-1", entityHref: `/flags/${flagId}` });
  });
});
