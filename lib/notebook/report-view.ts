/**
 * The stored report (lib/analysis/report.ts, kept whole as JSON) read back for the run page.
 * JSON turned NaN and infinities into null, so every number here may be null; fields the page
 * does not use are ignored, and fields a newer engine adds do not break the page.
 */
import { z } from "zod";
import { stepKinds } from "@/lib/analysis/types";

const num = z
  .number()
  .nullable()
  .optional()
  .transform((v) => v ?? null);
const text = z
  .string()
  .nullable()
  .optional()
  .transform((v) => v ?? null);

const totals = z.object({
  charged_mAh: num,
  charged_Wh: num,
  discharged_mAh: num,
  discharged_Wh: num,
  coulombic_efficiency: num,
  energy_efficiency: num,
  mean_discharge_voltage_V: num,
  max_temperature_C: num,
  min_temperature_C: num,
  temperature_rise_C: num,
  duration_s: num,
  samples: num,
  typical_interval_s: num,
  logging_gaps: num,
  uncounted_gap_s: num,
});

const step = z.object({
  step: z.number().int(),
  kind: z.enum(stepKinds),
  cycle: num,
  start_s: num,
  end_s: num,
  duration_s: num,
  first_line: num,
  last_line: num,
  charged_mAh: num,
  discharged_mAh: num,
  charged_Wh: num,
  discharged_Wh: num,
  start_voltage_V: num,
  end_voltage_V: num,
  mean_voltage_V: num,
  mean_current_A: num,
  end_current_A: num,
});

const charge = z.object({
  duration_s: num,
  mAh: num,
  Wh: num,
  cc: z.object({ mAh: num, duration_s: num, current_A: num }).nullable().optional().transform((v) => v ?? null),
  cv: z
    .object({
      mAh: num,
      duration_s: num,
      voltage_V: num,
      final_current_A: num,
      final_current_C: num,
      final_current_label: text,
      ended_by: text,
      termination_current_A: num,
    })
    .nullable()
    .optional()
    .transform((v) => v ?? null),
  transition: z
    .object({ time_s: num, voltage_V: num, capacity_mAh: num, method: text })
    .nullable()
    .optional()
    .transform((v) => v ?? null),
  cc_share: num,
});

const discharge = z.object({ duration_s: num, mAh: num, Wh: num, mean_voltage_V: num, current_A: num });

const cycle = z.object({
  cycle: z.number().int(),
  start_s: num,
  end_s: num,
  charged_mAh: num,
  discharged_mAh: num,
  charged_Wh: num,
  discharged_Wh: num,
  coulombic_efficiency: num,
  energy_efficiency: num,
  charge: charge.nullable().optional().transform((v) => v ?? null),
  discharge: discharge.nullable().optional().transform((v) => v ?? null),
});

const dcir = z.object({
  method: z.string(),
  time_s: num,
  resistance_mOhm: num,
  i1_A: num,
  i2_A: num,
  u1_V: num,
  u2_V: num,
  u1_time_s: num,
  u2_time_s: num,
  line: num,
  delay_s: num,
});

const report = z.object({
  totals,
  steps: z.array(step),
  cycles: z.array(cycle),
  dcir: z.array(dcir).optional().transform((v) => v ?? []),
  dcir_step_edges_total: num,
  limits_used: z.object({ ratedCapacity_mAh: num }).optional().transform((v) => v ?? { ratedCapacity_mAh: null }),
  read: z
    .object({ rows: num, bytes: num, parser: text })
    .nullable()
    .optional()
    .transform((v) => v ?? null),
});

export type ReportView = z.output<typeof report>;
export type StepView = z.output<typeof step>;
export type CycleView = z.output<typeof cycle>;
export type DcirView = z.output<typeof dcir>;

/** The report as the page reads it, or null when it is not in a shape the page understands. */
export function reportView(stored: unknown): ReportView | null {
  const parsed = report.safeParse(stored);
  return parsed.success ? parsed.data : null;
}
