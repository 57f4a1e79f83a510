/** Small readers for the app's pages in browser tests: demo users, facts, panels and signature lines. */
import type { Locator, Page } from "playwright-core";
import type { Role } from "@/lib/auth/roles";
import { demoUsers } from "@/lib/db/seed-users";

export function demoUser(role: Role): (typeof demoUsers)[number] {
  const user = demoUsers.find((u) => u.role === role);
  if (!user) throw new Error(`no demo ${role}`);
  return user;
}

/** The value beside a label in a record's facts (a `<dt>`/`<dd>` pair). */
export async function factValue(scope: Page | Locator, label: string): Promise<string> {
  return scope.locator("dt", { hasText: label }).first().locator("xpath=following-sibling::dd[1]").innerText();
}

/** What stands right of the page title: state and decision badges, page actions. */
export function titleActions(page: Page): Locator {
  return page.locator("main h1").first().locator("xpath=../following-sibling::div[1]");
}

/** A panel of the page by its heading. */
export function panel(page: Page, title: string): Locator {
  return page.locator("section", { has: page.getByRole("heading", { name: title, exact: true }) }).last();
}

/** The number in a text such as "1085.2 mAh" or "1.21"; NaN when there is none. */
export function numberIn(text: string): number {
  const match = /[-−]?\d+(?:\.\d+)?/.exec(text.replace(/\u00a0/g, " "));
  return match ? Number(match[0].replace("−", "-")) : Number.NaN;
}

export interface ShownSignature {
  signerName: string;
  signedAt: Date;
  meaning: string;
}

/**
 * The signature a page shows, read from its own words ("Signed by NAME, ISO time, meaning: M"), or
 * null when the text holds none. Parsed here, not with the app's formatter, so a changed format fails.
 */
export function signatureIn(text: string): ShownSignature | null {
  const match = /Signed by (.+?), (\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}Z), meaning: (\w+)/.exec(text);
  if (!match) return null;
  return { signerName: match[1] ?? "", signedAt: new Date(match[2] ?? ""), meaning: match[3] ?? "" };
}

/** Whether `at`, shown to the second, falls between two instants taken around the signing. */
export function shownWithin(at: Date, before: number, after: number): boolean {
  return at.getTime() >= Math.floor(before / 1000) * 1000 && at.getTime() <= after;
}
