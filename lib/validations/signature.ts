import { z } from "zod";

/**
 * What a signer says their signature means (21 CFR 11.50(a)(3): the meaning of the signature is
 * part of the signed record). Safe to import anywhere.
 */
export const signatureMeanings = ["approved", "rejected", "reviewed"] as const;
export type SignatureMeaning = (typeof signatureMeanings)[number];

export const signatureMeaningLabels: Record<SignatureMeaning, string> = {
  approved: "Approved",
  rejected: "Rejected",
  reviewed: "Reviewed",
};

export const signatureMeaningField = z.enum(signatureMeanings, { error: "Choose what your signature means" });

/**
 * The signer's password, typed again at the moment of signing. Only checked against the stored
 * hash: it is never stored, logged or sent back (zod's messages here do not quote the input).
 */
export const signaturePasswordField = z
  .string({ error: "Enter your password to sign" })
  .min(1, "Enter your password to sign")
  .max(128, "A password has at most 128 characters");

/** The two fields every signed form posts. */
export const signatureFields = {
  password: signaturePasswordField,
  meaning: signatureMeaningField,
};
