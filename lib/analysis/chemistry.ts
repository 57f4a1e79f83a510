/**
 * Default cell limits per chemistry, for when a run has no registered cell type.
 * Values are facts of the trade unless noted (domain notes, /work/shared/notes/domain.md):
 * - LCO / NMC / LiPo: charge limit 4.2 V, empty about 3.0 V, nominal 3.7 V (common practice, no source);
 * - LFP: charge limit 3.65 V (LFP data sheets, per the notes), cut-off 2.5 V (notes: 2.0–2.5 V), nominal 3.2 V;
 * - NiMH: nominal 1.2 V (common practice); cut-off 1.0 V (common practice, from memory). NiMH is
 *   not charged constant-current/constant-voltage, so no charge voltage limit or termination current is set.
 * Termination current C/20 (0.05C) is one of the values the notes list from public specs; the charge
 * temperature window 0–45 °C is the notes' public LiPo spec. Discharge temperature window and C-rate
 * limits are left unset: they vary too much between cells to guess.
 */
import type { CellLimits } from "./types";

export const chemistries = ["lco", "nmc", "lipo", "li-ion", "lfp", "nimh"] as const;
export type Chemistry = (typeof chemistries)[number];

const lithiumCobaltLike: CellLimits = {
  nominalVoltage_V: 3.7,
  chargeVoltageLimit_V: 4.2,
  dischargeCutoff_V: 3.0,
  terminationC: 0.05,
  chargeTemp_C: { min: 0, max: 45 },
};

export const chemistryDefaults: Record<Chemistry, CellLimits> = {
  lco: lithiumCobaltLike,
  nmc: lithiumCobaltLike,
  lipo: lithiumCobaltLike,
  "li-ion": lithiumCobaltLike,
  lfp: { nominalVoltage_V: 3.2, chargeVoltageLimit_V: 3.65, dischargeCutoff_V: 2.5, terminationC: 0.05, chargeTemp_C: { min: 0, max: 45 } },
  nimh: { nominalVoltage_V: 1.2, dischargeCutoff_V: 1.0 },
};

export function isChemistry(x: string): x is Chemistry {
  return (chemistries as readonly string[]).includes(x);
}
