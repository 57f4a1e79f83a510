/**
 * Response headers that keep the browser from doing what the app never needs: running injected
 * script, being framed (clickjacking), guessing content types, leaking full URLs in the Referer,
 * or using device features. Pure functions, so next.config.ts, proxy.ts and tests share them.
 */
export interface HeaderPair {
  key: string;
  value: string;
}

/** The origin (scheme://host:port) of a URL, or null when it is not a valid http(s) URL. */
export function originOf(url: string | undefined): string | null {
  if (!url) return null;
  try {
    const parsed = new URL(url);
    return parsed.protocol === "http:" || parsed.protocol === "https:" ? parsed.origin : null;
  } catch {
    return null;
  }
}

export interface PagePolicyOptions {
  /** Fresh per response; Next puts it on its own scripts when it finds it in the request's CSP. */
  nonce: string;
  /** The development server evaluates code for its error overlay and fast refresh. */
  dev: boolean;
  /** Extra origins the browser may send requests to (the upload service receiving the files). */
  connectOrigins: readonly string[];
}

/**
 * The content security policy for pages. Scripts: only those carrying this response's nonce,
 * and what they load ('strict-dynamic'); 'self' stays for browsers without CSP level 3. Styles
 * allow inline because React style attributes and the plot library set element styles; CSS
 * cannot run script. No `upgrade-insecure-requests`: a lab server may well be plain http.
 */
export function pageContentSecurityPolicy({ nonce, dev, connectOrigins }: PagePolicyOptions): string {
  const directives: Record<string, string[]> = {
    "default-src": ["'self'"],
    "script-src": ["'self'", `'nonce-${nonce}'`, "'strict-dynamic'", ...(dev ? ["'unsafe-eval'"] : [])],
    "style-src": ["'self'", "'unsafe-inline'"],
    "img-src": ["'self'", "data:", "blob:"],
    "font-src": ["'self'"],
    "connect-src": ["'self'", ...connectOrigins],
    "worker-src": ["'self'", "blob:"],
    "object-src": ["'none'"],
    "base-uri": ["'self'"],
    "form-action": ["'self'"],
    "frame-ancestors": ["'none'"],
    "frame-src": ["'none'"],
  };
  return Object.entries(directives)
    .map(([name, sources]) => `${name} ${sources.join(" ")}`)
    .join("; ");
}

/** JSON and CSV answers are never documents: nothing in them may load or run anything. */
export const apiContentSecurityPolicy = "default-src 'none'; frame-ancestors 'none'";

/** Headers for every response, set once in next.config.ts. */
export const staticSecurityHeaders: HeaderPair[] = [
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
  {
    key: "Permissions-Policy",
    value: "camera=(), microphone=(), geolocation=(), payment=(), usb=(), serial=(), hid=()",
  },
  { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
];

/** A nonce of 128 random bits, base64 as CSP expects. Web Crypto, so it runs wherever the proxy runs. */
export function newNonce(): string {
  const bytes = crypto.getRandomValues(new Uint8Array(16));
  return btoa(String.fromCharCode(...bytes));
}
