/**
 * Kneepoint's words for flags, shared by the schema, the server and the pages. Safe to import
 * anywhere (no server code).
 */

export const flagRuleKinds = ["soh-below", "fade-rate-above", "fade-outlier", "ce-below", "dcir-rise", "safety-danger"] as const;
export type FlagRuleKind = (typeof flagRuleKinds)[number];

/** A flag's states in plain words. The last two close a flag. */
export const flagStates = ["open", "acknowledged", "retest requested", "cleared", "cell retired"] as const;
export type FlagState = (typeof flagStates)[number];

export const closedFlagStates: readonly FlagState[] = ["cleared", "cell retired"];
export const unclosedFlagStates: readonly FlagState[] = ["open", "acknowledged", "retest requested"];

export function isClosed(state: FlagState): boolean {
  return closedFlagStates.includes(state);
}

/**
 * The steps a flag may take. Closed states are final: new evidence opens a new flag, so the
 * history of the closed one is never rewritten.
 */
export const flagSteps: Record<FlagState, readonly FlagState[]> = {
  open: ["acknowledged", "retest requested", "cleared", "cell retired"],
  acknowledged: ["retest requested", "cleared", "cell retired"],
  "retest requested": ["acknowledged", "cleared", "cell retired"],
  cleared: [],
  "cell retired": [],
};

export function canStep(from: FlagState, to: FlagState): boolean {
  return flagSteps[from].includes(to);
}

/** Clearing says the evidence was looked at and found harmless: the person signs it, re-entering their password. */
export const signedFlagStates: readonly FlagState[] = ["cleared"];

export function stepNeedsSignature(to: FlagState): boolean {
  return signedFlagStates.includes(to);
}

/** What a person picks in the transition form: the verb for each target state. */
export const stepLabels: Record<FlagState, string> = {
  open: "Open",
  acknowledged: "Acknowledge",
  "retest requested": "Request a retest",
  cleared: "Clear",
  "cell retired": "Retire the cell",
};

/** "By hand" marks a flag an engineer raised with a reason, not a rule. */
export const byHandKind = "by hand";

export interface RuleKindInfo {
  /** A heading for the rule. */
  title: string;
  /** What the bound means, for the form. */
  boundLabel: string;
  unit: "%" | "α" | null;
  /** The bound new rules start with; null means "the end-of-life threshold setting" (SOH only) or no bound. */
  defaultBound: number | null;
  boundRange: { min: number; max: number } | null;
  /** Whether a blank bound is allowed (SOH: use the setting; safety: none). */
  boundOptional: boolean;
  explanation: string;
}

export const ruleKindInfo: Record<FlagRuleKind, RuleKindInfo> = {
  "soh-below": {
    title: "State of health below a bound",
    boundLabel: "State of health below (% of rated capacity)",
    unit: "%",
    defaultBound: null,
    boundRange: { min: 1, max: 120 },
    boundOptional: true,
    explanation:
      "The cell's latest capacity measurement divided by its type's rated capacity. Leave the bound blank to use the lab's end-of-life threshold.",
  },
  "fade-rate-above": {
    title: "Fading faster than a bound",
    boundLabel: "Capacity lost per 100 cycles above (% of rated)",
    unit: "%",
    defaultBound: 10,
    boundRange: { min: 0.1, max: 100 },
    boundOptional: false,
    explanation:
      "The cell's fade rate: the least-squares slope of capacity on cycle over all its capacity points, as % of rated capacity per 100 cycles (needs at least 3 points, and a slope whose 95 % interval lies wholly above zero). At 10 % a cell would lose 20 % of its rating, the usual end of life, in about 200 cycles.",
  },
  "fade-outlier": {
    title: "Fade rate unusual within its batch",
    boundLabel: "Grubbs test level α",
    unit: "α",
    defaultBound: 0.05,
    boundRange: { min: 0.001, max: 0.2 },
    boundOptional: false,
    explanation:
      "Each cell's fade rate (capacity lost per 100 cycles, by least squares) is compared with the other cells of its batch by the iterated two-sided Grubbs test (NIST/SEMATECH e-Handbook §1.3.5.17). A cell found to fade faster than the rest is flagged. Needs at least 3 cells with a fade rate; the handbook advises against the test for 6 or fewer.",
  },
  "ce-below": {
    title: "Coulombic efficiency below a bound",
    boundLabel: "Coulombic efficiency below (%)",
    unit: "%",
    defaultBound: 98,
    boundRange: { min: 50, max: 100 },
    boundOptional: false,
    explanation:
      "The lowest per-cycle coulombic efficiency (discharge ÷ charge of the same cycle) in the cell's most recent run that has one. Formation runs are left out: their first cycles lose charge by design.",
  },
  "dcir-rise": {
    title: "DC resistance risen above a bound",
    boundLabel: "Rise over the first measurement above (%)",
    unit: "%",
    defaultBound: 50,
    boundRange: { min: 1, max: 1000 },
    boundOptional: false,
    explanation:
      "The median DC resistance of the cell's latest run that measured one, against its first run measured by the same method (IEC 61960-3 two-current method preferred over step edges).",
  },
  "safety-danger": {
    title: "Dangerous safety finding",
    boundLabel: "No bound",
    unit: null,
    defaultBound: null,
    boundRange: null,
    boundOptional: true,
    explanation: "Any finding of severity danger in a run's latest analysis (over-voltage, over-temperature and the like).",
  },
};

/** The rule in one line, with its bound, e.g. "Coulombic efficiency below 98 %". */
export function describeRule(kind: FlagRuleKind, bound: number | null, eolThresholdPct: number): string {
  switch (kind) {
    case "soh-below":
      return bound === null
        ? `State of health below the end-of-life threshold (${formatNumber(eolThresholdPct)} %)`
        : `State of health below ${formatNumber(bound)} %`;
    case "fade-rate-above":
      return `Fading faster than ${formatNumber(bound ?? 0)} % of rated per 100 cycles`;
    case "fade-outlier":
      return `Fade rate unusual within its batch (Grubbs, α = ${formatNumber(bound ?? 0.05)})`;
    case "ce-below":
      return `Coulombic efficiency below ${formatNumber(bound ?? 0)} %`;
    case "dcir-rise":
      return `DC resistance up more than ${formatNumber(bound ?? 0)} % on the first measurement`;
    case "safety-danger":
      return "Dangerous safety finding";
  }
}

export function formatNumber(n: number): string {
  return Number.isInteger(n) ? String(n) : String(Number(n.toPrecision(4)));
}

/** The flag's measured value against its bound in words, or null when it has no value. */
export function valueAgainstBound(f: { value: number | null; bound: number | null; unit: string | null }): string | null {
  if (f.value === null) return null;
  const unit = f.unit ? ` ${f.unit}` : "";
  const value = `${formatNumber(f.value)}${unit}`;
  return f.bound === null ? value : `${value} against a bound of ${formatNumber(f.bound)}${unit}`;
}

/** A kind's heading: the rule kind's title, or "Raised by hand". */
export function kindTitle(kind: string): string {
  return kind === byHandKind ? "Raised by hand" : (ruleKindInfo[kind as FlagRuleKind]?.title ?? kind);
}
