import "server-only";
import { asc, count, desc, eq, sql } from "drizzle-orm";
import { getDb } from "../client";
import { batch, cell, cellType, user } from "../schema";

/* Reads for the start page: small, narrow, one block each. */

export interface RecentCell {
  serial: string;
  status: "active" | "flagged" | "retired";
  batchId: string | null;
  lotCode: string | null;
  cellTypeName: string;
  createdAt: Date;
}

/** The cells a person registered most recently (by hand or by import), newest first. */
export async function listRecentCellsBy(userId: string, limit = 8): Promise<RecentCell[]> {
  const db = await getDb();
  return db
    .select({
      serial: cell.serial,
      status: cell.status,
      batchId: cell.batchId,
      lotCode: batch.lotCode,
      cellTypeName: cellType.name,
      createdAt: cell.createdAt,
    })
    .from(cell)
    .innerJoin(cellType, eq(cellType.id, cell.cellTypeId))
    .leftJoin(batch, eq(batch.id, cell.batchId))
    .where(eq(cell.createdBy, userId))
    .orderBy(desc(cell.createdAt), asc(cell.serial))
    .limit(limit);
}

export interface PendingBatch {
  id: string;
  lotCode: string;
  cellTypeName: string;
  receivedOn: string;
  quantity: number;
  registeredCells: number;
}

/** Batches still waiting for a decision, the longest waiting first. */
export async function listPendingBatches(limit = 10): Promise<{ items: PendingBatch[]; total: number }> {
  const db = await getDb();
  const pending = eq(batch.disposition, "pending");
  const [items, total] = await Promise.all([
    db
      .select({
        id: batch.id,
        lotCode: batch.lotCode,
        cellTypeName: cellType.name,
        receivedOn: batch.receivedOn,
        quantity: batch.quantity,
        registeredCells: db.$count(cell, eq(cell.batchId, batch.id)),
      })
      .from(batch)
      .innerJoin(cellType, eq(cellType.id, batch.cellTypeId))
      .where(pending)
      .orderBy(asc(batch.receivedOn), asc(batch.lotCode))
      .limit(limit),
    db.$count(batch, pending),
  ]);
  return { items, total };
}

export interface CellTypeCellCounts {
  id: string;
  name: string;
  chemistry: string;
  ratedCapacityMah: number;
  active: number;
  flagged: number;
  retired: number;
}

const cellsWithStatus = (status: "active" | "flagged" | "retired") =>
  sql<number>`count(${cell.id}) filter (where ${cell.status} = ${status})`.mapWith(Number);

/** Every cell type with how many of its cells are active, flagged and retired. */
export async function listCellTypeCellCounts(): Promise<CellTypeCellCounts[]> {
  const db = await getDb();
  return db
    .select({
      id: cellType.id,
      name: cellType.name,
      chemistry: cellType.chemistry,
      ratedCapacityMah: cellType.ratedCapacityMah,
      active: cellsWithStatus("active"),
      flagged: cellsWithStatus("flagged"),
      retired: cellsWithStatus("retired"),
    })
    .from(cellType)
    .leftJoin(cell, eq(cell.cellTypeId, cellType.id))
    .groupBy(cellType.id)
    .orderBy(asc(cellType.name));
}

/** How many accounts hold each role (roles nobody holds are absent). */
export async function countUsersByRole(): Promise<{ role: string; users: number }[]> {
  const db = await getDb();
  return db.select({ role: user.role, users: count() }).from(user).groupBy(user.role).orderBy(asc(user.role));
}
