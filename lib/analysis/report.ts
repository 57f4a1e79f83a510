/**
 * Assembles the report (the CLI's JSON shape, snake_case, units in names, times in seconds from
 * the first data row) from the analyser's results and the reader's summary.
 */
import type { AnalyzerCore, ReadSummaryInput } from "./analyzer";
import type { AnalysedCycle, ChargeSummary } from "./cycles";
import type { ResistanceResult } from "./dcir";
import { cvNotTerminated } from "./safety";
import type { AnalysedStep } from "./steps";
import type { CellLimits, Finding } from "./types";

export interface ReportCharge extends Omit<ChargeSummary, "cc"> {
  cc: { mAh: number; Wh: number; duration_s: number; current_A: number };
}

export interface ReportCycle extends Omit<AnalysedCycle, "charge"> {
  charge: ReportCharge | null;
}

export interface ReportDetected {
  delimiter: string;
  decimal: string;
  time_format: string;
  current_sign: string;
  header_line: number;
  confidence: number;
  columns: Record<string, { index: number; name: string; unit: string | null; confidence: number }>;
  preamble: string[];
}

export interface Report {
  status: "ok";
  detected: ReportDetected | null;
  totals: {
    charged_mAh: number;
    charged_Wh: number;
    discharged_mAh: number;
    discharged_Wh: number;
    coulombic_efficiency: number | null;
    energy_efficiency: number | null;
    mean_discharge_voltage_V: number | null;
    max_temperature_C: number | null;
    min_temperature_C: number | null;
    temperature_rise_C: number | null;
    duration_s: number;
    samples: number;
    typical_interval_s: number | null;
    logging_gaps: number;
    uncounted_gap_s: number;
  };
  cycles: ReportCycle[];
  per_cycle_discharge_mAh: (number | null)[];
  steps: AnalysedStep[];
  findings: Finding[];
  dcir: ResistanceResult[];
  dcir_step_edges_total: number;
  noise: { current_sigma_A: number; voltage_sigma_V: number; rest_threshold_A: number };
  limits_used: CellLimits;
  read: { rows: number; bytes: number; parser: string } | null;
}

const orNull = (x: number): number | null => (x === x && Number.isFinite(x) ? x : null);

/**
 * Whole-log efficiencies over complete cycles only (those with both a charge and a discharge).
 * A log that starts by emptying a cell, as a capacity check does, would otherwise count that first
 * discharge against no charge and report an efficiency above 100 %.
 */
function overallEfficiencies(cycles: readonly AnalysedCycle[]): { coulombic_efficiency: number | null; energy_efficiency: number | null } {
  let chargedMah = 0;
  let dischargedMah = 0;
  let chargedWh = 0;
  let dischargedWh = 0;
  for (const c of cycles) {
    if (c.coulombic_efficiency === null) continue;
    chargedMah += c.charged_mAh;
    dischargedMah += c.discharged_mAh;
    chargedWh += c.charged_Wh;
    dischargedWh += c.discharged_Wh;
  }
  return {
    coulombic_efficiency: chargedMah > 0 && dischargedMah > 0 ? dischargedMah / chargedMah : null,
    energy_efficiency: chargedWh > 0 && dischargedWh > 0 ? dischargedWh / chargedWh : null,
  };
}

function detected(read: ReadSummaryInput | null): ReportDetected | null {
  const d = read?.detection;
  if (!d) return null;
  const columns: ReportDetected["columns"] = {};
  for (const [role, c] of Object.entries(d.columns)) {
    if (c) columns[role] = { index: c.index, name: c.name, unit: c.unit, confidence: c.confidence };
  }
  return {
    delimiter: d.delimiter,
    decimal: d.decimal,
    time_format: d.timeFormat,
    current_sign: d.currentSign,
    header_line: d.headerLine,
    confidence: d.confidence,
    columns,
    preamble: d.preamble,
  };
}

function reportCycle(c: AnalysedCycle): ReportCycle {
  const charge: ReportCharge | null = c.charge ? { ...c.charge, cc: c.charge.cc ?? { mAh: 0, Wh: 0, duration_s: 0, current_A: 0 } } : null;
  return { ...c, charge };
}

export function assembleReport(core: AnalyzerCore, read: ReadSummaryInput | null, limits: CellLimits): Report {
  const steps = core.steps;
  const sum = (f: (s: AnalysedStep) => number): number => steps.reduce((a, s) => a + f(s), 0);
  const charged_mAh = sum((s) => s.charged_mAh);
  const discharged_mAh = sum((s) => s.discharged_mAh);
  const charged_Wh = sum((s) => s.charged_Wh);
  const discharged_Wh = sum((s) => s.discharged_Wh);
  const readFindings = read?.findings ?? [];
  const findings: Finding[] = [...readFindings, ...core.gaps.findings(readFindings), ...core.safety, ...cvNotTerminated(core.cycles)];
  if (core.skipped > 0 && !readFindings.some((f) => f.kind === "skipped-rows")) {
    findings.push({
      kind: "skipped-rows",
      severity: "warning",
      time_s: 0,
      value: core.skipped,
      limit: null,
      unit: "rows",
      message: `${core.skipped} rows had no usable time, voltage or current and were left out.`,
      caution: "",
    });
  }
  findings.sort((a, b) => a.time_s - b.time_s);
  const temp = core.temperature;
  return {
    status: "ok",
    detected: detected(read),
    totals: {
      charged_mAh,
      charged_Wh,
      discharged_mAh,
      discharged_Wh,
      ...overallEfficiencies(core.cycles),
      mean_discharge_voltage_V: discharged_mAh > 0 ? (discharged_Wh * 1000) / discharged_mAh : null,
      max_temperature_C: temp ? temp.max_C : null,
      min_temperature_C: temp ? temp.min_C : null,
      temperature_rise_C: temp ? temp.max_C - temp.start_C : null,
      duration_s: core.duration_s,
      samples: core.samples,
      typical_interval_s: orNull(core.typicalInterval_s),
      logging_gaps: core.gaps.count,
      uncounted_gap_s: core.gaps.uncounted_s,
    },
    cycles: core.cycles.map(reportCycle),
    per_cycle_discharge_mAh: core.cycles.map((c) => (c.discharge ? c.discharge.mAh : null)),
    steps,
    findings,
    dcir: [...core.resistance.iec, ...core.resistance.edges],
    dcir_step_edges_total: core.resistance.edgeCount,
    noise: { current_sigma_A: core.thresholds.sigmaI, voltage_sigma_V: core.thresholds.sigmaV, rest_threshold_A: core.thresholds.restCurrent },
    limits_used: limits,
    read: read ? { rows: read.rows, bytes: read.bytes, parser: read.path } : null,
  };
}
