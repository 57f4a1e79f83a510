import { getAuth } from "@/lib/auth/auth";
import type { Role } from "@/lib/auth/roles";
import { createUserAccount } from "@/lib/db/queries/users";

export const testPassword = "correct-horse-battery";

export interface SignedInUser {
  id: string;
  role: Role;
  email: string;
  /** Request headers carrying the real session cookie from a real sign-in. */
  headers: Headers;
}

/** Creates an account and signs it in through better-auth's own endpoint. */
export async function signedInUser(role: Role, name = `Test ${role}`): Promise<SignedInUser> {
  const email = `${role}-${Math.random().toString(36).slice(2, 8)}@lab.test`;
  const { id } = await createUserAccount({ name, email, password: testPassword, role }, null);
  const auth = await getAuth();
  const response = await auth.handler(
    new Request("http://localhost:3000/api/auth/sign-in/email", {
      method: "POST",
      headers: { "content-type": "application/json", origin: "http://localhost:3000" },
      body: JSON.stringify({ email, password: testPassword }),
    }),
  );
  if (response.status !== 200) throw new Error(`sign-in failed: ${response.status} ${await response.text()}`);
  const cookies = response.headers.getSetCookie().map((c) => c.split(";")[0]).join("; ");
  return { id, role, email, headers: new Headers({ cookie: cookies, origin: "http://localhost:3000" }) };
}
