import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { demoUsers } from "@/lib/db/seed-users";
import { startAppServer, type AppServer } from "./support/app-server";
import { freshPage, openBrowser, screenshot, signIn } from "./support/browser";

let app: AppServer;
let browser: Browser;

beforeAll(async () => {
  app = await startAppServer();
  browser = await openBrowser();
});
afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

// Written out by hand: what each role should find in the main navigation.
const expectedNav: Record<string, string[]> = {
  technician: ["Start", "Upload", "Cells", "Batches", "Flags", "Cell types"],
  "qa-lead": ["Start", "Cells", "Batches", "Flags", "Cell types", "Audit trail"],
  engineer: ["Start", "Upload", "Cells", "Batches", "Flags", "Cell types"],
  admin: ["Start", "Upload", "Cells", "Batches", "Flags", "Cell types", "Audit trail", "People"],
};

describe("signing in as each demo role", () => {
  it("sends a signed-out visitor to the sign-in page", async () => {
    const page = await freshPage(browser);
    await page.goto(`${app.url}/batches`);
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await screenshot(page, "sign-in");
    await page.context().close();
  });

  for (const user of demoUsers) {
    it(`shows the ${user.role} navigation`, async () => {
      const page = await freshPage(browser);
      await signIn(page, app.url, user.email, user.password);
      await page.goto(`${app.url}/batches`);
      const nav = page.getByRole("navigation", { name: "Main" });
      expect(await nav.getByRole("link").allInnerTexts()).toEqual(expectedNav[user.role]);
      expect(await page.getByTestId("role-badge").innerText()).toMatch(new RegExp(user.role === "qa-lead" ? "QA lead" : user.role, "i"));
      await page.getByRole("link", { name: "P1000-2611-B" }).waitFor();
      await screenshot(page, `batches-${user.role}`);
      await page.goto(`${app.url}/sign-out`);
      await page.getByRole("button", { name: "Sign out now" }).click();
      await page.waitForURL(`${app.url}/sign-in`);
      await page.context().close();
    });
  }
});
