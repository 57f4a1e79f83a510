import "server-only";
import { and, asc, eq, sql } from "drizzle-orm";
import { columnMapSchema, type ColumnMap } from "@/lib/analysis/types";
import { AppError } from "@/lib/http/errors";
import { getDb } from "../client";
import { savedColumnMap, user } from "../schema";
import { recordAudit, type AuditActor } from "./audit";

export interface SavedColumnMapView {
  id: string;
  name: string;
  ownerId: string;
  ownerName: string;
  map: ColumnMap;
  updatedAt: Date;
}

function parsed(map: unknown): ColumnMap {
  const result = columnMapSchema.safeParse(map);
  if (!result.success) throw new AppError("unprocessable", "That saved column map no longer fits the current format; save it again.");
  return result.data;
}

/** Every saved map in the lab (benches are shared), the user's own first. */
export async function listColumnMaps(forUserId: string): Promise<SavedColumnMapView[]> {
  const db = await getDb();
  const rows = await db
    .select({ id: savedColumnMap.id, name: savedColumnMap.name, ownerId: savedColumnMap.ownerId, ownerName: user.name, map: savedColumnMap.map, updatedAt: savedColumnMap.updatedAt })
    .from(savedColumnMap)
    .innerJoin(user, eq(user.id, savedColumnMap.ownerId))
    .orderBy(sql`${savedColumnMap.ownerId} <> ${forUserId}`, asc(savedColumnMap.name));
  return rows.flatMap((row) => {
    const map = columnMapSchema.safeParse(row.map);
    return map.success ? [{ ...row, map: map.data }] : [];
  });
}

export async function getColumnMap(id: string): Promise<ColumnMap> {
  const db = await getDb();
  const [row] = await db.select({ map: savedColumnMap.map }).from(savedColumnMap).where(eq(savedColumnMap.id, id));
  if (!row) throw new AppError("not-found", "That saved column map does not exist.", { fieldErrors: { columnMapId: ["Choose a saved column map"] } });
  return parsed(row.map);
}

/** Saves under the owner's name for it; saving the same name again replaces that map. */
export async function saveColumnMap(name: string, map: ColumnMap, actor: AuditActor): Promise<{ id: string }> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const [existing] = await tx
      .select({ id: savedColumnMap.id })
      .from(savedColumnMap)
      .where(and(eq(savedColumnMap.ownerId, actor.id), eq(sql`lower(${savedColumnMap.name})`, name.toLowerCase())))
      .for("update");
    const [row] = existing
      ? await tx.update(savedColumnMap).set({ name, map, updatedAt: new Date() }).where(eq(savedColumnMap.id, existing.id)).returning({ id: savedColumnMap.id })
      : await tx.insert(savedColumnMap).values({ ownerId: actor.id, name, map }).returning({ id: savedColumnMap.id });
    if (!row) throw new Error("upsert returned no row");
    await recordAudit(tx, actor, { action: existing ? "update" : "create", entity: "column map", entityId: row.id, after: { name, map } });
    return row;
  });
}
