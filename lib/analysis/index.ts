/**
 * The analysis engine's public entry points.
 * createAnalyzer: push SampleBatches (from the reader or a test), then finish with the reader's summary.
 * analyzeLog: reads a log (lib/analysis/read) and analyses it in one streaming pass.
 */
import { StreamingAnalyzer, type ReadSummaryInput } from "./analyzer";
import type { PlotSeries } from "./plot";
import { readLog, type ReadOptions, type ReadSummary } from "./read";
import { assembleReport, type Report } from "./report";
import type { CellLimits, SampleBatch } from "./types";

export interface AnalysisOutput {
  report: Report;
  series: PlotSeries;
}

export interface Analyzer {
  push(batch: SampleBatch): void;
  finish(read: ReadSummary | ReadSummaryInput): AnalysisOutput;
}

export function createAnalyzer(options: { limits?: CellLimits } = {}): Analyzer {
  const limits = options.limits ?? {};
  const a = new StreamingAnalyzer(limits);
  return {
    push: (batch) => a.push(batch),
    finish: (read) => {
      const core = a.finish();
      const report = assembleReport(core, read, limits);
      const switches = report.cycles.flatMap((c) => (c.charge?.transition ? [{ time_s: c.charge.transition.time_s, voltage_V: c.charge.transition.voltage_V, cycle: c.cycle }] : []));
      return { report, series: core.plot.build(core.steps, switches) };
    },
  };
}

export async function analyzeLog(source: AsyncIterable<Uint8Array>, options: ReadOptions & { limits?: CellLimits } = {}): Promise<AnalysisOutput> {
  const { limits, ...read } = options;
  const analyzer = createAnalyzer({ limits });
  const summary = await readLog(source, (b) => analyzer.push(b), read);
  return analyzer.finish(summary);
}

export type { Report, ReportCycle, ReportCharge, ReportDetected } from "./report";
export type { PlotSeries, XYTrace, StepCurve, IncrementalCapacityCurve } from "./plot";
export type { AnalysedStep } from "./steps";
export type { ChargeSummary, DischargeSummary, CvEnd } from "./cycles";
export type { ResistanceResult } from "./dcir";
export type { ReadSummaryInput } from "./analyzer";
export { chemistryDefaults, chemistries, isChemistry, type Chemistry } from "./chemistry";
export { cautions } from "./safety";
export * from "./types";
