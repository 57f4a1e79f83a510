import "server-only";
import { and, asc, count, desc, eq, gte, ilike, inArray, isNull, lt, or, sql, type SQL } from "drizzle-orm";
import { flagHref, runHref } from "@/lib/flags/links";
import { kindTitle } from "@/lib/flags/vocabulary";
import { batchHref, cellHref } from "@/lib/registry/links";
import { systemActor, type AuditExportQuery, type AuditListQuery } from "@/lib/validations/audit";
import { getDb, type Executor } from "../client";
import { auditEvent, batch, cell, cellType, flag, run, user } from "../schema";

export interface AuditActor {
  id: string;
  name: string;
}

/**
 * Appends one audit event. Call it with the transaction that makes the change, so the record of a
 * change exists exactly when the change does. Nothing in the app updates or deletes these rows.
 */
export interface AuditEntry {
  action: string;
  entity: string;
  entityId: string;
  before?: unknown;
  after?: unknown;
}

export async function recordAudit(tx: Executor, actor: AuditActor | null, ...events: AuditEntry[]): Promise<void> {
  if (events.length === 0) return;
  await tx.insert(auditEvent).values(
    events.map((event) => ({
      actorId: actor?.id ?? null,
      actorName: actor?.name ?? "system",
      action: event.action,
      entity: event.entity,
      entityId: event.entityId,
      before: event.before ?? null,
      after: event.after ?? null,
    })),
  );
}

/* ---------------------------------- reading the trail ---------------------------------- */

export interface AuditEventView {
  id: number;
  /** ISO instant: the route sends JSON, so the type says what the browser receives. */
  at: string;
  actorId: string | null;
  actorName: string | null;
  action: string;
  entity: string;
  entityId: string;
  /** A name a person recognises (serial, lot code, cell type or user name), when one is known. */
  entityLabel: string | null;
  /** The entity's page, when it has one and still exists. */
  entityHref: string | null;
  before: unknown;
  after: unknown;
}

export interface AuditPage {
  items: AuditEventView[];
  total: number;
  page: number;
  pageSize: number;
}

const uuidPattern = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

function escapeLike(text: string): string {
  return text.replace(/[\\%_]/g, (c) => `\\${c}`);
}

/** The events of the life of the cells `cellWhere` picks: the cells themselves, their runs (uploads, analyses, notes) and their flags. */
function cellLifeFilter(cellWhere: SQL): SQL | undefined {
  const cellIds = sql`select ${cell.id}::text from ${cell} where ${cellWhere}`;
  const runIds = sql`select ${run.id}::text from ${run} inner join ${cell} on ${cell.id} = ${run.cellId} where ${cellWhere}`;
  const flagIds = sql`select ${flag.id}::text from ${flag} inner join ${cell} on ${cell.id} = ${flag.cellId} where ${cellWhere}`;
  return or(
    and(eq(auditEvent.entity, "cell"), sql`${auditEvent.entityId} in (${cellIds})`),
    and(eq(auditEvent.entity, "run"), sql`${auditEvent.entityId} in (${runIds})`),
    and(eq(auditEvent.entity, "flag"), sql`${auditEvent.entityId} in (${flagIds})`),
  );
}

/**
 * Events whose entity is a current cell or batch with a matching serial / lot code, or a run or
 * flag of such a cell, or whose recorded values name one: typing a serial follows that cell's life.
 */
function textFilter(text: string): SQL | undefined {
  const like = `%${escapeLike(text)}%`;
  const batchIds = sql`select ${batch.id}::text from ${batch} where ${batch.lotCode} ilike ${like}`;
  return or(
    ilike(auditEvent.entityId, like),
    cellLifeFilter(ilike(cell.serial, like)),
    and(eq(auditEvent.entity, "batch"), sql`${auditEvent.entityId} in (${batchIds})`),
    sql`${auditEvent.after}->>'serial' ilike ${like}`,
    sql`${auditEvent.after}->>'lotCode' ilike ${like}`,
  );
}

function auditFilters(query: AuditListQuery | AuditExportQuery): SQL | undefined {
  const filters: (SQL | undefined)[] = [];
  if (query.q) filters.push(textFilter(query.q));
  if (query.entity) filters.push(eq(auditEvent.entity, query.entity));
  if (query.action) filters.push(eq(auditEvent.action, query.action));
  if (query.actor) filters.push(query.actor === systemActor ? isNull(auditEvent.actorId) : eq(auditEvent.actorId, query.actor));
  if (query.since) filters.push(gte(auditEvent.at, new Date(query.since)));
  if (query.until) filters.push(lt(auditEvent.at, new Date(query.until)));
  const present = filters.filter((f): f is SQL => f !== undefined);
  return present.length ? and(...present) : undefined;
}

type Labels = Map<string, { label: string; href: string | null }>;

/** Current names and pages for the entities on one page of events: one small query per kind, by primary key. */
async function currentLabels(db: Executor, rows: { entity: string; entityId: string }[]): Promise<Labels> {
  const idsOf = (kind: string) => [...new Set(rows.filter((r) => r.entity === kind).map((r) => r.entityId))];
  const uuidsOf = (kind: string) => idsOf(kind).filter((id) => uuidPattern.test(id));
  const [cells, runs, flags, batches, types, users] = await Promise.all([
    uuidsOf("cell").length ? db.select({ id: cell.id, serial: cell.serial }).from(cell).where(inArray(cell.id, uuidsOf("cell"))) : [],
    uuidsOf("run").length ? db.select({ id: run.id, fileName: run.fileName }).from(run).where(inArray(run.id, uuidsOf("run"))) : [],
    uuidsOf("flag").length
      ? db.select({ id: flag.id, kind: flag.kind, serial: cell.serial }).from(flag).innerJoin(cell, eq(cell.id, flag.cellId)).where(inArray(flag.id, uuidsOf("flag")))
      : [],
    uuidsOf("batch").length ? db.select({ id: batch.id, lotCode: batch.lotCode }).from(batch).where(inArray(batch.id, uuidsOf("batch"))) : [],
    uuidsOf("cell type").length
      ? db.select({ id: cellType.id, name: cellType.name }).from(cellType).where(inArray(cellType.id, uuidsOf("cell type")))
      : [],
    idsOf("user").length ? db.select({ id: user.id, name: user.name }).from(user).where(inArray(user.id, idsOf("user"))) : [],
  ]);
  const labels: Labels = new Map();
  for (const c of cells) labels.set(`cell:${c.id}`, { label: c.serial, href: cellHref(c.serial) });
  for (const b of batches) labels.set(`batch:${b.id}`, { label: b.lotCode, href: batchHref(b.id) });
  for (const r of runs) labels.set(`run:${r.id}`, { label: r.fileName, href: runHref(r.id) });
  for (const f of flags) labels.set(`flag:${f.id}`, { label: `${kindTitle(f.kind)}, cell ${f.serial}`, href: flagHref(f.id) });
  for (const t of types) labels.set(`cell type:${t.id}`, { label: t.name, href: null });
  for (const u of users) labels.set(`user:${u.id}`, { label: u.name, href: null });
  for (const row of rows) {
    if (row.entity === "flag rule") labels.set(`flag rule:${row.entityId}`, { label: "flag rule", href: "/flags/rules" });
    if (row.entity === "lab settings") labels.set(`lab settings:${row.entityId}`, { label: "lab settings", href: "/settings" });
  }
  return labels;
}

/** A name recorded in the event itself, for entities that no longer exist or have no lookup. */
function recordedLabel(before: unknown, after: unknown): string | null {
  for (const value of [after, before]) {
    if (!value || typeof value !== "object") continue;
    for (const key of ["serial", "lotCode", "name", "fileName"]) {
      const found = (value as Record<string, unknown>)[key];
      if (typeof found === "string" && found) return found;
    }
  }
  return null;
}

/** One page of the trail, newest first. */
export async function listAuditEvents(query: AuditListQuery): Promise<AuditPage> {
  const db = await getDb();
  const where = auditFilters(query);
  const [rows, [totalRow]] = await Promise.all([
    db
      .select(eventColumns)
      .from(auditEvent)
      .where(where)
      .orderBy(desc(auditEvent.at), desc(auditEvent.id))
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize),
    db.select({ n: count() }).from(auditEvent).where(where),
  ]);
  return { items: await labelled(db, rows), total: totalRow?.n ?? 0, page: query.page, pageSize: query.pageSize };
}

const eventColumns = {
  id: auditEvent.id,
  at: auditEvent.at,
  actorId: auditEvent.actorId,
  actorName: auditEvent.actorName,
  action: auditEvent.action,
  entity: auditEvent.entity,
  entityId: auditEvent.entityId,
  before: auditEvent.before,
  after: auditEvent.after,
};

type EventRow = Omit<AuditEventView, "at" | "entityLabel" | "entityHref"> & { at: Date };

async function labelled(db: Executor, rows: EventRow[]): Promise<AuditEventView[]> {
  const labels = await currentLabels(db, rows);
  return rows.map((row) => {
    const current = labels.get(`${row.entity}:${row.entityId}`);
    return {
      ...row,
      at: row.at.toISOString(),
      entityLabel: current?.label ?? recordedLabel(row.before, row.after),
      entityHref: current?.href ?? null,
    };
  });
}

/** A cell's record history for its report, oldest first: from its registration to its retirement. */
export const cellHistoryLimit = 2000;

export async function listCellHistory(cellId: string): Promise<{ events: AuditEventView[]; truncated: boolean }> {
  const db = await getDb();
  const rows = await db
    .select(eventColumns)
    .from(auditEvent)
    .where(cellLifeFilter(eq(cell.id, cellId)))
    .orderBy(asc(auditEvent.at), asc(auditEvent.id))
    .limit(cellHistoryLimit + 1);
  return { events: await labelled(db, rows.slice(0, cellHistoryLimit)), truncated: rows.length > cellHistoryLimit };
}

export interface AuditFilterOptions {
  entities: string[];
  actions: string[];
  actors: { id: string; name: string }[];
}

/** The values the filters offer: what the trail actually holds, so no choice leads to an empty page by design. */
export async function auditFilterOptions(): Promise<AuditFilterOptions> {
  const db = await getDb();
  const [entities, actions, actors] = await Promise.all([
    db.selectDistinct({ v: auditEvent.entity }).from(auditEvent).orderBy(asc(auditEvent.entity)),
    db.selectDistinct({ v: auditEvent.action }).from(auditEvent).orderBy(asc(auditEvent.action)),
    db
      .select({ id: auditEvent.actorId, name: sql<string>`max(${auditEvent.actorName})` })
      .from(auditEvent)
      .groupBy(auditEvent.actorId)
      .orderBy(sql`max(${auditEvent.actorName})`),
  ]);
  return {
    entities: entities.map((e) => e.v),
    actions: actions.map((a) => a.v),
    actors: actors.map((a) => (a.id === null ? { id: systemActor, name: "The app itself (system)" } : { id: a.id, name: a.name ?? a.id })),
  };
}

/**
 * Every event the audit page's filters select, oldest first, for a CSV export: one query, so
 * events added meanwhile cannot shift or repeat rows. Answers null when there are more than `limit`.
 */
export async function auditEventsForExport(query: AuditExportQuery, limit: number): Promise<AuditEventView[] | null> {
  const db = await getDb();
  const rows = await db
    .select(eventColumns)
    .from(auditEvent)
    .where(auditFilters(query))
    .orderBy(asc(auditEvent.at), asc(auditEvent.id))
    .limit(limit + 1);
  if (rows.length > limit) return null;
  return labelled(db, rows);
}
