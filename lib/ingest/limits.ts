import type { CellLimits } from "@/lib/analysis/types";

/** The registry's cell-type limits in the analysis engine's terms. */
export interface CellTypeLimitsRow {
  ratedCapacityMah: number;
  nominalVoltageV: number;
  chargeVoltageLimitV: number;
  dischargeCutoffV: number;
  maxChargeC: number;
  maxDischargeC: number;
  terminationC: number;
  chargeTempMinC: number;
  chargeTempMaxC: number;
  dischargeTempMinC: number;
  dischargeTempMaxC: number;
}

export function cellLimitsOf(t: CellTypeLimitsRow): CellLimits {
  return {
    ratedCapacity_mAh: t.ratedCapacityMah,
    nominalVoltage_V: t.nominalVoltageV,
    chargeVoltageLimit_V: t.chargeVoltageLimitV,
    dischargeCutoff_V: t.dischargeCutoffV,
    maxChargeC: t.maxChargeC,
    maxDischargeC: t.maxDischargeC,
    terminationC: t.terminationC,
    chargeTemp_C: { min: t.chargeTempMinC, max: t.chargeTempMaxC },
    dischargeTemp_C: { min: t.dischargeTempMinC, max: t.dischargeTempMaxC },
  };
}
