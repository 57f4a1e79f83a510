import "server-only";
import { and, asc, count, desc, eq, ilike, inArray, ne, sql, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import { AppError } from "@/lib/http/errors";
import {
  byHandKind,
  canStep,
  describeRule,
  flagRuleKinds,
  isClosed,
  stepNeedsSignature,
  unclosedFlagStates,
  type FlagRuleKind,
  type FlagState,
} from "@/lib/flags/vocabulary";
import { flagAlert } from "@/lib/mail/flag-alert";
import type { CreateRuleInput, FlagListQuery, LabSettingsInput, RaiseFlagInput, TransitionFlagInput, UpdateRuleInput } from "@/lib/validations/flags";
import { getDb, type Executor, type Transaction } from "../client";
import { analysisVersion, batch, cell, flag, flagRule, flagTransition, labSettings, run, user } from "../schema";
import { recordAudit, type AuditActor } from "./audit";
import { activeEngineers, enqueueMessages } from "./outbox";
import type { Page } from "./registry";
import { signatureAudit, signatureOf, signatureValues, type Signature, type SignatureView } from "./signatures";

/** The name the history shows when the app itself took a step (a rule opened the flag). */
export const ruleActorName = "Kneepoint (rule)";

function escapeLike(text: string): string {
  return text.replace(/[\\%_]/g, (c) => `\\${c}`);
}

/* ---------------------------------- settings ---------------------------------- */

export interface LabSettings {
  eolThresholdPct: number;
  digestEnabled: boolean;
  digestHour: number;
  lastDigestOn: string | null;
  updatedAt: Date | null;
  updatedByName: string | null;
}

/** What applies until someone saves the settings: end of life at 80 % of rated (Diao et al. 2019), no digest. */
export const defaultLabSettings: LabSettings = {
  eolThresholdPct: 80,
  digestEnabled: false,
  digestHour: 7,
  lastDigestOn: null,
  updatedAt: null,
  updatedByName: null,
};

export async function getLabSettings(exec?: Executor): Promise<LabSettings> {
  const db = exec ?? (await getDb());
  const [row] = await db
    .select({
      eolThresholdPct: labSettings.eolThresholdPct,
      digestEnabled: labSettings.digestEnabled,
      digestHour: labSettings.digestHour,
      lastDigestOn: labSettings.lastDigestOn,
      updatedAt: labSettings.updatedAt,
      updatedByName: user.name,
    })
    .from(labSettings)
    .leftJoin(user, eq(user.id, labSettings.updatedBy))
    .where(eq(labSettings.id, 1));
  return row ?? defaultLabSettings;
}

export async function saveLabSettings(input: LabSettingsInput, actor: AuditActor): Promise<LabSettings> {
  const db = await getDb();
  await db.transaction(async (tx) => {
    const before = await getLabSettings(tx);
    const values = { ...input, updatedBy: actor.id, updatedAt: new Date() };
    await tx
      .insert(labSettings)
      .values({ id: 1, ...values })
      .onConflictDoUpdate({ target: labSettings.id, set: values });
    await recordAudit(tx, actor, {
      action: "update",
      entity: "lab settings",
      entityId: "1",
      before: { eolThresholdPct: before.eolThresholdPct, digestEnabled: before.digestEnabled, digestHour: before.digestHour },
      after: input,
    });
  });
  return getLabSettings();
}

/**
 * Claims today's digest: true for exactly one caller per server-clock day, even with several
 * senders, because the date moves in one conditional update.
 */
export async function claimDigestDay(tx: Transaction, today: string): Promise<boolean> {
  const claimed = await tx
    .update(labSettings)
    .set({ lastDigestOn: today })
    .where(and(eq(labSettings.id, 1), eq(labSettings.digestEnabled, true), sql`${labSettings.lastDigestOn} is distinct from ${today}`))
    .returning({ id: labSettings.id });
  return claimed.length === 1;
}

/* ---------------------------------- rules ---------------------------------- */

export interface FlagRuleView {
  id: string;
  kind: FlagRuleKind;
  bound: number | null;
  enabled: boolean;
  note: string;
  description: string;
  updatedAt: Date;
  updatedByName: string | null;
  unclosedFlags: number;
}

export async function listRules(): Promise<FlagRuleView[]> {
  const db = await getDb();
  const settings = await getLabSettings(db);
  const unclosed = db
    .select({ ruleId: flag.ruleId, n: count().as("n") })
    .from(flag)
    .where(inArray(flag.state, [...unclosedFlagStates]))
    .groupBy(flag.ruleId)
    .as("unclosed");
  const rows = await db
    .select({
      id: flagRule.id,
      kind: flagRule.kind,
      bound: flagRule.bound,
      enabled: flagRule.enabled,
      note: flagRule.note,
      updatedAt: flagRule.updatedAt,
      updatedByName: user.name,
      unclosedFlags: sql<number>`coalesce(${unclosed.n}, 0)`.mapWith(Number),
    })
    .from(flagRule)
    .leftJoin(user, eq(user.id, flagRule.updatedBy))
    .leftJoin(unclosed, eq(unclosed.ruleId, flagRule.id))
    .orderBy(asc(flagRule.createdAt));
  // The vocabulary's order, which reads from the cell's own health to its batch and safety.
  const rank = (kind: FlagRuleKind) => flagRuleKinds.indexOf(kind);
  return rows
    .sort((a, b) => rank(a.kind) - rank(b.kind))
    .map((r) => ({ ...r, description: describeRule(r.kind, r.bound, settings.eolThresholdPct) }));
}

export interface EnabledRule {
  id: string;
  kind: FlagRuleKind;
  bound: number | null;
}

export async function enabledRules(ruleIds?: readonly string[], exec?: Executor): Promise<EnabledRule[]> {
  const db = exec ?? (await getDb());
  const filters: SQL[] = [eq(flagRule.enabled, true)];
  if (ruleIds) filters.push(inArray(flagRule.id, [...ruleIds]));
  return db
    .select({ id: flagRule.id, kind: flagRule.kind, bound: flagRule.bound })
    .from(flagRule)
    .where(and(...filters))
    .orderBy(asc(flagRule.createdAt));
}

export async function createRule(input: CreateRuleInput, actor: AuditActor): Promise<{ id: string }> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(flagRule)
      .values({ kind: input.kind, bound: input.bound ?? null, enabled: input.enabled, note: input.note, createdBy: actor.id, updatedBy: actor.id })
      .returning({ id: flagRule.id, kind: flagRule.kind, bound: flagRule.bound, enabled: flagRule.enabled, note: flagRule.note });
    if (!row) throw new Error("insert returned no row");
    await recordAudit(tx, actor, { action: "create", entity: "flag rule", entityId: row.id, after: row });
    return { id: row.id };
  });
}

export async function updateRule(input: UpdateRuleInput, actor: AuditActor): Promise<{ id: string }> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const [before] = await tx
      .select({ kind: flagRule.kind, bound: flagRule.bound, enabled: flagRule.enabled, note: flagRule.note })
      .from(flagRule)
      .where(eq(flagRule.id, input.ruleId))
      .for("update");
    if (!before) throw new AppError("not-found", "That rule does not exist.");
    // A rule's kind is what its flags mean; changing it would rewrite their history.
    if (before.kind !== input.kind) throw new AppError("bad-request", "A rule's kind cannot change; add a new rule instead.", { fieldErrors: { kind: ["A rule keeps its kind"] } });
    const after = { kind: before.kind, bound: input.bound ?? null, enabled: input.enabled, note: input.note };
    await tx
      .update(flagRule)
      .set({ bound: after.bound, enabled: after.enabled, note: after.note, updatedBy: actor.id, updatedAt: new Date() })
      .where(eq(flagRule.id, input.ruleId));
    await recordAudit(tx, actor, { action: "update", entity: "flag rule", entityId: input.ruleId, before, after });
    return { id: input.ruleId };
  });
}

/* ---------------------------------- cell status ---------------------------------- */

/**
 * A cell is "flagged" while it has an unclosed flag and "active" otherwise; "retired" is final.
 * Called in the transaction that changes a flag.
 */
async function syncCellStatus(tx: Transaction, cellId: string, actor: AuditActor | null): Promise<void> {
  const [current] = await tx.select({ status: cell.status }).from(cell).where(eq(cell.id, cellId)).for("update");
  if (!current || current.status === "retired") return;
  const [open] = await tx
    .select({ n: count() })
    .from(flag)
    .where(and(eq(flag.cellId, cellId), inArray(flag.state, [...unclosedFlagStates])));
  const status = (open?.n ?? 0) > 0 ? "flagged" : "active";
  if (status === current.status) return;
  await tx.update(cell).set({ status, updatedAt: new Date() }).where(eq(cell.id, cellId));
  await recordAudit(tx, actor, { action: "status", entity: "cell", entityId: cellId, before: { status: current.status }, after: { status } });
}

/* ---------------------------------- opening flags ---------------------------------- */

export interface NewFlag {
  cellId: string;
  ruleId: string | null;
  kind: string;
  summary: string;
  value: number | null;
  bound: number | null;
  unit: string | null;
  evidenceAnalysisId: string | null;
  detail: Record<string, unknown> | null;
  /** Why it opened, for the history: the rule in words, or the engineer's reason. */
  reason: string;
}

export interface AlertContext {
  baseUrl: string;
  ruleLine: string | null;
  cautions: string[];
}

/**
 * Opens a flag with its first history step, marks the cell flagged and queues an alert to every
 * active engineer, all in the caller's transaction. Returns null when the rule has flagged this
 * cell on this evidence before, or the cell has an unclosed flag of the rule already.
 */
export async function openFlag(tx: Transaction, input: NewFlag, actor: AuditActor | null, alert: AlertContext): Promise<{ id: string } | null> {
  const [row] = await tx
    .insert(flag)
    .values({
      cellId: input.cellId,
      ruleId: input.ruleId,
      kind: input.kind,
      state: "open",
      summary: input.summary,
      value: input.value,
      bound: input.bound,
      unit: input.unit,
      evidenceAnalysisId: input.evidenceAnalysisId,
      detail: input.detail,
      raisedBy: actor?.id ?? null,
    })
    .onConflictDoNothing()
    .returning({ id: flag.id });
  if (!row) return null;
  await tx.insert(flagTransition).values({
    flagId: row.id,
    fromState: null,
    toState: "open",
    reason: input.reason,
    actorId: actor?.id ?? null,
    actorName: actor?.name ?? ruleActorName,
  });
  await recordAudit(tx, actor, {
    action: "open",
    entity: "flag",
    entityId: row.id,
    after: { cellId: input.cellId, kind: input.kind, summary: input.summary, evidenceAnalysisId: input.evidenceAnalysisId, reason: input.reason },
  });
  await syncCellStatus(tx, input.cellId, actor);
  const [target] = await tx
    .select({ serial: cell.serial, lotCode: batch.lotCode })
    .from(cell)
    .leftJoin(batch, eq(batch.id, cell.batchId))
    .where(eq(cell.id, input.cellId));
  const engineers = await activeEngineers(tx);
  const mail = flagAlert(
    {
      id: row.id,
      kind: input.kind,
      summary: input.summary,
      value: input.value,
      bound: input.bound,
      unit: input.unit,
      serial: target?.serial ?? "?",
      lotCode: target?.lotCode ?? null,
      ruleLine: alert.ruleLine,
      raisedByName: actor?.name ?? null,
      reason: input.ruleId ? null : input.reason,
      cautions: alert.cautions,
    },
    alert.baseUrl,
  );
  await enqueueMessages(
    tx,
    engineers.map((e) => ({ kind: "flag opened", toAddress: e.email, subject: mail.subject, textBody: mail.text, flagId: row.id })),
  );
  return row;
}

/** A rule's flag in a transaction of its own: the flag, its first step, the cell's status, the audit event and the alert mail. */
export async function openRuleFlag(input: NewFlag, alert: AlertContext): Promise<{ id: string } | null> {
  const db = await getDb();
  return db.transaction((tx) => openFlag(tx, input, null, alert));
}

async function findCell(tx: Executor, serial: string): Promise<{ id: string; serial: string; status: string } | null> {
  const [row] = await tx
    .select({ id: cell.id, serial: cell.serial, status: cell.status })
    .from(cell)
    .where(eq(sql`lower(${cell.serial})`, serial.toLowerCase()));
  return row ?? null;
}

/** An engineer's flag with a reason, on any cell that is not retired. */
export async function raiseFlagByHand(input: RaiseFlagInput, actor: AuditActor, baseUrl: string): Promise<{ id: string; serial: string }> {
  const db = await getDb();
  return db.transaction(async (tx) => {
    const target = await findCell(tx, input.cellSerial);
    if (!target) throw new AppError("not-found", `No cell ${input.cellSerial} is registered.`, { fieldErrors: { cellSerial: ["No such cell"] } });
    if (target.status === "retired") throw new AppError("conflict", `Cell ${target.serial} is retired; a retired cell is not flagged.`);
    const opened = await openFlag(
      tx,
      { cellId: target.id, ruleId: null, kind: byHandKind, summary: input.reason, value: null, bound: null, unit: null, evidenceAnalysisId: null, detail: null, reason: input.reason },
      actor,
      { baseUrl, ruleLine: null, cautions: [] },
    );
    if (!opened) throw new Error("a flag raised by hand cannot conflict");
    return { id: opened.id, serial: target.serial };
  });
}

/* ---------------------------------- transitions ---------------------------------- */

/**
 * One step of a flag. Clearing needs the stepper's signature, checked before this is called
 * (lib/auth/e-signature.ts) and written in the step's transaction; other steps take none.
 */
export async function transitionFlag(
  input: TransitionFlagInput,
  actor: AuditActor,
  signature?: Signature,
): Promise<{ id: string; state: FlagState; closedAlso: number; signature: SignatureView | null }> {
  if (stepNeedsSignature(input.to) && !signature)
    throw new AppError("bad-request", `A flag becomes ${input.to} only with your signature.`, { fieldErrors: { password: ["Enter your password to sign"] } });
  const signed = stepNeedsSignature(input.to) ? signature : undefined;
  const db = await getDb();
  return db.transaction(async (tx) => {
    const [current] = await tx.select({ state: flag.state, cellId: flag.cellId }).from(flag).where(eq(flag.id, input.flagId)).for("update");
    if (!current) throw new AppError("not-found", "That flag does not exist.");
    if (current.state !== input.expectedState)
      throw new AppError("conflict", `The flag is ${current.state} now (someone moved it meanwhile); look at its history and try again.`);
    if (!canStep(current.state, input.to))
      throw new AppError("conflict", isClosed(current.state) ? `The flag is ${current.state}; a closed flag takes no further steps.` : `A flag that is ${current.state} cannot become ${input.to}.`, {
        fieldErrors: { to: ["Not a step this flag can take"] },
      });
    const now = new Date();
    await step(tx, input.flagId, current.state, input.to, input.reason, actor, now, signed);
    let closedAlso = 0;
    if (input.to === "cell retired") {
      const [before] = await tx.select({ status: cell.status }).from(cell).where(eq(cell.id, current.cellId)).for("update");
      await tx.update(cell).set({ status: "retired", updatedAt: now }).where(eq(cell.id, current.cellId));
      await recordAudit(tx, actor, { action: "status", entity: "cell", entityId: current.cellId, before: { status: before?.status ?? null }, after: { status: "retired" } });
      // A retired cell keeps no unclosed flags: each closes with a step that says why.
      const others = await tx
        .select({ id: flag.id, state: flag.state })
        .from(flag)
        .where(and(eq(flag.cellId, current.cellId), ne(flag.id, input.flagId), inArray(flag.state, [...unclosedFlagStates])))
        .for("update");
      for (const other of others) await step(tx, other.id, other.state, "cell retired", `The cell was retired from another flag: ${input.reason}`, actor, now);
      closedAlso = others.length;
    } else {
      await syncCellStatus(tx, current.cellId, actor);
    }
    const view = signed ? { signerName: signed.signerName, signedAt: now, meaning: signed.meaning } : null;
    return { id: input.flagId, state: input.to, closedAlso, signature: view };
  });
}

async function step(
  tx: Transaction,
  flagId: string,
  from: FlagState,
  to: FlagState,
  reason: string,
  actor: AuditActor,
  at: Date,
  signature?: Signature,
): Promise<void> {
  await tx.update(flag).set({ state: to, updatedAt: at }).where(eq(flag.id, flagId));
  await tx
    .insert(flagTransition)
    .values({ flagId, fromState: from, toState: to, reason, actorId: actor.id, actorName: actor.name, at, ...(signature ? signatureValues(signature, at) : {}) });
  const after = signature ? { state: to, reason, signature: signatureAudit(signature, at) } : { state: to, reason };
  await recordAudit(tx, actor, { action: "transition", entity: "flag", entityId: flagId, before: { state: from }, after });
}

/* ---------------------------------- reading ---------------------------------- */

export interface FlagListItem {
  id: string;
  cellId: string;
  serial: string;
  cellStatus: "active" | "flagged" | "retired";
  batchId: string | null;
  lotCode: string | null;
  ruleId: string | null;
  kind: string;
  state: FlagState;
  summary: string;
  value: number | null;
  bound: number | null;
  unit: string | null;
  raisedByName: string | null;
  createdAt: Date;
  updatedAt: Date;
}

const raiser = alias(user, "raiser");

const flagListColumns = {
  id: flag.id,
  cellId: flag.cellId,
  serial: cell.serial,
  cellStatus: cell.status,
  batchId: cell.batchId,
  lotCode: batch.lotCode,
  ruleId: flag.ruleId,
  kind: flag.kind,
  state: flag.state,
  summary: flag.summary,
  value: flag.value,
  bound: flag.bound,
  unit: flag.unit,
  raisedByName: raiser.name,
  createdAt: flag.createdAt,
  updatedAt: flag.updatedAt,
};

/** Flags with their cell, batch and who raised them; the callers add filters and order. */
function selectFlagList(exec: Executor) {
  return exec
    .select(flagListColumns)
    .from(flag)
    .innerJoin(cell, eq(cell.id, flag.cellId))
    .leftJoin(batch, eq(batch.id, cell.batchId))
    .leftJoin(raiser, eq(raiser.id, flag.raisedBy));
}

/** Open flags first, then those being dealt with, then closed ones; newest first within each. */
const stateRank = sql`case ${flag.state} when 'open' then 0 when 'retest requested' then 1 when 'acknowledged' then 2 else 3 end`;

function flagFilters(query: Partial<FlagListQuery> & { cellId?: string }): SQL | undefined {
  const filters: SQL[] = [];
  if (query.state === "unclosed" || query.state === undefined) filters.push(inArray(flag.state, [...unclosedFlagStates]));
  else if (query.state !== "all") filters.push(eq(flag.state, query.state));
  if (query.kind) filters.push(eq(flag.kind, query.kind));
  if (query.batchId) filters.push(eq(cell.batchId, query.batchId));
  if (query.cellId) filters.push(eq(flag.cellId, query.cellId));
  if (query.q) filters.push(ilike(cell.serial, `%${escapeLike(query.q)}%`));
  return filters.length ? and(...filters) : undefined;
}

export async function listFlags(query: FlagListQuery): Promise<Page<FlagListItem>> {
  const db = await getDb();
  const where = flagFilters(query);
  const [items, [total]] = await Promise.all([
    selectFlagList(db)
      .where(where)
      .orderBy(stateRank, desc(flag.createdAt), asc(flag.id))
      .limit(query.pageSize)
      .offset((query.page - 1) * query.pageSize),
    db.select({ n: count() }).from(flag).innerJoin(cell, eq(cell.id, flag.cellId)).where(where),
  ]);
  return { items, total: total?.n ?? 0, page: query.page, pageSize: query.pageSize };
}

/** Every flag of a cell (all states), or the unclosed flags of a batch's cells. */
export async function flagsOf(where: { cellId: string } | { batchId: string; unclosedOnly: true }): Promise<FlagListItem[]> {
  const db = await getDb();
  const filter = "cellId" in where ? flagFilters({ state: "all", cellId: where.cellId }) : flagFilters({ state: "unclosed", batchId: where.batchId });
  return selectFlagList(db).where(filter).orderBy(stateRank, desc(flag.createdAt));
}

export interface FlagTransitionView {
  id: number;
  fromState: FlagState | null;
  toState: FlagState;
  reason: string;
  actorName: string;
  at: Date;
  /** Set on the step that cleared the flag (since signatures came in). */
  signature: SignatureView | null;
}

export interface FlagDetail extends FlagListItem {
  ruleDescription: string | null;
  detail: unknown;
  evidence: { analysisId: string; runId: string; version: number; fileName: string } | null;
  transitions: FlagTransitionView[];
}

export async function getFlagDetail(flagId: string): Promise<FlagDetail | null> {
  const db = await getDb();
  const [row] = await db
    .select({ ...flagListColumns, detail: flag.detail, evidenceAnalysisId: flag.evidenceAnalysisId, ruleKind: flagRule.kind, ruleBound: flagRule.bound })
    .from(flag)
    .innerJoin(cell, eq(cell.id, flag.cellId))
    .leftJoin(batch, eq(batch.id, cell.batchId))
    .leftJoin(raiser, eq(raiser.id, flag.raisedBy))
    .leftJoin(flagRule, eq(flagRule.id, flag.ruleId))
    .where(eq(flag.id, flagId));
  if (!row) return null;
  const { evidenceAnalysisId, ruleKind, ruleBound, ...item } = row;
  const [settings, transitions, evidence] = await Promise.all([
    getLabSettings(db),
    db
      .select({
        id: flagTransition.id,
        fromState: flagTransition.fromState,
        toState: flagTransition.toState,
        reason: flagTransition.reason,
        actorName: flagTransition.actorName,
        at: flagTransition.at,
        signedByName: flagTransition.signedByName,
        signedAt: flagTransition.signedAt,
        signatureMeaning: flagTransition.signatureMeaning,
      })
      .from(flagTransition)
      .where(eq(flagTransition.flagId, flagId))
      .orderBy(asc(flagTransition.at), asc(flagTransition.id)),
    evidenceAnalysisId
      ? db
          .select({ analysisId: analysisVersion.id, runId: run.id, version: analysisVersion.version, fileName: run.fileName })
          .from(analysisVersion)
          .innerJoin(run, eq(run.id, analysisVersion.runId))
          .where(eq(analysisVersion.id, evidenceAnalysisId))
      : Promise.resolve([]),
  ]);
  return {
    ...item,
    ruleDescription: ruleKind ? describeRule(ruleKind, ruleBound, settings.eolThresholdPct) : null,
    transitions: transitions.map(({ signedByName, signedAt, signatureMeaning, ...t }) => ({ ...t, signature: signatureOf({ signedByName, signedAt, signatureMeaning }) })),
    evidence: evidence[0] ?? null,
  };
}

/** Unclosed flags for the daily digest, oldest first. */
export async function unclosedFlagsForDigest(exec: Executor): Promise<FlagListItem[]> {
  return selectFlagList(exec)
    .where(inArray(flag.state, [...unclosedFlagStates]))
    .orderBy(stateRank, asc(flag.createdAt));
}

/** Flags closed or opened since an instant, for the digest's "what happened" part. */
export async function flagStepsSince(exec: Executor, since: Date): Promise<{ opened: number; closed: number }> {
  const rows = await exec
    .select({ toState: flagTransition.toState, n: count() })
    .from(flagTransition)
    .where(sql`${flagTransition.at} >= ${since.toISOString()}`)
    .groupBy(flagTransition.toState);
  let opened = 0;
  let closed = 0;
  for (const r of rows) {
    if (r.toState === "open") opened += r.n;
    else if (isClosed(r.toState)) closed += r.n;
  }
  return { opened, closed };
}
