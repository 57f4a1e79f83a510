import type { SignatureMeaning } from "@/lib/validations/signature";

/** A person whose password was just checked: who signs, by the name shown at that moment. */
export interface Signer {
  signerId: string;
  signerName: string;
}

/** A verified signer and what they say their signature means; the time is the record's own. */
export interface Signature extends Signer {
  meaning: SignatureMeaning;
}

/** The signature as a record shows it (21 CFR 11.50: printed name, date and time, meaning). */
export interface SignatureView {
  signerName: string;
  signedAt: Date;
  meaning: SignatureMeaning;
}

/** The signature columns of a row signed at `at`. */
export function signatureValues(signature: Signature, at: Date) {
  return { signedBy: signature.signerId, signedByName: signature.signerName, signedAt: at, signatureMeaning: signature.meaning };
}

/** The signature for the audit event of the same change; there is never a password to leave out, it never gets this far. */
export function signatureAudit(signature: Signature, at: Date) {
  return { signerId: signature.signerId, signerName: signature.signerName, signedAt: at.toISOString(), meaning: signature.meaning };
}

/** A row's signature, or null for an unsigned row (the database keeps the columns whole or empty). */
export function signatureOf(row: { signedByName: string | null; signedAt: Date | null; signatureMeaning: SignatureMeaning | null }): SignatureView | null {
  if (row.signedByName === null || row.signedAt === null || row.signatureMeaning === null) return null;
  return { signerName: row.signedByName, signedAt: row.signedAt, meaning: row.signatureMeaning };
}
