import "server-only";
import { asc, eq } from "drizzle-orm";
import { randomUUID } from "node:crypto";
import { hashPassword } from "better-auth/crypto";
import type { Role } from "@/lib/auth/roles";
import { AppError } from "@/lib/http/errors";
import { getDb } from "../client";
import { account, user } from "../schema";
import { recordAudit, type AuditActor } from "./audit";
import { isUniqueViolation } from "./pg-errors";

export interface UserListItem {
  id: string;
  name: string;
  email: string;
  role: string;
  banned: boolean | null;
  createdAt: Date;
}

export async function listUsers(): Promise<UserListItem[]> {
  const db = await getDb();
  return db
    .select({ id: user.id, name: user.name, email: user.email, role: user.role, banned: user.banned, createdAt: user.createdAt })
    .from(user)
    .orderBy(asc(user.name));
}

export async function countUsers(): Promise<number> {
  const db = await getDb();
  return db.$count(user);
}

/**
 * Creates a sign-in account: the user row, its password credential (hashed the way better-auth
 * verifies it) and the audit event, in one transaction.
 */
export async function createUserAccount(
  input: { name: string; email: string; password: string; role: Role },
  actor: AuditActor | null,
): Promise<{ id: string }> {
  const db = await getDb();
  const email = input.email.toLowerCase();
  const passwordHash = await hashPassword(input.password);
  try {
    return await db.transaction(async (tx) => {
      const id = randomUUID();
      await tx.insert(user).values({ id, name: input.name, email, role: input.role, emailVerified: true });
      await tx.insert(account).values({ id: randomUUID(), userId: id, providerId: "credential", accountId: id, password: passwordHash });
      await recordAudit(tx, actor, { action: "create", entity: "user", entityId: id, after: { name: input.name, email, role: input.role } });
      return { id };
    });
  } catch (error) {
    if (isUniqueViolation(error))
      throw new AppError("conflict", "A user with this e-mail exists already.", { fieldErrors: { email: ["This e-mail is taken"] } });
    throw error;
  }
}

export async function setUserRole(userId: string, role: Role, actor: AuditActor): Promise<void> {
  const db = await getDb();
  await db.transaction(async (tx) => {
    const [before] = await tx.select({ role: user.role }).from(user).where(eq(user.id, userId));
    if (!before) throw new AppError("not-found", "That user does not exist.");
    if (userId === actor.id && role !== "admin")
      throw new AppError("bad-request", "You cannot remove your own administrator role; ask another administrator.");
    await tx.update(user).set({ role, updatedAt: new Date() }).where(eq(user.id, userId));
    await recordAudit(tx, actor, { action: "change role", entity: "user", entityId: userId, before, after: { role } });
  });
}
