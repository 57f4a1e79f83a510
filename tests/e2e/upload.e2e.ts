import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { startAppServer, type AppServer } from "./support/app-server";
import { freshPage, openBrowser, screenshot, signIn } from "./support/browser";

let app: AppServer;
let browser: Browser;
let page: Page;
const demoLog = (name: string) => path.join(process.cwd(), "public", "demo-logs", name);

beforeAll(async () => {
  app = await startAppServer();
  browser = await openBrowser();
  page = await freshPage(browser);
  await signIn(page, app.url, "tech@larkspur.test", "demo-technician-1");
});
afterAll(async () => {
  await browser?.close();
  await app?.stop();
});

async function chooseLog(serial: string, file: string) {
  await page.goto(`${app.url}/upload`);
  await page.getByLabel("Cell serial").fill(serial);
  await page.getByTestId("log-file-input").setInputFiles(demoLog(file));
}

describe("a technician uploads a demo bench log", () => {
  it("shows the detected columns, uploads, analyses and reports the key numbers", async () => {
    await chooseLog("PB-0007", "PB-0007-capacity-check.csv");
    const item = page.getByTestId("upload-item");
    await item.getByText("ready").waitFor();
    // The German-style export: semicolons, decimal commas, milliamperes.
    await expect(item.innerText()).resolves.toContain('Detected: ";"-separated, decimal ","');
    // Column 3 (index 2) is "Strom [mA]": current in milliamperes.
    expect(await item.locator('select[id$="-current"]').inputValue()).toBe("2");
    await item.getByLabel("Save these columns as").fill("Demo logger, German export");
    await item.getByRole("button", { name: "Save column map" }).click();
    await item.getByText('Saved as "Demo logger, German export".').waitFor();
    await screenshot(page, "upload-preview");
    await item.getByRole("button", { name: "Upload and analyse", exact: true }).click();
    const done = page.locator('[data-testid="run-progress"][data-status="complete"]');
    await done.waitFor({ timeout: 90_000 });
    const text = await done.innerText();
    // The simulated cell's charge was 0.5C to 4.2 V: the switch must sit at the 4.2 V limit
    // (common practice, no source), within the logger's resolution.
    expect(text).toMatch(/switch to constant voltage at 4\.(19|20)\d V/);
    expect(text).toMatch(/Charged \d{4} mAh/);
    await screenshot(page, "upload-complete");
  });

  it("refuses the same file for the same cell and points to the stored run", async () => {
    await chooseLog("PB-0007", "PB-0007-capacity-check.csv");
    const item = page.getByTestId("upload-item");
    await item.getByText("ready").waitFor();
    // The map saved in the first test is offered for the next log.
    await item.getByLabel("Use a saved column map").selectOption({ label: "Demo logger, German export (Tove Lindqvist)" });
    await item.getByText("ready").waitFor();
    await item.getByRole("button", { name: "Upload and analyse", exact: true }).click();
    await item.getByRole("link", { name: "Open the run already stored" }).waitFor({ timeout: 60_000 });
    await screenshot(page, "upload-duplicate");
  });

  it("shows a malformed log's located error before anything is uploaded", async () => {
    await chooseLog("PB-0008", "broken-clock-jump.csv");
    const item = page.getByTestId("upload-item");
    const error = item.getByRole("alert");
    await error.waitFor();
    expect(await error.innerText()).toMatch(/broken-clock-jump\.csv \(line 201, column 2\): Time goes backwards on line 201/);
    expect(await item.getByRole("button", { name: "Upload and analyse", exact: true }).isDisabled()).toBe(true);
    await screenshot(page, "upload-located-error");
  });
});
