/**
 * Starting values for a new cell type, per chemistry. Every value says where it comes from so a
 * user knows which ones to replace from the cell maker's data sheet, which always wins.
 *   "trade"  — common practice, no source
 *   "source" — seen in public specifications or data sheets (see the notes in DEVELOPERS.md)
 *   "memory" — from memory, not verified: check before relying on it
 */
export type Provenance = "trade" | "source" | "memory";

export interface PresetValue {
  value: number;
  provenance: Provenance;
  note?: string;
}

export interface ChemistryPreset {
  chemistry: "LCO" | "NMC" | "LiPo" | "LFP" | "NiMH";
  label: string;
  nominalVoltageV: PresetValue;
  chargeVoltageLimitV: PresetValue;
  dischargeCutoffV: PresetValue;
  maxChargeC: PresetValue;
  maxDischargeC: PresetValue;
  terminationC: PresetValue;
  chargeTempMinC: PresetValue;
  chargeTempMaxC: PresetValue;
  dischargeTempMinC: PresetValue;
  dischargeTempMaxC: PresetValue;
  remark?: string;
}

const lithiumCobaltLike = {
  nominalVoltageV: { value: 3.7, provenance: "trade", note: "3.6–3.7 V nominal" },
  chargeVoltageLimitV: { value: 4.2, provenance: "trade", note: "4.35 V for high-voltage variants (from memory)" },
  dischargeCutoffV: { value: 3.0, provenance: "trade", note: "data sheets range 2.5–3.0 V" },
  maxChargeC: { value: 1, provenance: "trade" },
  maxDischargeC: { value: 2, provenance: "memory", note: "varies widely by cell design" },
  terminationC: { value: 0.05, provenance: "source", note: "C/20; 0.01C, 0.02C and C/10 are also used" },
  chargeTempMinC: { value: 0, provenance: "source", note: "public polymer cell specification" },
  chargeTempMaxC: { value: 45, provenance: "source", note: "public polymer cell specification" },
  dischargeTempMinC: { value: -20, provenance: "memory" },
  dischargeTempMaxC: { value: 60, provenance: "memory" },
} satisfies Partial<ChemistryPreset>;

export const chemistryPresets: readonly ChemistryPreset[] = [
  { chemistry: "LiPo", label: "Lithium polymer", ...lithiumCobaltLike },
  { chemistry: "LCO", label: "Lithium cobalt oxide", ...lithiumCobaltLike },
  { chemistry: "NMC", label: "Lithium nickel manganese cobalt oxide", ...lithiumCobaltLike },
  {
    chemistry: "LFP",
    label: "Lithium iron phosphate",
    nominalVoltageV: { value: 3.2, provenance: "trade" },
    chargeVoltageLimitV: { value: 3.65, provenance: "source", note: "LFP data sheets" },
    dischargeCutoffV: { value: 2.5, provenance: "source", note: "data sheets range 2.0–2.5 V" },
    maxChargeC: { value: 1, provenance: "trade" },
    maxDischargeC: { value: 3, provenance: "memory" },
    terminationC: { value: 0.05, provenance: "source" },
    chargeTempMinC: { value: 0, provenance: "memory" },
    chargeTempMaxC: { value: 45, provenance: "memory" },
    dischargeTempMinC: { value: -20, provenance: "memory" },
    dischargeTempMaxC: { value: 60, provenance: "memory" },
  },
  {
    chemistry: "NiMH",
    label: "Nickel–metal hydride",
    nominalVoltageV: { value: 1.2, provenance: "trade" },
    chargeVoltageLimitV: { value: 1.5, provenance: "memory", note: "NiMH is not charged CC-CV; this is a ceiling for the over-voltage check" },
    dischargeCutoffV: { value: 1.0, provenance: "memory" },
    maxChargeC: { value: 1, provenance: "memory" },
    maxDischargeC: { value: 1, provenance: "memory" },
    terminationC: { value: 0.05, provenance: "memory", note: "unused: NiMH charge ends on −ΔV or temperature slope" },
    chargeTempMinC: { value: 0, provenance: "memory" },
    chargeTempMaxC: { value: 45, provenance: "memory" },
    dischargeTempMinC: { value: -20, provenance: "memory" },
    dischargeTempMaxC: { value: 50, provenance: "memory" },
    remark: "NiMH cells are charged at constant current with −ΔV or temperature-slope termination, not CC-CV (from memory).",
  },
];

export const provenanceLabels: Record<Provenance, string> = {
  trade: "common practice",
  source: "public specifications",
  memory: "from memory — verify",
};
