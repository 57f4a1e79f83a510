/**
 * Turns the engine's output (the CLI report and the plot series) into the rows the database
 * keeps. The report is stored whole; steps, cycles, findings and key numbers are copied out so
 * pages can query them without reading JSON. Parsing is loose on purpose: the engine may add
 * fields, and only the ones named here are relied on.
 */
import { z } from "zod";

const num = z.number().nullable();
const optNum = num.optional().transform((v) => v ?? null);

const transitionShape = z.object({ time_s: num, voltage_V: num, capacity_mAh: num }).loose();

const cycleShape = z
  .object({
    cycle: z.number().int(),
    charge: z.object({ mAh: num, transition: transitionShape.nullable().optional() }).loose().nullable(),
    discharge: z.object({ mAh: num }).loose().nullable(),
    coulombic_efficiency: num,
  })
  .loose();

const stepShape = z
  .object({
    step: z.number().int(),
    kind: z.string(),
    cycle: z.number().int().nullable().optional(),
    start_s: z.number(),
    end_s: z.number(),
    charged_mAh: optNum,
    discharged_mAh: optNum,
    start_voltage_V: optNum,
    end_voltage_V: optNum,
    mean_current_A: optNum,
  })
  .loose();

const findingShape = z
  .object({
    kind: z.string(),
    severity: z.string(),
    time_s: z.number(),
    end_s: optNum,
    line: z.number().int().nullable().optional(),
    value: optNum,
    limit: optNum,
    unit: z.string().nullable().optional(),
    message: z.string(),
    caution: z.string().optional(),
  })
  .loose();

const reportShape = z
  .object({
    detected: z.unknown(),
    totals: z.object({ charged_mAh: num, discharged_mAh: num, coulombic_efficiency: num }).loose(),
    cycles: z.array(cycleShape),
    steps: z.array(stepShape),
    findings: z.array(findingShape),
  })
  .loose();

export interface StepRow {
  step: number;
  cycle: number | null;
  kind: string;
  startS: number;
  endS: number;
  chargedMah: number | null;
  dischargedMah: number | null;
  startVoltageV: number | null;
  endVoltageV: number | null;
  meanCurrentA: number | null;
  detail: unknown;
}

/** Charge in and out, their ratio and the CC→CV switch: per cycle, and for a whole run. */
export interface ChargeBalance {
  chargedMah: number | null;
  dischargedMah: number | null;
  coulombicEfficiency: number | null;
  switchTimeS: number | null;
  switchVoltageV: number | null;
  switchCapacityMah: number | null;
}

export interface CycleRow extends ChargeBalance {
  cycle: number;
  detail: unknown;
}

export interface FindingRow {
  kind: string;
  severity: string;
  timeS: number;
  endS: number | null;
  line: number | null;
  value: number | null;
  limitValue: number | null;
  unit: string | null;
  message: string;
  caution: string;
}

export interface KeyNumbers extends ChargeBalance {
  findingsCount: number;
  safetyFindingsCount: number;
}

export interface AnalysisRows {
  /** The report as JSON can hold it (non-finite numbers become null). */
  report: Record<string, unknown>;
  detected: unknown;
  keyNumbers: KeyNumbers;
  steps: StepRow[];
  cycles: CycleRow[];
  findings: FindingRow[];
  series: { trace: string; data: unknown }[];
}

export class ReportNotUnderstood extends Error {
  constructor(detail: string) {
    super(`The analysis engine's report is not in the expected shape: ${detail}`);
    this.name = "ReportNotUnderstood";
  }
}

/** JSON round trip: what jsonb will hold, so the stored report and the parsed rows agree. */
function jsonSafe(value: unknown): unknown {
  return JSON.parse(JSON.stringify(value ?? null)) as unknown;
}

/** A safety finding carries a caution; data-quality findings (gaps, dropped rows) do not. */
export function isSafetyFinding(finding: { caution?: string | null }): boolean {
  return Boolean(finding.caution && finding.caution.trim() !== "");
}

/** One stored row per trace: the series' own top-level keys name the traces; absent ones (null) are left out. */
function seriesRows(series: unknown): { trace: string; data: unknown }[] {
  const safe = jsonSafe(series);
  if (!safe || typeof safe !== "object" || Array.isArray(safe)) throw new ReportNotUnderstood("the plot series is not an object of traces");
  return Object.entries(safe as Record<string, unknown>).flatMap(([trace, data]) => (data === null ? [] : [{ trace, data }]));
}

export function analysisRows(report: unknown, series: unknown): AnalysisRows {
  const safe = jsonSafe(report);
  const parsed = reportShape.safeParse(safe);
  if (!parsed.success) throw new ReportNotUnderstood(z.prettifyError(parsed.error));
  const r = parsed.data;
  const rawSteps = (safe as { steps: unknown[] }).steps;
  const rawCycles = (safe as { cycles: unknown[] }).cycles;
  const switchCycle = r.cycles.find((c) => c.charge?.transition);
  const transition = switchCycle?.charge?.transition ?? null;
  const findings: FindingRow[] = r.findings.map((f) => ({
    kind: f.kind,
    severity: f.severity,
    timeS: f.time_s,
    endS: f.end_s,
    line: f.line ?? null,
    value: f.value,
    limitValue: f.limit,
    unit: f.unit ?? null,
    message: f.message,
    caution: f.caution ?? "",
  }));
  return {
    report: safe as Record<string, unknown>,
    detected: r.detected ?? null,
    keyNumbers: {
      chargedMah: r.totals.charged_mAh,
      dischargedMah: r.totals.discharged_mAh,
      coulombicEfficiency: r.totals.coulombic_efficiency,
      switchTimeS: transition?.time_s ?? null,
      switchVoltageV: transition?.voltage_V ?? null,
      switchCapacityMah: transition?.capacity_mAh ?? null,
      findingsCount: findings.length,
      safetyFindingsCount: findings.filter(isSafetyFinding).length,
    },
    steps: r.steps.map((s, i) => ({
      step: s.step,
      cycle: s.cycle ?? null,
      kind: s.kind,
      startS: s.start_s,
      endS: s.end_s,
      chargedMah: s.charged_mAh,
      dischargedMah: s.discharged_mAh,
      startVoltageV: s.start_voltage_V,
      endVoltageV: s.end_voltage_V,
      meanCurrentA: s.mean_current_A,
      detail: rawSteps[i],
    })),
    cycles: r.cycles.map((c, i) => ({
      cycle: c.cycle,
      chargedMah: c.charge?.mAh ?? null,
      dischargedMah: c.discharge?.mAh ?? null,
      coulombicEfficiency: c.coulombic_efficiency,
      switchTimeS: c.charge?.transition?.time_s ?? null,
      switchVoltageV: c.charge?.transition?.voltage_V ?? null,
      switchCapacityMah: c.charge?.transition?.capacity_mAh ?? null,
      detail: rawCycles[i],
    })),
    findings,
    series: seriesRows(series),
  };
}
