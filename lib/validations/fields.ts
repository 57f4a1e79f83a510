import { z } from "zod";

/** Form text → trimmed string; empty becomes undefined so optional fields stay optional. */
function blankToUndefined(value: unknown): unknown {
  if (typeof value !== "string") return value;
  const trimmed = value.trim();
  return trimmed === "" ? undefined : trimmed;
}

/** A number typed by a person: accepts a decimal comma, rejects empty text and words. */
export function numberField(label: string, options: { min?: number; max?: number; gt?: number } = {}) {
  let schema = z.number({ error: (issue) => (issue.input === undefined ? `${label} is required` : `${label} must be a number`) });
  if (options.gt !== undefined) schema = schema.gt(options.gt, `${label} must be more than ${options.gt}`);
  if (options.min !== undefined) schema = schema.min(options.min, `${label} must be at least ${options.min}`);
  if (options.max !== undefined) schema = schema.max(options.max, `${label} must be at most ${options.max}`);
  return z.preprocess((value) => {
    const text = blankToUndefined(value);
    if (typeof text !== "string") return text;
    const n = Number(text.replace(",", "."));
    return Number.isFinite(n) ? n : text;
  }, schema.refine(Number.isFinite, `${label} must be a finite number`));
}

export function optionalNumberField(label: string, options: { min?: number; max?: number; gt?: number } = {}) {
  return z.preprocess(blankToUndefined, numberField(label, options).optional());
}

export function textField(label: string, max: number, min = 1) {
  return z.preprocess(
    blankToUndefined,
    z
      .string({ error: `${label} is required` })
      .min(min, `${label} is required`)
      .max(max, `${label} must be at most ${max} characters`),
  );
}

export function optionalTextField(label: string, max: number) {
  return z.preprocess((v) => (typeof v === "string" ? v.trim() : v), z.string().max(max, `${label} must be at most ${max} characters`).default(""));
}

/**
 * A cell serial or lot code: printable, no spaces at the ends, no control characters or markup
 * brackets, because serials end up in file names, URLs and labels.
 */
export function identifierField(label: string, max = 64) {
  return z.preprocess(
    blankToUndefined,
    z
      .string({ error: `${label} is required` })
      .min(1, `${label} is required`)
      .max(max, `${label} must be at most ${max} characters`)
      .regex(/^[A-Za-z0-9][A-Za-z0-9._\-/#+]*$/, `${label} may use letters, digits and . _ - / # + (starting with a letter or digit)`),
  );
}

export const isoDateField = (label: string) =>
  z.preprocess(blankToUndefined, z.iso.date({ error: `${label} must be a date (YYYY-MM-DD)` }));

export const pageQuery = {
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
  q: z.string().trim().max(100).optional(),
};
