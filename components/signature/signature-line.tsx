import { signatureManifest } from "@/lib/auth/signature-manifest";
import type { SignatureMeaning } from "@/lib/validations/signature";

/** A record's signature in one line, or nothing for an unsigned record. */
export function SignatureLine({ signature, className = "block text-xs" }: { signature: { signerName: string; signedAt: Date; meaning: SignatureMeaning } | null; className?: string }) {
  if (!signature) return null;
  return <span className={className}>{signatureManifest(signature)}</span>;
}
