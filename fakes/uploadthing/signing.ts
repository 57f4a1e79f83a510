import { createHmac, timingSafeEqual } from "node:crypto";

/** Same scheme as `@uploadthing/shared` (`signPayload` / `verifySignature`). */
const SIGNATURE_PREFIX = "hmac-sha256=";

export function signPayload(payload: string, apiKey: string): string {
  return SIGNATURE_PREFIX + createHmac("sha256", apiKey).update(payload, "utf8").digest("hex");
}

export function verifyPayloadSignature(payload: string, signature: string | null | undefined, apiKey: string): boolean {
  if (!signature || !signature.startsWith(SIGNATURE_PREFIX)) return false;
  const expected = Buffer.from(signPayload(payload, apiKey));
  const given = Buffer.from(signature);
  return given.length === expected.length && timingSafeEqual(given, expected);
}

export type UrlParamValue = string | number | null | undefined;

/**
 * Builds a URL signed exactly as the SDK's `generateSignedURL` does: values are URL-encoded once
 * before `searchParams` encodes them again, and the HMAC covers the whole URL before `&signature=`.
 */
export function signUrl(
  url: string,
  apiKey: string,
  ttlSeconds: number,
  data: Record<string, UrlParamValue> = {},
  now = Date.now(),
): string {
  const parsed = new URL(url);
  parsed.searchParams.append("expires", String(now + ttlSeconds * 1000));
  for (const [name, value] of Object.entries(data)) {
    if (value === null || value === undefined) continue;
    parsed.searchParams.append(name, encodeURIComponent(String(value)));
  }
  parsed.searchParams.append("signature", signPayload(parsed.toString(), apiKey));
  return parsed.href;
}

export type SignedUrlCheck =
  | { ok: true; param(name: string): string | undefined }
  | { ok: false; status: 400 | 403; error: string };

/**
 * Checks a signed request target (`/path?query` as sent). The signature covers the URL the SDK
 * built, so it is tried against each origin the caller could have used (advertised URL, Host header).
 */
export function checkSignedUrl(target: string, origins: readonly string[], apiKey: string, now = Date.now()): SignedUrlCheck {
  const params = new URL(target, "http://placeholder.invalid").searchParams;
  const signature = params.get("signature");
  const cut = target.lastIndexOf("&signature=");
  if (!signature || cut < 0) return { ok: false, status: 403, error: "The URL is not signed" };
  const expiresText = params.get("expires");
  const expires = Number(expiresText);
  if (!expiresText || !Number.isFinite(expires)) return { ok: false, status: 400, error: "The signed URL has no valid expires parameter" };
  const signed = target.slice(0, cut);
  if (!origins.some((origin) => verifyPayloadSignature(origin + signed, signature, apiKey))) {
    return { ok: false, status: 403, error: "The URL signature is invalid" };
  }
  // Checked after the signature so that an edited expiry reads as tampering, not as expiry.
  if (expires < now) return { ok: false, status: 403, error: "The signed URL has expired" };
  return {
    ok: true,
    param(name) {
      const value = params.get(name);
      if (value === null) return undefined;
      try {
        return decodeURIComponent(value);
      } catch {
        return value;
      }
    },
  };
}
