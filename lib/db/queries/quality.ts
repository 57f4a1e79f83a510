import "server-only";
import { asc, desc, eq, inArray } from "drizzle-orm";
import { AppError } from "@/lib/http/errors";
import { cellFade, fadeRatePct } from "@/lib/health/fade";
import { cellMeasurements, type CellMeasurements } from "@/lib/health/measurements";
import { analyzeBatch, compareBatches, matchCells, type BatchComparison, type BatchReport, type MatchResult } from "@/lib/stats";
import type { LotDecisionInput } from "@/lib/validations/flags";
import { getDb } from "../client";
import { batch, cellType, lotDecision, user } from "../schema";
import { recordAudit, type AuditActor } from "./audit";
import { cellIdentities, loadCellRuns, type CellIdentity } from "./cell-measurements";
import { flagsOf, getLabSettings } from "./flags";
import { getBatch, type BatchListItem } from "./registry";
import { signatureAudit, signatureOf, signatureValues, type Signature, type SignatureView } from "./signatures";

/**
 * A batch's quality figures. Delivered capacity of a cell is its first capacity measurement (the
 * incoming check: the first capacity-check or cycle-life discharge after a full charge, see
 * lib/health/measurements.ts), so later fade does not count against the lot as delivered.
 */

export interface DeliveredCell {
  cellId: string;
  serial: string;
  status: CellIdentity["status"];
  capacity_mAh: number;
  measuredAt: string;
  /** First DC resistance (median of its run), for matching. */
  dcir_mOhm: number | null;
  dcirMethod: string | null;
  fadePer100Cycles_pctRated: number | null;
}

export interface MatchSettings {
  setSize: number;
  capacityTolerance_pct: number;
  /** Null to ignore DCIR. */
  dcirTolerance_pct: number | null;
}

export interface BatchQuality {
  batch: BatchListItem;
  ratedCapacityMah: number;
  delivered: DeliveredCell[];
  /** Cells with no capacity measurement yet. */
  unmeasured: { serial: string; status: CellIdentity["status"] }[];
  report: BatchReport;
  matching: MatchResult | { error: string } | null;
  matchSettings: MatchSettings;
  /** Measured cells left out of matching because they are flagged (retired ones are left out silently). */
  flaggedSerials: string[];
}

function delivered(c: CellIdentity, m: CellMeasurements, eolPct: number): DeliveredCell | null {
  const first = m.capacity[0];
  if (!first) return null;
  const r = m.resistance[0] ?? null;
  return {
    cellId: c.id,
    serial: c.serial,
    status: c.status,
    capacity_mAh: first.capacity_mAh,
    measuredAt: first.date,
    dcir_mOhm: r?.median_mOhm ?? null,
    dcirMethod: r?.method ?? null,
    fadePer100Cycles_pctRated: fadeRatePct(cellFade(m.capacity, c.ratedCapacityMah, eolPct)),
  };
}

async function deliveredCells(batchId: string, eolPct: number): Promise<{ cells: CellIdentity[]; delivered: DeliveredCell[] }> {
  const cells = await cellIdentities({ batchId });
  const runs = await loadCellRuns(cells.map((c) => c.id));
  const out: DeliveredCell[] = [];
  for (const c of cells) {
    const d = delivered(c, cellMeasurements(runs.get(c.id)?.runs ?? []), eolPct);
    if (d) out.push(d);
  }
  return { cells, delivered: out };
}

export const defaultMatchSettings: MatchSettings = { setSize: 4, capacityTolerance_pct: 2, dcirTolerance_pct: 5 };

export async function getBatchQuality(batchId: string, match: MatchSettings = defaultMatchSettings): Promise<BatchQuality | null> {
  const found = await getBatch(batchId);
  if (!found) return null;
  const db = await getDb();
  const [settings, [type]] = await Promise.all([
    getLabSettings(db),
    db.select({ rated: cellType.ratedCapacityMah }).from(cellType).where(eq(cellType.id, found.cellTypeId)),
  ]);
  const { cells, delivered: measured } = await deliveredCells(batchId, settings.eolThresholdPct);
  const measuredIds = new Set(measured.map((d) => d.cellId));
  const report = analyzeBatch(
    measured.map((d) => ({ serial: d.serial, capacity_mAh: d.capacity_mAh })),
    { spec: { lsl: found.capacityLslMah, usl: found.capacityUslMah } },
  );
  let matching: BatchQuality["matching"] = null;
  // A flagged or retired cell does not go into a pack.
  const candidates = measured.filter((d) => d.status === "active");
  if (candidates.length >= match.setSize) {
    try {
      matching = matchCells(
        candidates.map((d) => ({ serial: d.serial, capacity_mAh: d.capacity_mAh, dcir_mOhm: d.dcir_mOhm })),
        match,
      );
    } catch (error) {
      matching = { error: error instanceof Error ? error.message : String(error) };
    }
  }
  return {
    batch: found,
    ratedCapacityMah: type?.rated ?? NaN,
    delivered: measured,
    unmeasured: cells.filter((c) => !measuredIds.has(c.id)).map((c) => ({ serial: c.serial, status: c.status })),
    report,
    matching,
    matchSettings: match,
    flaggedSerials: measured.filter((d) => d.status === "flagged").map((d) => d.serial),
  };
}

/** The figures a lot decision records: what the QA lead had in view. */
export interface DecisionFigures {
  n: number;
  unmeasured: number;
  mean_mAh: number | null;
  sd_mAh: number | null;
  cv_pct: number | null;
  min_mAh: number | null;
  max_mAh: number | null;
  lsl_mAh: number;
  usl_mAh: number | null;
  capability: { index: string; value: number; verdict: string; cp: number | null; cpk: number | null; cpl: number | null; cpu: number | null } | null;
  belowLsl: number;
  grubbsOutliers: string[];
  unclosedFlags: number;
}

export function decisionFigures(q: BatchQuality, unclosedFlags: number): DecisionFigures {
  const s = q.report.summary;
  const c = q.report.capability;
  return {
    n: s?.n ?? 0,
    unmeasured: q.unmeasured.length,
    mean_mAh: s?.mean ?? null,
    sd_mAh: s?.sd ?? null,
    cv_pct: s?.cv_pct ?? null,
    min_mAh: s?.min ?? null,
    max_mAh: s?.max ?? null,
    lsl_mAh: q.batch.capacityLslMah,
    usl_mAh: q.batch.capacityUslMah,
    capability: c ? { index: c.index, value: c.value, verdict: c.verdict, cp: c.cp, cpk: c.cpk, cpl: c.cpl, cpu: c.cpu } : null,
    belowLsl: q.report.cells.filter((x) => x.belowLsl).length,
    grubbsOutliers: q.report.grubbs?.outlierSerials ?? [],
    unclosedFlags,
  };
}

/**
 * Records a QA lead's signed decision on a lot and sets the batch's disposition, with an audit
 * event, in one transaction. The figures are computed here, on the server, at the moment of
 * deciding. The signer's password is checked before this is called (lib/auth/e-signature.ts).
 */
export async function decideLot(
  input: LotDecisionInput,
  actor: AuditActor,
  signature: Signature,
): Promise<{ id: number; disposition: LotDecisionInput["disposition"]; signature: SignatureView }> {
  // The type says so already; this guards callers that reach here without one at run time.
  if (!signature?.signerName) throw new AppError("bad-request", "A lot decision must be signed.", { fieldErrors: { password: ["Enter your password to sign"] } });
  const quality = await getBatchQuality(input.batchId);
  if (!quality) throw new AppError("not-found", "That batch does not exist.");
  const flags = await flagsOf({ batchId: input.batchId, unclosedOnly: true });
  const figures = decisionFigures(quality, flags.length);
  const db = await getDb();
  return db.transaction(async (tx) => {
    const [current] = await tx.select({ disposition: batch.disposition }).from(batch).where(eq(batch.id, input.batchId)).for("update");
    if (!current) throw new AppError("not-found", "That batch does not exist.");
    if (current.disposition !== input.expectedDisposition)
      throw new AppError("conflict", `The batch is ${current.disposition} now (someone decided meanwhile); look at its decisions and try again.`);
    if (current.disposition === input.disposition)
      throw new AppError("conflict", `The batch is ${current.disposition} already.`, { fieldErrors: { disposition: ["That is the current decision"] } });
    const now = new Date();
    const [row] = await tx
      .insert(lotDecision)
      .values({
        batchId: input.batchId,
        fromDisposition: current.disposition,
        disposition: input.disposition,
        reason: input.reason,
        figures,
        decidedBy: actor.id,
        decidedByName: actor.name,
        decidedAt: now,
        ...signatureValues(signature, now),
      })
      .returning({ id: lotDecision.id });
    if (!row) throw new Error("insert returned no row");
    await tx.update(batch).set({ disposition: input.disposition, updatedAt: new Date() }).where(eq(batch.id, input.batchId));
    await recordAudit(tx, actor, {
      action: "lot decision",
      entity: "batch",
      entityId: input.batchId,
      before: { disposition: current.disposition },
      after: { disposition: input.disposition, reason: input.reason, lotCode: quality.batch.lotCode, signature: signatureAudit(signature, now) },
    });
    return { id: row.id, disposition: input.disposition, signature: { signerName: signature.signerName, signedAt: now, meaning: signature.meaning } };
  });
}

export interface LotDecisionView {
  id: number;
  fromDisposition: string;
  disposition: string;
  reason: string;
  figures: DecisionFigures | null;
  decidedByName: string;
  decidedByCurrentName: string | null;
  decidedAt: Date;
  /** Null only on decisions recorded before signatures came in. */
  signature: SignatureView | null;
}

/** A batch's decisions, newest first. */
export async function listLotDecisions(batchId: string): Promise<LotDecisionView[]> {
  const db = await getDb();
  const rows = await db
    .select({
      id: lotDecision.id,
      fromDisposition: lotDecision.fromDisposition,
      disposition: lotDecision.disposition,
      reason: lotDecision.reason,
      figures: lotDecision.figures,
      decidedByName: lotDecision.decidedByName,
      decidedByCurrentName: user.name,
      decidedAt: lotDecision.decidedAt,
      signedByName: lotDecision.signedByName,
      signedAt: lotDecision.signedAt,
      signatureMeaning: lotDecision.signatureMeaning,
    })
    .from(lotDecision)
    .leftJoin(user, eq(user.id, lotDecision.decidedBy))
    .where(eq(lotDecision.batchId, batchId))
    .orderBy(desc(lotDecision.decidedAt), desc(lotDecision.id));
  return rows.map(({ signedByName, signedAt, signatureMeaning, ...r }) => ({
    ...r,
    figures: (r.figures as DecisionFigures | null) ?? null,
    signature: signatureOf({ signedByName, signedAt, signatureMeaning }),
  }));
}

export interface ComparedBatch {
  id: string;
  lotCode: string;
  supplier: string;
  receivedOn: string;
  cellTypeName: string;
  disposition: string;
  values: number[];
}

/** Delivered capacities of several batches side by side: summaries, means with 95 % intervals, Welch's t for each pair. */
export async function compareBatchQuality(batchIds: readonly string[]): Promise<{ batches: ComparedBatch[]; comparison: BatchComparison }> {
  if (batchIds.length === 0) return { batches: [], comparison: compareBatches([]) };
  const db = await getDb();
  const settings = await getLabSettings(db);
  const found = await db
    .select({ id: batch.id, lotCode: batch.lotCode, supplier: batch.supplier, receivedOn: batch.receivedOn, disposition: batch.disposition, cellTypeName: cellType.name })
    .from(batch)
    .innerJoin(cellType, eq(cellType.id, batch.cellTypeId))
    .where(inArray(batch.id, [...batchIds]))
    .orderBy(asc(batch.receivedOn), asc(batch.lotCode));
  const batches: ComparedBatch[] = [];
  for (const b of found) {
    const { delivered: measured } = await deliveredCells(b.id, settings.eolThresholdPct);
    batches.push({ ...b, values: measured.map((d) => d.capacity_mAh) });
  }
  return { batches, comparison: compareBatches(batches.map((b) => ({ id: b.id, values: b.values }))) };
}
