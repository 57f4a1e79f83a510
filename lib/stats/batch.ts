/**
 * Batch QA of delivered capacity: summary, capability against the batch's specification limits,
 * per-cell z-scores, Tukey fences, iterated Grubbs test and a histogram that spans the limits.
 * Each part cites its source in its own module (./describe, ./capability, ./outliers, ./histogram).
 */
import { capabilityIndices, type Capability, type SpecLimits } from "./capability";
import { summarize, zScores, type SampleSummary } from "./describe";
import { histogram, type BinRule, type Histogram } from "./histogram";
import { grubbsIterated, tukeyFences, type FenceClass, type GrubbsIteration, type TukeyFences } from "./outliers";

export interface BatchCell {
  serial: string;
  capacity_mAh: number;
}

export interface BatchOptions {
  spec?: SpecLimits;
  /** Grubbs level; default 0.05. */
  alpha?: number;
  /** Most values the iterated Grubbs test may remove; default 3. */
  maxOutliers?: number;
  binRule?: BinRule;
}

export interface CellVerdict {
  serial: string;
  capacity_mAh: number;
  z: number | null;
  fence: FenceClass | null;
  grubbsOutlier: boolean;
  belowLsl: boolean;
  aboveUsl: boolean;
}

export interface BatchReport {
  summary: SampleSummary | null;
  capability: Capability | null;
  fences: Omit<TukeyFences, "classes"> | null;
  grubbs: (GrubbsIteration & { outlierSerials: string[] }) | null;
  histogram: Histogram | null;
  cells: CellVerdict[];
}

export function analyzeBatch(cells: readonly BatchCell[], options: BatchOptions = {}): BatchReport {
  const values = cells.map((c) => c.capacity_mAh);
  const summary = summarize(values);
  const spec = options.spec ?? {};
  const capability = summary ? capabilityIndices(summary.mean, summary.sd, spec) : null;
  const fences = tukeyFences(values);
  const z = zScores(values);
  const grubbs = values.length >= 3 ? grubbsIterated(values, { alpha: options.alpha, maxOutliers: options.maxOutliers }) : null;
  const rejected = new Set(grubbs?.outlierIndices ?? []);
  const lsl = spec.lsl ?? null;
  const usl = spec.usl ?? null;
  const verdicts: CellVerdict[] = cells.map((c, i) => ({
    serial: c.serial,
    capacity_mAh: c.capacity_mAh,
    z: z[i] ?? null,
    fence: fences?.classes[i] ?? null,
    grubbsOutlier: rejected.has(i),
    belowLsl: lsl !== null && c.capacity_mAh < lsl,
    aboveUsl: usl !== null && c.capacity_mAh > usl,
  }));
  let fenceSummary: Omit<TukeyFences, "classes"> | null = null;
  if (fences) {
    const { classes: _classes, ...rest } = fences;
    fenceSummary = rest;
  }
  return {
    summary,
    capability,
    fences: fenceSummary,
    grubbs: grubbs ? { ...grubbs, outlierSerials: grubbs.outlierIndices.map((i) => cells[i]?.serial as string) } : null,
    histogram: histogram(values, { spec, rule: options.binRule }),
    cells: verdicts,
  };
}
