import "server-only";
import { cellIdentities, cellOfRun, loadCellRuns, type CellIdentity } from "@/lib/db/queries/cell-measurements";
import { enabledRules, getLabSettings, openRuleFlag, type EnabledRule } from "@/lib/db/queries/flags";
import { serverEnv } from "@/lib/env";
import { cellMeasurements } from "@/lib/health/measurements";
import { kickOutbox } from "@/lib/mail/sender";
import { evaluateRule, type CellInput, type FlagCandidate } from "./rules";
import { describeRule } from "./vocabulary";

export interface EvaluationResult {
  /** Flags opened by this evaluation. */
  opened: { flagId: string; cellId: string; ruleId: string }[];
  /** Flags the rules asked for that existed already (same evidence, or one still unclosed). */
  skipped: number;
}

async function cellInputs(identities: readonly CellIdentity[]): Promise<CellInput[]> {
  const runs = await loadCellRuns(identities.map((c) => c.id));
  return identities.map((c) => {
    const entry = runs.get(c.id);
    const order = new Map((entry?.runs ?? []).map((r, i) => [r.runId, i]));
    // Newest run first, so a rule that flags once per cell points at the latest evidence.
    const dangers = [...(entry?.dangers ?? [])].sort((a, b) => (order.get(b.runId) ?? 0) - (order.get(a.runId) ?? 0));
    return { ...c, measurements: cellMeasurements(entry?.runs ?? []), dangers };
  });
}

function cautionsOf(candidate: FlagCandidate): string[] {
  const findings = (candidate.detail.findings ?? []) as { caution?: unknown }[];
  return findings.flatMap((f) => (typeof f.caution === "string" && f.caution.trim() ? [f.caution] : []));
}

async function persist(rules: readonly EnabledRule[], candidates: readonly FlagCandidate[], eolThresholdPct: number): Promise<EvaluationResult> {
  const baseUrl = serverEnv().BETTER_AUTH_URL;
  const result: EvaluationResult = { opened: [], skipped: 0 };
  const ruleById = new Map(rules.map((r) => [r.id, r]));
  for (const c of candidates) {
    const rule = ruleById.get(c.ruleId);
    if (!rule) continue;
    const ruleLine = describeRule(rule.kind, rule.bound, eolThresholdPct);
    const { ruleId, kind, cellId, evidenceAnalysisId, summary, value, bound, unit, detail } = c;
    const opened = await openRuleFlag(
      { cellId, ruleId, kind, summary, value, bound, unit, evidenceAnalysisId, detail, reason: `Rule: ${ruleLine}` },
      { baseUrl, ruleLine, cautions: cautionsOf(c) },
    );
    if (opened) result.opened.push({ flagId: opened.id, cellId: c.cellId, ruleId: c.ruleId });
    else result.skipped++;
  }
  if (result.opened.length > 0) kickOutbox();
  return result;
}

/**
 * Evaluates the enabled rules (or the given ones) for some cells. The batch rule (fade outlier)
 * looks at every cell of the batches involved; the others only at the cells named.
 */
async function evaluate(scope: { cellIds: string[] } | "all", ruleIds?: readonly string[]): Promise<EvaluationResult> {
  const [rules, settings] = await Promise.all([enabledRules(ruleIds), getLabSettings()]);
  if (rules.length === 0) return { opened: [], skipped: 0 };
  const named = scope === "all" ? await cellIdentities({}) : await cellIdentities({ cellIds: scope.cellIds });
  const namedIds = new Set(named.map((c) => c.id));
  let population = named;
  if (scope !== "all" && rules.some((r) => r.kind === "fade-outlier")) {
    const batchIds = [...new Set(named.flatMap((c) => (c.batchId ? [c.batchId] : [])))];
    const siblings = (await Promise.all(batchIds.map((batchId) => cellIdentities({ batchId })))).flat();
    population = [...named, ...siblings.filter((c) => !namedIds.has(c.id))];
  }
  const inputs = await cellInputs(population);
  const namedInputs = inputs.filter((c) => namedIds.has(c.id));
  const candidates = rules.flatMap((rule) => evaluateRule(rule, rule.kind === "fade-outlier" ? inputs : namedInputs, settings.eolThresholdPct));
  return persist(rules, candidates, settings.eolThresholdPct);
}

/**
 * Call after an analysis of the run is stored: evaluates every enabled rule for the run's cell
 * (and the fade rule for its batch), opens flags and queues their alerts.
 */
export async function evaluateFlagsAfterAnalysis(runId: string): Promise<EvaluationResult> {
  const cellId = await cellOfRun(runId);
  return cellId ? evaluate({ cellIds: [cellId] }) : { opened: [], skipped: 0 };
}

/** After a rule or a setting changed: evaluates the given rules (default all enabled) on every cell. */
export async function evaluateFlagsEverywhere(ruleIds?: readonly string[]): Promise<EvaluationResult> {
  return evaluate("all", ruleIds);
}

/** Evaluates the rules for named cells (e.g. the fade-outlier rule after a batch's data changed). */
export async function evaluateFlagsForCells(cellIds: string[]): Promise<EvaluationResult> {
  return evaluate({ cellIds });
}

