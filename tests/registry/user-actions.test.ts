import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { createUserAction, setUserRoleAction } from "@/app/(admin)/admin/users/actions";
import { getAuth } from "@/lib/auth/auth";
import { withRequestHeaders } from "@/lib/auth/request-headers";
import { sessionFromHeaders } from "@/lib/auth/session";
import { listUsers } from "@/lib/db/queries/users";
import { installTestDatabase, removeTestDatabase } from "../support/db";
import { auditOf, formData } from "../support/form";
import { signedInUser, type SignedInUser } from "../support/users";

vi.mock("next/cache", () => ({ revalidatePath: vi.fn() }));

let admin: SignedInUser;

beforeAll(async () => {
  await installTestDatabase();
  admin = await signedInUser("admin", "Ada Admin");
});
afterAll(removeTestDatabase);

const asAdmin = <T>(fn: () => Promise<T>) => withRequestHeaders(admin.headers, fn);

async function signInStatus(email: string, password: string): Promise<number> {
  const auth = await getAuth();
  const response = await auth.handler(
    new Request("http://localhost:3000/api/auth/sign-in/email", {
      method: "POST",
      headers: { "content-type": "application/json", origin: "http://localhost:3000" },
      body: JSON.stringify({ email, password }),
    }),
  );
  return response.status;
}

const newcomer = { name: "Nia Newcomer", email: "Nia.Newcomer@lab.test", password: "ten-chars-ok", role: "qa-lead" };

describe("createUserAction", () => {
  it("refuses a short password, a malformed e-mail, an unknown role and a blank name with 400", async () => {
    const result = await asAdmin(() => createUserAction(formData({ name: " ", email: "nia@", password: "123456789", role: "owner" })));
    expect(result).toMatchObject({ ok: false, status: 400 });
    if (!result.ok) expect(Object.keys(result.fieldErrors ?? {}).sort()).toEqual(["email", "name", "password", "role"]);
    expect(await listUsers()).toHaveLength(1);
  });

  it("creates an account that can sign in with its initial password, and audits it without the password", async () => {
    const result = await asAdmin(() => createUserAction(formData(newcomer)));
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const stored = (await listUsers()).find((u) => u.id === result.data.id);
    expect(stored).toMatchObject({ name: "Nia Newcomer", email: "nia.newcomer@lab.test", role: "qa-lead" });
    expect(await signInStatus("nia.newcomer@lab.test", newcomer.password)).toBe(200);
    expect(await signInStatus("nia.newcomer@lab.test", "wrong-password")).toBe(401);
    const trail = await auditOf("user", result.data.id);
    expect(trail).toMatchObject([{ action: "create", actorId: admin.id, after: { email: "nia.newcomer@lab.test", role: "qa-lead" } }]);
    expect(JSON.stringify(trail)).not.toContain(newcomer.password);
  });

  it("refuses a second account with the same e-mail in other letter case with 409 on the e-mail field", async () => {
    const result = await asAdmin(() => createUserAction(formData({ ...newcomer, email: "NIA.NEWCOMER@lab.test" })));
    expect(result).toMatchObject({ ok: false, status: 409, fieldErrors: { email: ["This e-mail is taken"] } });
  });
});

describe("setUserRoleAction", () => {
  it("refuses an unknown role and a missing user with 400", async () => {
    const result = await asAdmin(() => setUserRoleAction(formData({ userId: "", role: "superuser" })));
    expect(result).toMatchObject({ ok: false, status: 400 });
    if (!result.ok) expect(Object.keys(result.fieldErrors ?? {}).sort()).toEqual(["role", "userId"]);
  });

  it("answers 404 for a user that does not exist", async () => {
    expect(await asAdmin(() => setUserRoleAction(formData({ userId: "no-such-user", role: "engineer" })))).toMatchObject({ ok: false, status: 404 });
  });

  it("changes a role, which the user's next request sees, and audits before and after", async () => {
    const tech = await signedInUser("technician");
    const result = await asAdmin(() => setUserRoleAction(formData({ userId: tech.id, role: "engineer" })));
    expect(result).toEqual({ ok: true, data: { userId: tech.id, role: "engineer" } });
    expect(await sessionFromHeaders(tech.headers)).toMatchObject({ id: tech.id, role: "engineer" });
    expect(await auditOf("user", tech.id)).toMatchObject([
      { action: "create" },
      { action: "change role", actorId: admin.id, before: { role: "technician" }, after: { role: "engineer" } },
    ]);
  });

  it("does not let an administrator take away their own administrator role", async () => {
    const result = await asAdmin(() => setUserRoleAction(formData({ userId: admin.id, role: "technician" })));
    expect(result).toMatchObject({ ok: false, status: 400 });
    expect(await sessionFromHeaders(admin.headers)).toMatchObject({ role: "admin" });
  });
});
