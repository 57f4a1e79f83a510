/**
 * The hardening seen from a real browser against the built server: the content security policy
 * lets the app itself work (sign-in, tables loaded by client script, client navigation) while
 * refusing injected inline script; the other security headers are present; a role without a
 * page's capability gets a real 403.
 */
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { defaultApiRateLimits } from "@/lib/auth/api-rate-limit";
import type { Role } from "@/lib/auth/roles";
import { appAndBrowser } from "./support/app-and-browser";
import { freshPage, signIn } from "./support/browser";
import { demoUser } from "./support/forms";

const session = appAndBrowser();


/** Console messages that report a blocked resource or script: the app must cause none. */
function watchViolations(page: Page): string[] {
  const seen: string[] = [];
  page.on("console", (message) => {
    if (/content security policy|refused to/i.test(message.text())) seen.push(message.text());
  });
  page.on("pageerror", (error) => seen.push(`page error: ${error.message}`));
  return seen;
}

describe("content security policy and headers", () => {
  it("sends the policy and the other headers on pages, and a deny-all policy on API answers", async () => {
    const response = await fetch(`${session.app.url}/sign-in`);
    const policy = response.headers.get("content-security-policy") ?? "";
    expect(policy).toMatch(/script-src 'self' 'nonce-[A-Za-z0-9+/=]{16,}' 'strict-dynamic'/);
    expect(policy).not.toMatch(/script-src[^;]*'unsafe-inline'/);
    expect(policy).not.toMatch(/'unsafe-eval'/);
    expect(policy).toContain("frame-ancestors 'none'");
    expect(policy).toContain("object-src 'none'");
    // The upload page sends files straight to the local upload service on its own port.
    expect(policy).toMatch(/connect-src 'self' http:\/\/(localhost|127\.0\.0\.1):\d+/);
    const second = (await fetch(`${session.app.url}/sign-in`)).headers.get("content-security-policy");
    expect(second).not.toBe(policy);

    for (const res of [response, await fetch(`${session.app.url}/api/cells`)]) {
      expect(res.headers.get("x-content-type-options")).toBe("nosniff");
      expect(res.headers.get("x-frame-options")).toBe("DENY");
      expect(res.headers.get("referrer-policy")).toBe("strict-origin-when-cross-origin");
      expect(res.headers.get("permissions-policy")).toContain("camera=()");
    }
    expect((await fetch(`${session.app.url}/api/cells`)).headers.get("content-security-policy")).toBe("default-src 'none'; frame-ancestors 'none'");
  });

  it("lets the app run under the policy: sign in, load a table, sort it, follow a link", async () => {
    const page = await freshPage(session.browser);
    const violations = watchViolations(page);
    const user = demoUser("qa-lead");
    await signIn(page, session.app.url, user.email, user.password);
    await page.goto(`${session.app.url}/batches`);
    await page.getByRole("link", { name: "P1000-2611-B" }).waitFor();
    await page.getByRole("button", { name: /Lot code/ }).click();
    await page.waitForURL(/sort=lotCode/);
    await page.getByRole("link", { name: "Audit trail" }).click();
    await page.waitForURL(`${session.app.url}/audit`);
    await page.getByRole("table", { name: /Audit trail/ }).getByRole("row").nth(1).waitFor();
    // The demo's stored runs are the newest events; the table must show rows rendered under the policy.
    expect(await page.getByRole("table", { name: /Audit trail/ }).getByRole("row").count()).toBeGreaterThan(1);
    // Each page loaded whole, not only through client navigation: every response must carry its nonce.
    for (const path of ["/", "/cells", "/cell-types", "/audit", "/sign-out"]) {
      // "load" rather than "networkidle": link prefetches on long lists (the audit trail's run
      // links) can keep the network busy for a while on a loaded machine.
      await page.goto(`${session.app.url}${path}`, { waitUntil: "load" });
      await page.locator("main h1").first().waitFor();
    }
    await page.getByRole("button", { name: "Sign out now" }).click();
    await page.waitForURL(`${session.app.url}/sign-in`);
    expect(violations).toEqual([]);
    await page.context().close();
  });

  it("blocks script that markup injected into a page would run: inline handlers and eval", async () => {
    const page = await freshPage(session.browser);
    const violations = watchViolations(page);
    const user = demoUser("technician");
    await signIn(page, session.app.url, user.email, user.password);
    await page.goto(`${session.app.url}/cells`);
    const outcome = await page.evaluate(async () => {
      const w = window as unknown as { injected?: boolean };
      // What an HTML injection would carry: an element with an inline event handler.
      const img = document.createElement("img");
      img.setAttribute("onerror", "window.injected = true");
      img.src = "data:image/png;base64,AAAA";
      document.body.append(img);
      await new Promise((r) => setTimeout(r, 300));
      let evaluated = false;
      try {
        evaluated = (0, eval)("true") === true;
      } catch {
        evaluated = false;
      }
      return { handler: w.injected === true, evaluated };
    });
    expect(outcome).toEqual({ handler: false, evaluated: false });
    expect(violations.some((v) => /content security policy/i.test(v))).toBe(true);
    await page.context().close();
  });
});

describe("API token limits on the running server", () => {
  it("answers 401 to bad tokens until the address's budget is spent, then 429 with Retry-After", async () => {
    const statuses: number[] = [];
    let limited: Response | undefined;
    // No X-Forwarded-For: the server counts by the loopback address it sees.
    for (let i = 0; i < defaultApiRateLimits.badTokensPerWindow + 1; i++) {
      const response = await fetch(`${session.app.url}/api/v1/runs/00000000-0000-4000-8000-000000000000`, { headers: { authorization: `Bearer kp_${"x".repeat(43)}` } });
      statuses.push(response.status);
      limited = response;
    }
    expect(statuses.slice(0, -1).every((s) => s === 401), statuses.join(",")).toBe(true);
    expect(limited?.status).toBe(429);
    expect(Number(limited?.headers.get("retry-after"))).toBeGreaterThan(60);
    expect(((await limited?.json()) as { error: string }).error).toMatch(/Too many requests with a bad API token came from this address/);
  });
});

describe("pages a role may not use", () => {
  it("answers with a 403 status and the not-allowed page inside the app shell", async () => {
    // Written out by hand from the capability map: pages each role may not open.
    const refused: [Role, string, string[]][] = [
      ["technician", "Technician", ["/audit", "/admin/users"]],
      ["qa-lead", "QA lead", ["/upload", "/admin/users"]],
    ];
    for (const [role, badge, paths] of refused) {
      const page = await freshPage(session.browser);
      const user = demoUser(role);
      await signIn(page, session.app.url, user.email, user.password);
      for (const path of paths) {
        const response = await page.goto(`${session.app.url}${path}`);
        expect(response?.status(), `${role} ${path}`).toBe(403);
        await page.getByRole("heading", { name: "This page is not open to your role" }).waitFor();
        // One app shell around the refusal, with the person's own navigation.
        expect(await page.getByTestId("role-badge").allTextContents()).toEqual([badge]);
        expect(await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Cells" }).count()).toBe(1);
      }
      await page.context().close();
    }
  });
});
