import "server-only";
import { and, asc, count, desc, eq, isNotNull, lt, ne, sql } from "drizzle-orm";
import { getDb } from "../client";
import { analysisVersion, batch, cell, cellType, run, user } from "../schema";

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

export interface RecentUpload {
  runId: string;
  fileName: string;
  serial: string;
  purpose: string;
  status: "queued" | "analysing" | "complete" | "failed";
  createdAt: Date;
  dischargedMah: number | null;
  safetyFindings: number | null;
}

/** A technician's latest uploads with their analysis state and, once complete, the delivered capacity. */
export async function listRecentUploadsBy(userId: string, limit = 10): Promise<RecentUpload[]> {
  const db = await getDb();
  return db
    .select({
      runId: run.id,
      fileName: run.fileName,
      serial: cell.serial,
      purpose: run.purpose,
      status: run.status,
      createdAt: run.createdAt,
      dischargedMah: analysisVersion.dischargedMah,
      safetyFindings: analysisVersion.safetyFindingsCount,
    })
    .from(run)
    .innerJoin(cell, eq(cell.id, run.cellId))
    .leftJoin(analysisVersion, and(eq(analysisVersion.runId, run.id), eq(analysisVersion.version, run.latestVersion)))
    .where(eq(run.uploadedBy, userId))
    .orderBy(desc(run.createdAt))
    .limit(limit);
}

export interface CellNearingEndOfLife {
  serial: string;
  lotCode: string | null;
  cellTypeName: string;
  ratedCapacityMah: number;
  latestMah: number;
  soh: number;
  measuredAt: Date;
}

/**
 * Cells whose latest complete run delivered less than `margin` above the end-of-life share of
 * rated capacity (e.g. below 85 % when end of life is 80 %), lowest first. The latest run's whole
 * delivered capacity is used here; the cell's health page has the per-cycle view.
 */
export async function listCellsNearingEndOfLife(eolShare: number, margin = 0.05, limit = 10): Promise<CellNearingEndOfLife[]> {
  const db = await getDb();
  const latest = db
    .selectDistinctOn([run.cellId], {
      cellId: run.cellId,
      dischargedMah: analysisVersion.dischargedMah,
      finishedAt: run.finishedAt,
    })
    .from(run)
    .innerJoin(analysisVersion, and(eq(analysisVersion.runId, run.id), eq(analysisVersion.version, run.latestVersion)))
    .where(and(eq(run.status, "complete"), isNotNull(analysisVersion.dischargedMah)))
    .orderBy(run.cellId, desc(run.finishedAt))
    .as("latest");
  const rows = await db
    .select({
      serial: cell.serial,
      lotCode: batch.lotCode,
      cellTypeName: cellType.name,
      ratedCapacityMah: cellType.ratedCapacityMah,
      latestMah: sql<number>`${latest.dischargedMah}`.mapWith(Number),
      measuredAt: latest.finishedAt,
    })
    .from(latest)
    .innerJoin(cell, eq(cell.id, latest.cellId))
    .innerJoin(cellType, eq(cellType.id, cell.cellTypeId))
    .leftJoin(batch, eq(batch.id, cell.batchId))
    .where(and(ne(cell.status, "retired"), lt(latest.dischargedMah, sql`${cellType.ratedCapacityMah} * ${eolShare + margin}`)))
    .orderBy(sql`${latest.dischargedMah} / ${cellType.ratedCapacityMah}`)
    .limit(limit);
  return rows.map((r) => ({ ...r, soh: r.latestMah / r.ratedCapacityMah, measuredAt: r.measuredAt ?? new Date(0) }));
}
