import type { SignatureMeaning } from "@/lib/validations/signature";

/**
 * A signature as every record and report shows it: the signer's printed name, the date and time
 * (ISO 8601, UTC, to the second) and the meaning, as 21 CFR 11.50(a) asks. Safe to import anywhere.
 */
export function signatureManifest(s: { signerName: string; signedAt: Date | string; meaning: SignatureMeaning }): string {
  const at = new Date(s.signedAt).toISOString().replace(/\.\d{3}Z$/, "Z");
  return `Signed by ${s.signerName}, ${at}, meaning: ${s.meaning}`;
}
