/**
 * The policy text itself. Directive names and source keywords follow the W3C Content Security
 * Policy Level 3 specification; a browser test (tests/e2e/hardening.e2e.ts) checks the app runs
 * under it and that injected handlers and eval are refused.
 */
import { describe, expect, it } from "vitest";
import nextConfig from "@/next.config";
import { apiContentSecurityPolicy, newNonce, originOf, pageContentSecurityPolicy, staticSecurityHeaders } from "@/lib/http/security-headers";

function directives(policy: string): Map<string, string[]> {
  return new Map(policy.split(";").map((d) => d.trim().split(/\s+/)).map(([name = "", ...sources]) => [name, sources]));
}

describe("pageContentSecurityPolicy", () => {
  const policy = directives(pageContentSecurityPolicy({ nonce: "abc123==", dev: false, connectOrigins: ["http://localhost:4001"] }));

  it("runs only scripts with this response's nonce, and no inline or evaluated code", () => {
    expect(policy.get("script-src")).toEqual(["'self'", "'nonce-abc123=='", "'strict-dynamic'"]);
    expect(policy.get("default-src")).toEqual(["'self'"]);
    expect(policy.get("object-src")).toEqual(["'none'"]);
    expect(policy.get("base-uri")).toEqual(["'self'"]);
  });

  it("forbids framing and sends requests only to the app and the upload service", () => {
    expect(policy.get("frame-ancestors")).toEqual(["'none'"]);
    expect(policy.get("form-action")).toEqual(["'self'"]);
    expect(policy.get("connect-src")).toEqual(["'self'", "http://localhost:4001"]);
  });

  it("allows eval only on the development server", () => {
    const dev = directives(pageContentSecurityPolicy({ nonce: "n", dev: true, connectOrigins: [] }));
    expect(dev.get("script-src")).toContain("'unsafe-eval'");
    expect(policy.get("script-src")).not.toContain("'unsafe-eval'");
    expect(dev.get("connect-src")).toEqual(["'self'"]);
  });
});

describe("helpers", () => {
  it("reduces a service URL to its origin and rejects anything else", () => {
    expect(originOf("http://127.0.0.1:4001/some/path?x=1")).toBe("http://127.0.0.1:4001");
    expect(originOf("https://files.example.org")).toBe("https://files.example.org");
    expect(originOf("javascript:alert(1)")).toBeNull();
    expect(originOf("not a url")).toBeNull();
    expect(originOf(undefined)).toBeNull();
  });

  it("makes a fresh 128-bit nonce each time", () => {
    const a = newNonce();
    expect(Buffer.from(a, "base64")).toHaveLength(16);
    expect(newNonce()).not.toBe(a);
  });
});

describe("next.config.ts", () => {
  it("sends the fixed headers on every response and a deny-all policy on API answers", async () => {
    const rules = (await nextConfig.headers?.()) ?? [];
    const all = rules.find((r) => r.source === "/:path*")?.headers ?? [];
    expect(Object.fromEntries(all.map((h) => [h.key, h.value]))).toMatchObject({
      "X-Content-Type-Options": "nosniff",
      "X-Frame-Options": "DENY",
      "Referrer-Policy": "strict-origin-when-cross-origin",
    });
    expect(all).toEqual(staticSecurityHeaders);
    expect(rules.find((r) => r.source === "/api/:path*")?.headers).toEqual([{ key: "Content-Security-Policy", value: apiContentSecurityPolicy }]);
    expect(nextConfig.experimental?.authInterrupts).toBe(true);
  });
});
