import { z } from "zod";
import { byHandKind, flagRuleKinds, flagStates, ruleKindInfo, stepNeedsSignature } from "@/lib/flags/vocabulary";
import { identifierField, numberField, optionalTextField, pageQuery, textField } from "./fields";
import { signatureFields, signatureMeaningField, signaturePasswordField, type SignatureMeaning } from "./signature";

const blankToUndefined = (v: unknown) => (typeof v === "string" && v.trim() === "" ? undefined : v);
/** A checkbox posts "on" when ticked and nothing when not; clients may send a boolean. */
const checkbox = z.preprocess((v) => v === true || v === "on" || v === "true", z.boolean());
const reasonField = textField("Reason", 2000, 3);

export const flagListQuery = z.object({
  ...pageQuery,
  /** "unclosed" (the default) hides cleared flags and retired cells. */
  state: z.enum(["unclosed", "all", ...flagStates]).default("unclosed"),
  kind: z.enum([...flagRuleKinds, byHandKind]).optional(),
  batchId: z.uuid().optional(),
});
export type FlagListQuery = z.output<typeof flagListQuery>;

export const raiseFlagInput = z.object({
  cellSerial: identifierField("Cell serial"),
  reason: reasonField,
});
export type RaiseFlagInput = z.output<typeof raiseFlagInput>;

const transitionFlagFields = z.object({
  flagId: z.uuid({ error: "Choose a flag" }),
  to: z.enum(flagStates, { error: "Choose the next step" }),
  reason: reasonField,
  /** The state the person saw; a flag moved meanwhile is refused rather than stepped twice. */
  expectedState: z.enum(flagStates),
});
/** A step without its signature fields: what the database layer takes. */
export type TransitionFlagInput = z.output<typeof transitionFlagFields>;

/** The form posts the signature fields empty on steps that need none. */
export const transitionFlagInput = transitionFlagFields
  .extend({
    password: z.preprocess(blankToUndefined, signaturePasswordField.optional()),
    meaning: z.preprocess(blankToUndefined, signatureMeaningField.optional()),
  })
  .superRefine((v, ctx) => {
    if (!stepNeedsSignature(v.to)) return;
    if (v.password === undefined) ctx.addIssue({ code: "custom", path: ["password"], message: "Enter your password to sign the clearing" });
    if (v.meaning === undefined) ctx.addIssue({ code: "custom", path: ["meaning"], message: "Choose what your signature means" });
  });

const boundField = z.preprocess(blankToUndefined, numberField("Bound").optional());

/** Checks a bound against its rule kind's range; blank only where the kind allows it. */
function checkBound(kind: (typeof flagRuleKinds)[number], bound: number | undefined, ctx: z.RefinementCtx): void {
  const info = ruleKindInfo[kind];
  if (bound === undefined) {
    if (!info.boundOptional) ctx.addIssue({ code: "custom", path: ["bound"], message: `${info.boundLabel} is required` });
    return;
  }
  if (!info.boundRange) {
    ctx.addIssue({ code: "custom", path: ["bound"], message: "This rule takes no bound" });
    return;
  }
  const { min, max } = info.boundRange;
  if (bound < min || bound > max) ctx.addIssue({ code: "custom", path: ["bound"], message: `${info.boundLabel} must be between ${min} and ${max}` });
}

export const createRuleInput = z
  .object({
    kind: z.enum(flagRuleKinds, { error: "Choose what the rule checks" }),
    bound: boundField,
    enabled: checkbox,
    note: optionalTextField("Note", 500),
  })
  .superRefine((v, ctx) => checkBound(v.kind, v.bound, ctx));
export type CreateRuleInput = z.output<typeof createRuleInput>;

export const updateRuleInput = z
  .object({
    ruleId: z.uuid({ error: "Choose a rule" }),
    kind: z.enum(flagRuleKinds, { error: "Choose what the rule checks" }),
    bound: boundField,
    enabled: checkbox,
    note: optionalTextField("Note", 500),
  })
  .superRefine((v, ctx) => checkBound(v.kind, v.bound, ctx));
export type UpdateRuleInput = z.output<typeof updateRuleInput>;

export const labSettingsInput = z.object({
  eolThresholdPct: numberField("End-of-life threshold", { min: 1, max: 99 }),
  digestEnabled: checkbox,
  digestHour: z.preprocess(blankToUndefined, numberField("Digest hour", { min: 0, max: 23 }).refine(Number.isInteger, "Digest hour must be a whole hour")),
});
export type LabSettingsInput = z.output<typeof labSettingsInput>;

export const lotDecisions = ["accepted", "rejected", "on hold"] as const;

const lotDecisionFields = z.object({
  batchId: z.uuid({ error: "Choose a batch" }),
  disposition: z.enum(lotDecisions, { error: "Choose accept, reject or hold" }),
  reason: reasonField,
  expectedDisposition: z.enum(["pending", ...lotDecisions]),
});
/** A decision without its signature fields: what the database layer takes. */
export type LotDecisionInput = z.output<typeof lotDecisionFields>;

/** Meanings that would contradict the decision they sign. */
const contradictingMeaning: Record<(typeof lotDecisions)[number], SignatureMeaning | null> = {
  accepted: "rejected",
  rejected: "approved",
  "on hold": null,
};

/** Every lot decision is signed. */
export const lotDecisionInput = lotDecisionFields.extend(signatureFields).superRefine((v, ctx) => {
  if (contradictingMeaning[v.disposition] === v.meaning)
    ctx.addIssue({ code: "custom", path: ["meaning"], message: `A lot ${v.disposition} cannot be signed as ${v.meaning}` });
});

/** Matched-set settings on the quality page's query string; tolerances are vendor guidance, not a standard. */
export const matchQuery = z.object({
  setSize: z.coerce.number().int().min(2).max(50).default(4),
  capTol: z.coerce.number().min(0).max(20).default(2),
  dcirTol: z.preprocess(blankToUndefined, z.coerce.number().min(0).max(50).optional()),
  ignoreDcir: z.preprocess((v) => v === "on" || v === "1", z.boolean()),
});

/** Batches to compare, from repeated `batch` query parameters. */
export const compareQuery = z.object({
  batch: z.preprocess((v) => (v === undefined ? [] : Array.isArray(v) ? v : [v]), z.array(z.uuid()).max(8, "Compare at most 8 batches")),
});
