import "server-only";
import { and, desc, eq, isNull } from "drizzle-orm";
import { AppError } from "@/lib/http/errors";
import { getDb } from "../client";
import { apiToken, user } from "../schema";
import { recordAudit, type AuditActor } from "./audit";

export interface ApiTokenView {
  id: string;
  name: string;
  prefix: string;
  createdAt: Date;
  lastUsedAt: Date | null;
  revokedAt: Date | null;
}

export async function listApiTokens(ownerId: string): Promise<ApiTokenView[]> {
  const db = await getDb();
  return db
    .select({ id: apiToken.id, name: apiToken.name, prefix: apiToken.prefix, createdAt: apiToken.createdAt, lastUsedAt: apiToken.lastUsedAt, revokedAt: apiToken.revokedAt })
    .from(apiToken)
    .where(eq(apiToken.ownerId, ownerId))
    .orderBy(desc(apiToken.createdAt));
}

/** Stores a new token's hash; the token itself is shown to its owner once and never stored. */
export async function insertApiToken(input: { name: string; tokenHash: string; prefix: string }, actor: AuditActor): Promise<{ id: string }> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const [row] = await tx.insert(apiToken).values({ ownerId: actor.id, ...input }).returning({ id: apiToken.id });
    if (!row) throw new Error("insert returned no row");
    await recordAudit(tx, actor, { action: "create", entity: "api token", entityId: row.id, after: { name: input.name, prefix: input.prefix } });
    return row;
  });
}

/** Revokes one of the actor's own tokens; someone else's token id is "not found". */
export async function revokeApiToken(tokenId: string, actor: AuditActor): Promise<{ id: string; revokedAt: Date }> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const [row] = await tx
      .update(apiToken)
      .set({ revokedAt: new Date() })
      .where(and(eq(apiToken.id, tokenId), eq(apiToken.ownerId, actor.id), isNull(apiToken.revokedAt)))
      .returning({ id: apiToken.id, revokedAt: apiToken.revokedAt });
    if (!row?.revokedAt) {
      const [existing] = await tx.select({ revokedAt: apiToken.revokedAt }).from(apiToken).where(and(eq(apiToken.id, tokenId), eq(apiToken.ownerId, actor.id)));
      if (existing?.revokedAt) return { id: tokenId, revokedAt: existing.revokedAt };
      throw new AppError("not-found", "That token does not exist.");
    }
    await recordAudit(tx, actor, { action: "revoke", entity: "api token", entityId: row.id });
    return { id: row.id, revokedAt: row.revokedAt };
  });
}

/** The owner behind a live token hash (null when unknown or revoked); stamps its last use. */
export async function findTokenOwner(tokenHash: string): Promise<{ id: string; name: string; email: string; role: string; banned: boolean | null } | null> {
  const db = await getDb();
  const [row] = await db
    .select({ tokenId: apiToken.id, id: user.id, name: user.name, email: user.email, role: user.role, banned: user.banned })
    .from(apiToken)
    .innerJoin(user, eq(user.id, apiToken.ownerId))
    .where(and(eq(apiToken.tokenHash, tokenHash), isNull(apiToken.revokedAt)));
  if (!row) return null;
  await db.update(apiToken).set({ lastUsedAt: new Date() }).where(eq(apiToken.id, row.tokenId));
  const { tokenId: _tokenId, ...owner } = row;
  return owner;
}
