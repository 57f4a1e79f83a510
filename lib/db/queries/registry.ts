import "server-only";
import { and, asc, count, desc, eq, ilike, inArray, or, sql, type SQL } from "drizzle-orm";
import { AppError } from "@/lib/http/errors";
import type { BatchInput, BatchListQuery, CellInput, CellListQuery, CellTypeInput } from "@/lib/validations/registry";
import { getDb, type Executor } from "../client";
import { batch, cell, cellType } from "../schema";
import { recordAudit, type AuditActor } from "./audit";
import { isUniqueViolation } from "./pg-errors";

export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
}

function escapeLike(text: string): string {
  return text.replace(/[\\%_]/g, (c) => `\\${c}`);
}

/* ---------------------------------- cell types ---------------------------------- */

const cellTypeColumns = {
  id: cellType.id,
  name: cellType.name,
  chemistry: cellType.chemistry,
  nominalVoltageV: cellType.nominalVoltageV,
  chargeVoltageLimitV: cellType.chargeVoltageLimitV,
  dischargeCutoffV: cellType.dischargeCutoffV,
  ratedCapacityMah: cellType.ratedCapacityMah,
  maxChargeC: cellType.maxChargeC,
  maxDischargeC: cellType.maxDischargeC,
  terminationC: cellType.terminationC,
  chargeTempMinC: cellType.chargeTempMinC,
  chargeTempMaxC: cellType.chargeTempMaxC,
  dischargeTempMinC: cellType.dischargeTempMinC,
  dischargeTempMaxC: cellType.dischargeTempMaxC,
  notes: cellType.notes,
};
export type CellTypeView = { [K in keyof typeof cellTypeColumns]: (typeof cellTypeColumns)[K]["_"]["data"] };

export async function listCellTypes(): Promise<CellTypeView[]> {
  const db = await getDb();
  return db.select(cellTypeColumns).from(cellType).orderBy(asc(cellType.name));
}

export async function getCellType(id: string, exec?: Executor): Promise<CellTypeView | null> {
  const db = exec ?? (await getDb());
  const [row] = await db.select(cellTypeColumns).from(cellType).where(eq(cellType.id, id));
  return row ?? null;
}

export async function createCellType(input: CellTypeInput, actor: AuditActor): Promise<{ id: string }> {
  const db = await getDb();
  try {
    return await db.transaction(async (tx) => {
      const [row] = await tx
        .insert(cellType)
        .values({ ...input, createdBy: actor.id })
        .returning(cellTypeColumns);
      if (!row) throw new Error("insert returned no row");
      await recordAudit(tx, actor, { action: "create", entity: "cell type", entityId: row.id, after: row });
      return { id: row.id };
    });
  } catch (error) {
    if (isUniqueViolation(error))
      throw new AppError("conflict", "A cell type with this name exists already.", { fieldErrors: { name: ["This name is taken"] } });
    throw error;
  }
}

/* ---------------------------------- batches ---------------------------------- */

export interface BatchListItem {
  id: string;
  lotCode: string;
  supplier: string;
  receivedOn: string;
  quantity: number;
  disposition: "pending" | "accepted" | "rejected" | "on hold";
  cellTypeId: string;
  cellTypeName: string;
  capacityLslMah: number;
  capacityUslMah: number | null;
  registeredCells: number;
}

const cellCounts = (exec: Executor) =>
  exec.select({ batchId: cell.batchId, n: count().as("n") }).from(cell).groupBy(cell.batchId).as("cell_counts");

/** The columns of a batch row in lists and on its page, with how many of its cells are registered. */
function batchListColumns(counts: ReturnType<typeof cellCounts>) {
  return {
    id: batch.id,
    lotCode: batch.lotCode,
    supplier: batch.supplier,
    receivedOn: batch.receivedOn,
    quantity: batch.quantity,
    disposition: batch.disposition,
    cellTypeId: batch.cellTypeId,
    cellTypeName: cellType.name,
    capacityLslMah: batch.capacityLslMah,
    capacityUslMah: batch.capacityUslMah,
    registeredCells: sql<number>`coalesce(${counts.n}, 0)`.mapWith(Number),
  };
}

export async function listBatches(query: BatchListQuery): Promise<Page<BatchListItem>> {
  const db = await getDb();
  const filters: SQL[] = [];
  if (query.q) {
    const like = `%${escapeLike(query.q)}%`;
    const match = or(ilike(batch.lotCode, like), ilike(batch.supplier, like), ilike(cellType.name, like));
    if (match) filters.push(match);
  }
  if (query.disposition) filters.push(eq(batch.disposition, query.disposition));
  if (query.cellTypeId) filters.push(eq(batch.cellTypeId, query.cellTypeId));
  const where = filters.length ? and(...filters) : undefined;

  const sortColumn = {
    lotCode: batch.lotCode,
    receivedOn: batch.receivedOn,
    supplier: batch.supplier,
    quantity: batch.quantity,
    disposition: batch.disposition,
    cellType: cellType.name,
  }[query.sort];
  const order = query.dir === "asc" ? asc(sortColumn) : desc(sortColumn);
  const counts = cellCounts(db);

  const [items, [totalRow]] = await Promise.all([
    db
      .select(batchListColumns(counts))
      .from(batch)
      .innerJoin(cellType, eq(cellType.id, batch.cellTypeId))
      .leftJoin(counts, eq(counts.batchId, batch.id))
      .where(where)
      .orderBy(order, asc(batch.lotCode))
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize),
    db.select({ n: count() }).from(batch).innerJoin(cellType, eq(cellType.id, batch.cellTypeId)).where(where),
  ]);
  return { items, total: totalRow?.n ?? 0, page: query.page, pageSize: query.pageSize };
}

export async function getBatch(id: string): Promise<BatchListItem | null> {
  const db = await getDb();
  const counts = cellCounts(db);
  const [row] = await db
    .select(batchListColumns(counts))
    .from(batch)
    .innerJoin(cellType, eq(cellType.id, batch.cellTypeId))
    .leftJoin(counts, eq(counts.batchId, batch.id))
    .where(eq(batch.id, id));
  return row ?? null;
}

export async function listBatchOptions(): Promise<{ id: string; lotCode: string; cellTypeId: string }[]> {
  const db = await getDb();
  return db.select({ id: batch.id, lotCode: batch.lotCode, cellTypeId: batch.cellTypeId }).from(batch).orderBy(asc(batch.lotCode));
}

export async function createBatch(input: BatchInput, actor: AuditActor): Promise<{ id: string }> {
  const db = await getDb();
  try {
    return await db.transaction(async (tx) => {
      if (!(await getCellType(input.cellTypeId, tx)))
        throw new AppError("bad-request", "That cell type does not exist.", { fieldErrors: { cellTypeId: ["Choose a cell type"] } });
      const [row] = await tx
        .insert(batch)
        .values({ ...input, capacityUslMah: input.capacityUslMah ?? null, createdBy: actor.id })
        .returning();
      if (!row) throw new Error("insert returned no row");
      await recordAudit(tx, actor, { action: "create", entity: "batch", entityId: row.id, after: row });
      return { id: row.id };
    });
  } catch (error) {
    if (isUniqueViolation(error))
      throw new AppError("conflict", "A batch with this lot code exists already.", { fieldErrors: { lotCode: ["This lot code is taken"] } });
    throw error;
  }
}

/* ---------------------------------- cells ---------------------------------- */

export interface CellListItem {
  id: string;
  serial: string;
  status: "active" | "flagged" | "retired";
  batchId: string | null;
  lotCode: string | null;
  cellTypeId: string;
  cellTypeName: string;
  createdAt: Date;
}

/** The columns of a cell row in lists and on its page (joined with its type and batch). */
const cellListColumns = {
  id: cell.id,
  serial: cell.serial,
  status: cell.status,
  batchId: cell.batchId,
  lotCode: batch.lotCode,
  cellTypeId: cell.cellTypeId,
  cellTypeName: cellType.name,
  createdAt: cell.createdAt,
};

export async function listCells(query: CellListQuery): Promise<Page<CellListItem>> {
  const db = await getDb();
  const filters: SQL[] = [];
  if (query.q) {
    const like = `%${escapeLike(query.q)}%`;
    const match = or(ilike(cell.serial, like), ilike(batch.lotCode, like), ilike(cellType.name, like));
    if (match) filters.push(match);
  }
  if (query.status) filters.push(eq(cell.status, query.status));
  if (query.batchId) filters.push(eq(cell.batchId, query.batchId));
  const where = filters.length ? and(...filters) : undefined;
  const sortColumn = {
    serial: cell.serial,
    status: cell.status,
    lotCode: batch.lotCode,
    cellType: cellType.name,
    createdAt: cell.createdAt,
  }[query.sort];
  const order = query.dir === "asc" ? asc(sortColumn) : desc(sortColumn);

  const [items, [totalRow]] = await Promise.all([
    db
      .select(cellListColumns)
      .from(cell)
      .innerJoin(cellType, eq(cellType.id, cell.cellTypeId))
      .leftJoin(batch, eq(batch.id, cell.batchId))
      .where(where)
      .orderBy(order, asc(cell.serial))
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize),
    db
      .select({ n: count() })
      .from(cell)
      .innerJoin(cellType, eq(cellType.id, cell.cellTypeId))
      .leftJoin(batch, eq(batch.id, cell.batchId))
      .where(where),
  ]);
  return { items, total: totalRow?.n ?? 0, page: query.page, pageSize: query.pageSize };
}

export async function getCellBySerial(serial: string): Promise<CellListItem | null> {
  const db = await getDb();
  const [row] = await db
    .select(cellListColumns)
    .from(cell)
    .innerJoin(cellType, eq(cellType.id, cell.cellTypeId))
    .leftJoin(batch, eq(batch.id, cell.batchId))
    .where(eq(sql`lower(${cell.serial})`, serial.toLowerCase()));
  return row ?? null;
}

/** A cell's type comes from its batch when it has one; a cell without a batch names its type. */
async function resolveCellType(tx: Executor, input: CellInput): Promise<{ batchId: string | null; cellTypeId: string }> {
  if (input.batchId) {
    const [b] = await tx.select({ cellTypeId: batch.cellTypeId }).from(batch).where(eq(batch.id, input.batchId));
    if (!b) throw new AppError("bad-request", "That batch does not exist.", { fieldErrors: { batchId: ["Choose a batch"] } });
    if (input.cellTypeId && input.cellTypeId !== b.cellTypeId)
      throw new AppError("bad-request", "The cell type must match the batch's cell type.", {
        fieldErrors: { cellTypeId: ["A cell takes its batch's cell type"] },
      });
    return { batchId: input.batchId, cellTypeId: b.cellTypeId };
  }
  if (!input.cellTypeId)
    throw new AppError("bad-request", "Choose a batch or a cell type.", { fieldErrors: { batchId: ["Choose a batch or a cell type"] } });
  if (!(await getCellType(input.cellTypeId, tx)))
    throw new AppError("bad-request", "That cell type does not exist.", { fieldErrors: { cellTypeId: ["Choose a cell type"] } });
  return { batchId: null, cellTypeId: input.cellTypeId };
}

/** Registers one cell. Given a transaction, it joins it (as a savepoint), e.g. when an upload registers its cell. */
export async function createCell(input: CellInput, actor: AuditActor, exec?: Executor): Promise<{ id: string; serial: string }> {
  const db = exec ?? (await getDb());
  try {
    return await db.transaction(async (tx) => {
      const resolved = await resolveCellType(tx, input);
      const [row] = await tx
        .insert(cell)
        .values({ serial: input.serial, ...resolved, createdBy: actor.id })
        .returning();
      if (!row) throw new Error("insert returned no row");
      await recordAudit(tx, actor, { action: "create", entity: "cell", entityId: row.id, after: row });
      return { id: row.id, serial: row.serial };
    });
  } catch (error) {
    if (isUniqueViolation(error))
      throw new AppError("conflict", `A cell with serial ${input.serial} is registered already.`, {
        fieldErrors: { serial: ["This serial is registered already"] },
      });
    throw error;
  }
}

export interface SerialImportProblem {
  /** 1-based index in the submitted list (the preview maps it back to the file's line). */
  index: number;
  serial: string;
  message: string;
}

/**
 * Registers a batch's serial list all at once or not at all: a list with a serial that is already
 * registered (in any batch) or repeated inside the list is refused whole, with every problem named.
 */
export async function importSerials(
  batchId: string,
  serials: string[],
  actor: AuditActor,
): Promise<{ created: number } | { problems: SerialImportProblem[] }> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const [b] = await tx.select({ id: batch.id, cellTypeId: batch.cellTypeId }).from(batch).where(eq(batch.id, batchId));
    if (!b) throw new AppError("not-found", "That batch does not exist.");

    const problems: SerialImportProblem[] = [];
    const seen = new Map<string, number>();
    serials.forEach((serial, i) => {
      const key = serial.toLowerCase();
      const first = seen.get(key);
      if (first !== undefined) problems.push({ index: i + 1, serial, message: `Repeats entry ${first} of the list` });
      else seen.set(key, i + 1);
    });
    const lowered = [...seen.keys()];
    for (let start = 0; start < lowered.length; start += 1000) {
      const chunk = lowered.slice(start, start + 1000);
      const existing = await tx
        .select({ serial: cell.serial })
        .from(cell)
        .where(inArray(sql`lower(${cell.serial})`, chunk));
      for (const row of existing) {
        const index = seen.get(row.serial.toLowerCase()) ?? 0;
        problems.push({ index, serial: serials[index - 1] ?? row.serial, message: "Already registered" });
      }
    }
    if (problems.length) return { problems: problems.sort((a, b) => a.index - b.index) };

    for (let start = 0; start < serials.length; start += 500) {
      const rows = await tx
        .insert(cell)
        .values(serials.slice(start, start + 500).map((serial) => ({ serial, batchId, cellTypeId: b.cellTypeId, createdBy: actor.id })))
        .returning({ id: cell.id, serial: cell.serial });
      await recordAudit(tx, actor, ...rows.map((row) => ({ action: "import", entity: "cell", entityId: row.id, after: { serial: row.serial, batchId } })));
    }
    return { created: serials.length };
  });
}
