/**
 * The role matrix: every server action and route handler in app/, called as each role and signed
 * out, must allow exactly the roles written here and answer 401/403 to everyone else.
 *
 * The expectations are written out by hand (not derived from lib/auth/roles.ts) so that a change to
 * the capability map shows up here as a failing row. The file list is discovered from disk, so a
 * new action or route without a row fails the "covers everything" test.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import type { Role } from "@/lib/auth/roles";
import { withRequestHeaders } from "@/lib/auth/request-headers";
import { stopAnalysis } from "@/lib/ingest/runner";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { ingestFixtures, uniqueLog, type IngestFixtures } from "../support/ingest-fixtures";
import { signedInUser, type SignedInUser } from "../support/users";

vi.mock("next/cache", () => ({ revalidatePath: vi.fn(), revalidateTag: vi.fn(), updateTag: vi.fn() }));

const all: Role[] = ["technician", "qa-lead", "engineer", "admin"];

type ActionRow = { kind: "action"; allowed: Role[] };
type RouteRow = { kind: "route"; allowed: Role[] | "public"; url: string; params?: Record<string, string>; body?: () => BodyInit };

// Routes about one run or cell need one to exist: made in beforeAll, read through getters.
let ingest: IngestFixtures;
const fixtureRun = {
  get id() {
    return ingest.runId;
  },
};
const fixtureCell = {
  get serial() {
    return ingest.serial;
  },
};
const fixtureBatch = {
  get batchId() {
    return ingest.batchId;
  },
};

/** file (relative to app/) → export name → expectation */
const matrix: Record<string, Record<string, ActionRow | RouteRow>> = {
  "(lab)/batches/actions.ts": {
    createBatchAction: { kind: "action", allowed: ["qa-lead", "engineer", "admin"] },
  },
  "(lab)/batches/[batchId]/actions.ts": {
    importSerialsAction: { kind: "action", allowed: ["technician", "qa-lead", "engineer", "admin"] },
  },
  "(lab)/cell-types/actions.ts": {
    createCellTypeAction: { kind: "action", allowed: ["engineer", "admin"] },
  },
  "(lab)/cells/actions.ts": {
    createCellAction: { kind: "action", allowed: ["technician", "qa-lead", "engineer", "admin"] },
  },
  "(lab)/upload/actions.ts": {
    previewUploadAction: { kind: "action", allowed: ["technician", "engineer", "admin"] },
    analyseRunAction: { kind: "action", allowed: ["technician", "engineer", "admin"] },
    saveColumnMapAction: { kind: "action", allowed: ["technician", "engineer", "admin"] },
  },
  "(lab)/runs/[runId]/actions.ts": {
    reanalyseRunAction: { kind: "action", allowed: ["technician", "engineer", "admin"] },
    addRunNoteAction: { kind: "action", allowed: all },
  },
  "(lab)/settings/actions.ts": {
    createApiTokenAction: { kind: "action", allowed: all },
    revokeApiTokenAction: { kind: "action", allowed: all },
  },
  "(lab)/flags/actions.ts": {
    raiseFlagAction: { kind: "action", allowed: ["engineer"] },
    transitionFlagAction: { kind: "action", allowed: ["engineer"] },
  },
  "(lab)/flags/rules/actions.ts": {
    createRuleAction: { kind: "action", allowed: ["engineer", "admin"] },
    updateRuleAction: { kind: "action", allowed: ["engineer", "admin"] },
    saveLabSettingsAction: { kind: "action", allowed: ["engineer", "admin"] },
  },
  "(lab)/batches/[batchId]/quality/actions.ts": {
    decideLotAction: { kind: "action", allowed: ["qa-lead"] },
  },
  "(admin)/admin/users/actions.ts": {
    createUserAction: { kind: "action", allowed: ["admin"] },
    setUserRoleAction: { kind: "action", allowed: ["admin"] },
  },
  "api/auth/[...all]/route.ts": {
    GET: { kind: "route", allowed: "public", url: "/api/auth/get-session" },
    POST: { kind: "route", allowed: "public", url: "/api/auth/sign-out" },
  },
  "api/audit/route.ts": { GET: { kind: "route", allowed: ["qa-lead", "admin"], url: "/api/audit" } },
  "api/audit/export/route.ts": { GET: { kind: "route", allowed: ["qa-lead", "admin"], url: "/api/audit/export" } },
  "api/flags/route.ts": { GET: { kind: "route", allowed: all, url: "/api/flags?state=all" } },
  "api/batches/route.ts": { GET: { kind: "route", allowed: all, url: "/api/batches" } },
  "api/batches/export/route.ts": { GET: { kind: "route", allowed: all, url: "/api/batches/export" } },
  "api/cells/route.ts": { GET: { kind: "route", allowed: all, url: "/api/cells" } },
  "api/cells/export/route.ts": { GET: { kind: "route", allowed: all, url: "/api/cells/export" } },
  "api/cell-types/route.ts": { GET: { kind: "route", allowed: all, url: "/api/cell-types" } },
  "api/uploadthing/route.ts": {
    // The SDK's browser client reads the route config before signing in matters.
    GET: { kind: "route", allowed: "public", url: "/api/uploadthing" },
    POST: {
      kind: "route",
      allowed: ["technician", "engineer", "admin"],
      url: "/api/uploadthing?actionType=upload&slug=benchLog",
      body: () =>
        JSON.stringify({
          input: { cellSerial: ingest.serial, purpose: "other" },
          files: [{ name: "log.csv", size: 100, type: "text/csv", lastModified: 0 }],
        }),
    },
  },
  "api/v1/runs/route.ts": {
    POST: {
      kind: "route",
      allowed: ["technician", "engineer", "admin"],
      url: "/api/v1/runs",
      body: () => {
        const form = new FormData();
        form.set("cellSerial", ingest.serial);
        form.set("purpose", "other");
        form.set("file", new Blob([uniqueLog()], { type: "text/csv" }), "log.csv");
        return form;
      },
    },
  },
  "api/v1/runs/[id]/route.ts": { GET: { kind: "route", allowed: all, url: "/api/v1/runs/fixture", params: fixtureRun } },
  "api/v1/cells/[serial]/runs/route.ts": { GET: { kind: "route", allowed: all, url: "/api/v1/cells/fixture/runs", params: fixtureCell } },
  "api/runs/[id]/route.ts": { GET: { kind: "route", allowed: all, url: "/api/runs/fixture", params: fixtureRun } },
  "api/runs/[id]/raw/route.ts": { GET: { kind: "route", allowed: all, url: "/api/runs/fixture/raw", params: fixtureRun } },
  "api/runs/[id]/bdf/route.ts": { GET: { kind: "route", allowed: all, url: "/api/runs/fixture/bdf", params: fixtureRun } },
  "api/runs/[id]/notes/route.ts": { GET: { kind: "route", allowed: all, url: "/api/runs/fixture/notes", params: fixtureRun } },
  "api/runs/[id]/discharge-curve/route.ts": { GET: { kind: "route", allowed: all, url: "/api/runs/fixture/discharge-curve", params: fixtureRun } },
  "api/batches/[batchId]/cells/route.ts": { GET: { kind: "route", allowed: all, url: "/api/batches/fixture/cells", params: fixtureBatch } },
  "api/batches/[batchId]/cells/export/route.ts": { GET: { kind: "route", allowed: all, url: "/api/batches/fixture/cells/export", params: fixtureBatch } },
};

const appDir = path.join(process.cwd(), "app");

function discover(): string[] {
  const found: string[] = [];
  const walk = (dir: string) => {
    for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, entry.name);
      if (entry.isDirectory()) walk(full);
      else if (entry.name === "actions.ts" || entry.name === "route.ts") found.push(path.relative(appDir, full).split(path.sep).join("/"));
    }
  };
  walk(appDir);
  return found.sort();
}

async function loadExports(file: string): Promise<Record<string, unknown>> {
  return (await import(/* @vite-ignore */ path.join(appDir, file))) as Record<string, unknown>;
}

const httpMethods = new Set(["GET", "POST", "PUT", "PATCH", "DELETE"]);
function isEndpointExport(file: string, name: string, value: unknown): boolean {
  if (typeof value !== "function") return false;
  return file.endsWith("route.ts") ? httpMethods.has(name) : true;
}

let users: Record<Role, SignedInUser>;

beforeAll(async () => {
  await installTestDatabase();
  users = {
    technician: await signedInUser("technician"),
    "qa-lead": await signedInUser("qa-lead"),
    engineer: await signedInUser("engineer"),
    admin: await signedInUser("admin"),
  };
  ingest = await ingestFixtures({ id: users.admin.id, name: "Admin" });
});
afterAll(removeTestDatabase);
// Registered after the database teardown so it runs before it: the workers stop first.
afterAll(async () => {
  await stopAnalysis();
  await ingest.service.close();
});

describe("role matrix", () => {
  it("has a row for every server action and route handler, and no stale rows", async () => {
    const discovered: string[] = [];
    for (const file of discover()) {
      for (const [name, value] of Object.entries(await loadExports(file))) {
        if (isEndpointExport(file, name, value)) discovered.push(`${file}#${name}`);
      }
    }
    const listed = Object.entries(matrix).flatMap(([file, rows]) => Object.keys(rows).map((name) => `${file}#${name}`));
    expect(discovered.sort()).toEqual(listed.sort());
  });

  for (const [file, rows] of Object.entries(matrix)) {
    for (const [name, row] of Object.entries(rows)) {
      if (row.kind === "action") {
        it(`${file} ${name}: allows ${row.allowed.join(", ") || "nobody"}`, async () => {
          const action = (await loadExports(file))[name] as (input: FormData) => Promise<{ ok: boolean; status?: number }>;
          const signedOut = await withRequestHeaders(new Headers(), () => action(new FormData()));
          expect(signedOut).toMatchObject({ ok: false, status: 401 });
          for (const role of all) {
            // An empty form passes the session and role check only to fail validation (400).
            const result = await withRequestHeaders(users[role].headers, () => action(new FormData()));
            const status = result.ok ? 200 : result.status;
            if (row.allowed.includes(role)) expect([role, status]).not.toEqual([role, 403]);
            else expect([role, status]).toEqual([role, 403]);
            expect(status).not.toBe(401);
          }
        });
      } else {
        it(`${file} ${name}: ${row.allowed === "public" ? "public" : `allows ${row.allowed.join(", ")}`}`, async () => {
          const handler = (await loadExports(file))[name] as (request: Request, context: { params: Promise<Record<string, string>> }) => Promise<Response>;
          const call = (headers: Headers) =>
            handler(new Request(`http://localhost:3000${row.url}`, { method: name, headers, body: row.body?.() }), {
              params: Promise.resolve(row.params ?? {}),
            });
          const signedOut = await call(new Headers({ origin: "http://localhost:3000" }));
          if (row.allowed === "public") {
            expect(signedOut.status).toBeLessThan(500);
            return;
          }
          expect(signedOut.status).toBe(401);
          for (const role of all) {
            const response = await call(users[role].headers);
            const expected = row.allowed.includes(role);
            if (expected) expect(response.status, `${role} should be allowed`).toBeLessThan(400);
            else expect(response.status, `${role} should be refused`).toBe(403);
          }
        });
      }
    }
  }
});
