import { describe, expect, it } from "vitest";
import { demoUsers } from "@/lib/db/seed-users";
import { appAndBrowser } from "./support/app-and-browser";
import { freshPage, screenshot, signIn } from "./support/browser";

const session = appAndBrowser();

// Written out by hand: what each role should find in the main navigation.
const expectedNav: Record<string, string[]> = {
  technician: ["Start", "Upload", "Cells", "Batches", "Flags", "Cell types"],
  "qa-lead": ["Start", "Cells", "Batches", "Flags", "Cell types", "Audit trail"],
  engineer: ["Start", "Upload", "Cells", "Batches", "Flags", "Cell types"],
  admin: ["Start", "Upload", "Cells", "Batches", "Flags", "Cell types", "Audit trail", "People"],
};

describe("signing in as each demo role", () => {
  it("sends a signed-out visitor to the sign-in page", async () => {
    const page = await freshPage(session.browser);
    await page.goto(`${session.app.url}/batches`);
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await screenshot(page, "sign-in");
    await page.context().close();
  });

  for (const user of demoUsers) {
    it(`shows the ${user.role} navigation`, async () => {
      const page = await freshPage(session.browser);
      await signIn(page, session.app.url, user.email, user.password);
      await page.goto(`${session.app.url}/batches`);
      const nav = page.getByRole("navigation", { name: "Main" });
      expect(await nav.getByRole("link").allInnerTexts()).toEqual(expectedNav[user.role]);
      expect(await page.getByTestId("role-badge").innerText()).toMatch(new RegExp(user.role === "qa-lead" ? "QA lead" : user.role, "i"));
      await page.getByRole("link", { name: "P1000-2611-B" }).waitFor();
      await screenshot(page, `batches-${user.role}`);
      await page.goto(`${session.app.url}/sign-out`);
      await page.getByRole("button", { name: "Sign out now" }).click();
      await page.waitForURL(`${session.app.url}/sign-in`);
      await page.context().close();
    });
  }
});
