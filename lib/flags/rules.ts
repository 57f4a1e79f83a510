/**
 * The flag rules as pure functions: given a rule and the cells' measurements, which cells it
 * flags, on what evidence, with what numbers. Persisting a flag is lib/flags/evaluate.ts' job.
 */
import { grubbsIterated } from "@/lib/stats";
import { cellFade, fadeRatePct, type CellFade } from "@/lib/health/fade";
import { median, resistanceRise, type CellMeasurements, type DangerFinding } from "@/lib/health/measurements";
import type { CellIdentity } from "@/lib/db/queries/cell-measurements";
import type { FlagRuleKind } from "./vocabulary";

export interface RuleInput {
  id: string;
  kind: FlagRuleKind;
  bound: number | null;
}

export interface CellInput extends CellIdentity {
  measurements: CellMeasurements;
  /** Danger findings of the latest analysis of each run, newest run first. */
  dangers: readonly DangerFinding[];
}

export interface FlagCandidate {
  ruleId: string;
  kind: FlagRuleKind;
  cellId: string;
  evidenceAnalysisId: string;
  summary: string;
  value: number | null;
  bound: number | null;
  unit: string | null;
  detail: Record<string, unknown>;
}

const pct = (x: number, digits = 1) => `${x.toFixed(digits)} %`;

function sohCandidate(rule: RuleInput, c: CellInput, eolPct: number): FlagCandidate | null {
  const latest = c.measurements.capacity[c.measurements.capacity.length - 1];
  if (!latest) return null;
  const bound = rule.bound ?? eolPct;
  const soh = (latest.capacity_mAh / c.ratedCapacityMah) * 100;
  if (!(soh < bound)) return null;
  return {
    ruleId: rule.id,
    kind: rule.kind,
    cellId: c.id,
    evidenceAnalysisId: latest.analysisId,
    summary: `State of health ${pct(soh)} of rated (${latest.capacity_mAh.toFixed(0)} of ${c.ratedCapacityMah} mAh at cycle ${latest.cycle}), below ${pct(bound, 0)}`,
    value: soh,
    bound,
    unit: "%",
    detail: { capacity_mAh: latest.capacity_mAh, ratedCapacity_mAh: c.ratedCapacityMah, cycle: latest.cycle, runId: latest.runId, boundFromSetting: rule.bound === null },
  };
}

function fadeRateCandidate(rule: RuleInput, c: CellInput, eolPct: number): FlagCandidate | null {
  const f = cellFade(c.measurements.capacity, c.ratedCapacityMah, eolPct);
  if (!f || !f.fade.byCycle.ok || rule.bound === null) return null;
  const rate = f.fade.byCycle.lossPer100Cycles_pctRated;
  // Only a fade the data are sure of: the whole 95 % interval of the slope shows capacity falling.
  if (!(rate.value > rule.bound) || !(rate.low > 0)) return null;
  const latest = c.measurements.capacity[c.measurements.capacity.length - 1];
  if (!latest) return null;
  const eol = f.fade.byCycle.eol;
  const projection = eol.ok ? `; end of life projected at cycle ${eol.cycle.toFixed(0)}` : "";
  return {
    ruleId: rule.id,
    kind: rule.kind,
    cellId: c.id,
    evidenceAnalysisId: latest.analysisId,
    summary: `Losing ${rate.value.toFixed(2)} % of rated capacity per 100 cycles (95 % interval ${rate.low.toFixed(2)} to ${rate.high.toFixed(2)}, ${f.fade.byCycle.n} points), above ${rule.bound} %${projection}`,
    value: rate.value,
    bound: rule.bound,
    unit: "% per 100 cycles",
    detail: { low: rate.low, high: rate.high, n: f.fade.byCycle.n, eolCycle: eol.ok ? eol.cycle : null, latestCycle: latest.cycle },
  };
}

function ceCandidate(rule: RuleInput, c: CellInput): FlagCandidate | null {
  const runs = c.measurements.efficiency.filter((e) => e.purpose !== "formation");
  const latest = runs[runs.length - 1];
  if (!latest || rule.bound === null) return null;
  const ce = latest.min * 100;
  if (!(ce < rule.bound)) return null;
  return {
    ruleId: rule.id,
    kind: rule.kind,
    cellId: c.id,
    evidenceAnalysisId: latest.analysisId,
    summary: `Coulombic efficiency ${ce.toFixed(2)} % in cycle ${latest.cycle} of the latest run, below ${pct(rule.bound, 2)}`,
    value: ce,
    bound: rule.bound,
    unit: "%",
    detail: { runId: latest.runId, cycle: latest.cycle, cyclesWithEfficiency: latest.cycles },
  };
}

function dcirCandidate(rule: RuleInput, c: CellInput): FlagCandidate | null {
  const rise = resistanceRise(c.measurements.resistance);
  if (!rise || rule.bound === null || !(rise.risePct > rule.bound)) return null;
  return {
    ruleId: rule.id,
    kind: rule.kind,
    cellId: c.id,
    evidenceAnalysisId: rise.latest.analysisId,
    summary: `DC resistance ${rise.latest.median_mOhm.toFixed(1)} mΩ, up ${pct(rise.risePct)} on the first ${rise.first.median_mOhm.toFixed(1)} mΩ (${rise.latest.method}), above ${pct(rule.bound, 0)}`,
    value: rise.risePct,
    bound: rule.bound,
    unit: "%",
    detail: { method: rise.latest.method, first_mOhm: rise.first.median_mOhm, latest_mOhm: rise.latest.median_mOhm, firstRunId: rise.first.runId, latestRunId: rise.latest.runId },
  };
}

function dangerCandidates(rule: RuleInput, c: CellInput): FlagCandidate[] {
  const byAnalysis = new Map<string, DangerFinding[]>();
  for (const d of c.dangers) byAnalysis.set(d.analysisId, [...(byAnalysis.get(d.analysisId) ?? []), d]);
  return [...byAnalysis.entries()].map(([analysisId, findings]) => {
    const first = findings[0] as DangerFinding;
    const more = findings.length > 1 ? ` (and ${findings.length - 1} more)` : "";
    return {
      ruleId: rule.id,
      kind: rule.kind,
      cellId: c.id,
      evidenceAnalysisId: analysisId,
      summary: `Danger: ${first.message}${more}`,
      value: first.value,
      bound: first.limitValue,
      unit: first.unit,
      detail: { runId: first.runId, findings: findings.map((f) => ({ kind: f.kind, message: f.message, caution: f.caution, timeS: f.timeS })) },
    };
  });
}

/** Cells of one batch whose fade rate the iterated Grubbs test singles out as faster than the rest. */
function fadeOutlierCandidates(rule: RuleInput, cells: readonly CellInput[], fades: Map<string, CellFade | null>): FlagCandidate[] {
  const rated = cells
    .map((c) => ({ c, rate: fadeRatePct(fades.get(c.id) ?? null) }))
    .filter((r): r is { c: CellInput; rate: number } => r.rate !== null);
  if (rated.length < 3) return [];
  const alpha = rule.bound ?? 0.05;
  const values = rated.map((r) => r.rate);
  const grubbs = grubbsIterated(values, { alpha });
  const outliers = new Set(grubbs.outlierIndices);
  const rest = values.filter((_, i) => !outliers.has(i));
  const restMean = rest.reduce((s, v) => s + v, 0) / Math.max(rest.length, 1);
  const restMedian = median(rest);
  const out: FlagCandidate[] = [];
  for (const index of grubbs.outlierIndices) {
    const { c, rate } = rated[index] as { c: CellInput; rate: number };
    // Only a cell losing capacity faster than its batch is a concern.
    if (!(rate > restMean)) continue;
    const latest = c.measurements.capacity[c.measurements.capacity.length - 1];
    const step = grubbs.steps.find((s) => s.suspectIndex === index && s.rejected);
    if (!latest || !step) continue;
    out.push({
      ruleId: rule.id,
      kind: rule.kind,
      cellId: c.id,
      evidenceAnalysisId: latest.analysisId,
      summary: `Fade ${rate.toFixed(2)} % of rated per 100 cycles against a median of ${restMedian.toFixed(2)} % for the rest of ${c.lotCode ? `batch ${c.lotCode}` : "its batch"} (Grubbs G = ${step.g.toFixed(2)} > ${step.critical.toFixed(2)}, α = ${alpha}, n = ${step.n})`,
      value: rate,
      // The test's bound is on G, not on the rate: the summary and detail carry G and its critical value.
      bound: null,
      unit: "% per 100 cycles",
      detail: { g: step.g, critical: step.critical, n: step.n, alpha, batchMeanOthers: restMean, batchMedianOthers: restMedian, lotCode: c.lotCode },
    });
  }
  return out;
}

/**
 * Every flag a rule would open now. Retired cells are never flagged (they may still count in
 * their batch's fade statistics).
 */
export function evaluateRule(rule: RuleInput, cells: readonly CellInput[], eolThresholdPct: number): FlagCandidate[] {
  const live = cells.filter((c) => c.status !== "retired");
  switch (rule.kind) {
    case "soh-below":
      return live.flatMap((c) => sohCandidate(rule, c, eolThresholdPct) ?? []);
    case "fade-rate-above":
      return live.flatMap((c) => fadeRateCandidate(rule, c, eolThresholdPct) ?? []);
    case "ce-below":
      return live.flatMap((c) => ceCandidate(rule, c) ?? []);
    case "dcir-rise":
      return live.flatMap((c) => dcirCandidate(rule, c) ?? []);
    case "safety-danger":
      return live.flatMap((c) => dangerCandidates(rule, c));
    case "fade-outlier": {
      const fades = new Map(cells.map((c) => [c.id, cellFade(c.measurements.capacity, c.ratedCapacityMah, eolThresholdPct)]));
      const byBatch = new Map<string, CellInput[]>();
      for (const c of cells) if (c.batchId) byBatch.set(c.batchId, [...(byBatch.get(c.batchId) ?? []), c]);
      const liveIds = new Set(live.map((c) => c.id));
      return [...byBatch.values()].flatMap((group) => fadeOutlierCandidates(rule, group, fades)).filter((f) => liveIds.has(f.cellId));
    }
  }
}
