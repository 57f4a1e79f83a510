/** Runs the streaming analyser core over simulator output (no reader involved). */
import { StreamingAnalyzer, type AnalyzerCore } from "@/lib/analysis/analyzer";
import type { CellLimits } from "@/lib/analysis/types";
import { toBatches, type BatchOptions } from "./batches";
import type { SampledSeries } from "./simulate";

export function analyseSamples(s: SampledSeries, limits: CellLimits, batch: BatchOptions = {}): AnalyzerCore {
  const a = new StreamingAnalyzer(limits);
  for (const b of toBatches(s, batch)) a.push(b);
  return a.finish();
}
