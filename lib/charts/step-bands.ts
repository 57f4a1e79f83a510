/**
 * Shading of the time chart by step: one band per step, from its start (the engine's step edge)
 * to the next step's start, the last one to the end of the log. Colours follow three groups,
 * charge, discharge and rest (the palette's tokens), and the legend names the kinds in plain words.
 */
import type { StepKind } from "@/lib/analysis/types";
import type { StepEdge } from "./plot-series";

export type StepGroup = "charge" | "discharge" | "rest" | "other";

export function stepGroup(kind: StepKind): StepGroup {
  switch (kind) {
    case "constant-current charge":
    case "constant-voltage charge":
      return "charge";
    case "constant-current discharge":
      return "discharge";
    case "rest":
      return "rest";
    default:
      return "other";
  }
}

/** The kinds in plain words, as the legend and the step table write them. */
export const stepKindWords: Record<StepKind, string> = {
  "constant-current charge": "constant-current charge",
  "constant-voltage charge": "constant-voltage charge",
  "constant-current discharge": "constant-current discharge",
  rest: "rest (no current)",
  other: "other (pulses or a changing load)",
};

/** Legend order: the way a charge/discharge test reads. */
const legendOrder: StepKind[] = ["constant-current charge", "constant-voltage charge", "rest", "constant-current discharge", "other"];

export interface StepBand {
  step: number;
  kind: StepKind;
  group: StepGroup;
  /** Start and end, seconds from the first row. */
  from: number;
  to: number;
}

/**
 * Bands from the step edges (any order; sorted here) up to `endS`. Edges past `endS` and bands of
 * no width are left out.
 */
export function stepBands(edges: readonly StepEdge[], endS: number): StepBand[] {
  const sorted = [...edges].filter((e) => Number.isFinite(e.time_s)).sort((a, b) => a.time_s - b.time_s || a.step - b.step);
  const bands: StepBand[] = [];
  sorted.forEach((edge, i) => {
    const next = sorted[i + 1];
    const to = Math.min(next ? next.time_s : endS, endS);
    if (to > edge.time_s) bands.push({ step: edge.step, kind: edge.kind, group: stepGroup(edge.kind), from: edge.time_s, to });
  });
  return bands;
}

/** The kinds present in a run, in legend order. */
export function legendKinds(bands: readonly StepBand[]): StepKind[] {
  const present = new Set(bands.map((b) => b.kind));
  return legendOrder.filter((k) => present.has(k));
}

/** The palette token that colours each group; "other" borrows the accent so it is not mistaken for rest. */
export const groupToken: Record<StepGroup, "charge" | "discharge" | "rest" | "copper"> = {
  charge: "charge",
  discharge: "discharge",
  rest: "rest",
  other: "copper",
};

/** Kinds drawn hatched as well as shaded: constant voltage, so the two charge phases differ without colour. */
export const hatchedKinds: ReadonlySet<StepKind> = new Set<StepKind>(["constant-voltage charge"]);

/**
 * Shading strength per kind: constant voltage lighter than constant current, so the two charge
 * phases differ in grey print too. The legend's swatches use the same strengths (bg-charge/20 …).
 */
export const bandAlpha: Record<StepKind, number> = {
  "constant-current charge": 0.2,
  "constant-voltage charge": 0.1,
  "constant-current discharge": 0.2,
  rest: 0.15,
  other: 0.1,
};
