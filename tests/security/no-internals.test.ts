/**
 * A database failure inside a route handler or server action reaches the client as a bare 500
 * with a fixed message: no SQL, no table or column names, no driver message, no stack. The cause
 * is logged on the server instead.
 */
import { sql } from "drizzle-orm";
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from "vitest";
import { createCellAction } from "@/app/(lab)/cells/actions";
import { GET as listCellsRoute } from "@/app/api/cells/route";
import { GET as cellsExportRoute } from "@/app/api/cells/export/route";
import { withRequestHeaders } from "@/lib/auth/request-headers";
import type { DatabaseHandle } from "@/lib/db/client";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { formData } from "../support/form";
import { cellTypeWithBatch } from "../support/registry-fixtures";
import { signedInUser, type SignedInUser } from "../support/users";

vi.mock("next/cache", () => ({ revalidatePath: vi.fn() }));

const generic = "Something went wrong on the server. The error was logged.";
// Words that would show the query or the driver's error: none may reach the client.
const leaks = [/select/i, /insert/i, /cell_hidden/i, /"cell"/i, /relation/i, /does not exist/i, /failed query/i, /\bat\s+\S+\s*\(/, /\.ts:\d+/, /node_modules/];

let handle: DatabaseHandle;
let tech: SignedInUser;
let batchId: string;

beforeAll(async () => {
  handle = await installTestDatabase();
  tech = await signedInUser("technician");
  ({ batchId } = await cellTypeWithBatch({ id: tech.id, name: "Tess" }, "LOT-ERR"));
  // A real database error: the queries name a table that is no longer there.
  await handle.db.execute(sql`alter table cell rename to cell_hidden`);
});
afterEach(() => vi.restoreAllMocks());
afterAll(async () => {
  await handle.db.execute(sql`alter table cell_hidden rename to cell`);
  await removeTestDatabase();
});

function expectNoLeak(text: string) {
  for (const pattern of leaks) expect(text, `response leaks ${pattern}`).not.toMatch(pattern);
}

describe("a database error", () => {
  it("answers a route handler's request with the generic 500 and logs the cause", async () => {
    const logged = vi.spyOn(console, "error").mockImplementation(() => undefined);
    for (const [route, path] of [
      [listCellsRoute, "/api/cells"],
      [cellsExportRoute, "/api/cells/export"],
    ] as const) {
      const response = await route(new Request(`http://localhost:3000${path}`, { headers: tech.headers }));
      expect(response.status, path).toBe(500);
      const text = await response.text();
      expect(JSON.parse(text)).toEqual({ error: generic, code: "internal" });
      expectNoLeak(text);
    }
    // The server's log keeps what the client was not told.
    const loggedText = logged.mock.calls.map((call) => call.map(String).join(" ")).join("\n");
    expect(loggedText).toMatch(/relation "cell" does not exist|Failed query/);
  });

  it("answers a server action with the generic 500 result", async () => {
    vi.spyOn(console, "error").mockImplementation(() => undefined);
    const result = await withRequestHeaders(tech.headers, () => createCellAction(formData({ serial: "ERR-0001", batchId, cellTypeId: "" })));
    expect(result).toEqual({ ok: false, status: 500, error: generic });
    expectNoLeak(JSON.stringify(result));
  });
});
