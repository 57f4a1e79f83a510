/**
 * The notebook pages end to end: a technician uploads a demo log on the Upload page, the run page
 * shows its chart, switch point and numbers, the cell page lists the run, the batch page shows
 * the cell, and a note is amended with the original kept. The expected capacity is reckoned by
 * this test from the file itself, independently of the engine.
 */
import fs from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { startAppServer, type AppServer } from "./support/app-server";
import { freshPage, openBrowser, screenshot, signIn } from "./support/browser";
import { factValue } from "./support/forms";

let app: AppServer;
let browser: Browser;
let page: Page;
let runUrl = "";
const logName = "PB-0007-capacity-check.csv";
const logPath = path.join(process.cwd(), "public", "demo-logs", logName);

/**
 * Charge delivered by the log's last discharge, by the trapezoidal rule over the file's own rows
 * (semicolons, decimal commas, current in mA): Q = Σ ½(I_k + I_k−1)(t_k − t_k−1), mAh = mA·s / 3600.
 */
function lastDischargeMah(text: string): number {
  const rows = text
    .split(/\r?\n/)
    .filter((line) => /^\d/.test(line))
    .map((line) => line.split(";").map((f) => Number(f.replace(",", "."))));
  let lastCharge = 0;
  rows.forEach((r, k) => {
    if ((r[2] ?? 0) > 20) lastCharge = k;
  });
  let q = 0;
  for (let k = lastCharge + 1; k < rows.length; k++) {
    const [t0 = 0, , i0 = 0] = rows[k - 1] ?? [];
    const [t1 = 0, , i1 = 0] = rows[k] ?? [];
    const step = ((i0 + i1) / 2) * (t1 - t0);
    if (step < 0) q -= step;
  }
  return q / 3600;
}

const expectedMah = lastDischargeMah(fs.readFileSync(logPath, "utf8"));


const mAhIn = (text: string): number => Number(/([\d.]+)\s*mAh/.exec(text.replace(/\u00a0/g, " "))?.[1] ?? Number.NaN);

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

describe("the notebook pages for an uploaded demo log", () => {
  it("uploads the log and opens its run page with the chart, the switch point and the numbers", async () => {
    await page.goto(`${app.url}/upload`);
    await page.getByLabel("Cell serial").fill("PB-0007");
    // The browser's local time; the server shows it in the same machine's zone.
    await page.getByLabel("Test ended at").fill("2026-11-30T16:45");
    await page.getByTestId("log-file-input").setInputFiles(logPath);
    const item = page.getByTestId("upload-item");
    await item.getByText("ready").waitFor();
    await item.getByRole("button", { name: "Upload and analyse", exact: true }).click();
    await page.locator('[data-testid="run-progress"][data-status="complete"]').waitFor({ timeout: 90_000 });
    await page.getByRole("link", { name: "Open the run" }).click();
    await page.waitForURL(/\/runs\/[0-9a-f-]{36}$/);
    runUrl = page.url();
    expect(await factValue(page, "Test ended")).toBe("2026-11-30 16:45");

    const chart = page.getByRole("figure", { name: "Voltage and current against time" });
    await chart.locator("canvas").first().waitFor();
    // The log charges at constant current to 4.2 V, the polymer cell's limit (common practice, no source).
    expect(await chart.innerText()).toMatch(/CC→CV switch at \d+:\d\d:\d\d \(4\.(19|20)\d\u00a0V\)/);
    expect(await factValue(page, "CC→CV switch")).toMatch(/4\.(19|20)\d\u00a0V/);
    const delivered = mAhIn(await factValue(page, "Delivered capacity"));
    // Engine against the test's own trapezoid count of the same rows, to 0.5 %.
    expect(Math.abs(delivered - expectedMah) / expectedMah).toBeLessThan(0.005);
    // SOH against the demo type's rated 1000 mAh: 100 · delivered / rated.
    expect(await factValue(page, "SOH against rated")).toContain(((100 * delivered) / 1000).toFixed(1));
    await page.getByRole("figure", { name: /Voltage against capacity/ }).locator("canvas").first().waitFor();
    await page.getByRole("figure", { name: /Incremental capacity/ }).locator("canvas").first().waitFor();
    await expect(page.getByRole("table", { name: "Cycles of this run" }).innerText()).resolves.toMatch(/4\.(19|20)\d\u00a0V/);
    await screenshot(page, "notebook-run");
  });

  it("keeps an amended note visible, struck through, with its amendment", async () => {
    await page.getByLabel("New note").fill("Fixture 2, lid open during the rest.");
    await page.getByRole("button", { name: "Add note" }).click();
    await page.getByText(/Note \d+ saved\./).waitFor();
    await page.getByRole("button", { name: "Amend this note" }).first().click();
    await page.getByLabel("Amendment").fill("Correction: fixture 3.");
    await page.getByRole("button", { name: "Add amendment" }).click();
    const original = page.locator("li", { hasText: "Fixture 2, lid open during the rest." });
    await original.getByText(/Amended by/).waitFor();
    expect(await original.locator("p.line-through").innerText()).toBe("Fixture 2, lid open during the rest.");
    await page.locator("li", { hasText: "Correction: fixture 3." }).getByText(/amends/).waitFor();
    // Reloaded from the server: both notes are stored.
    await page.reload();
    expect(await page.locator("li", { hasText: "Fixture 2, lid open during the rest." }).count()).toBe(1);
    expect(await page.locator("li", { hasText: "Correction: fixture 3." }).count()).toBe(1);
    await screenshot(page, "notebook-run-notes");
  });

  it("analyses the run again as a second version and shows either version", async () => {
    await page.goto(runUrl);
    const firstDelivered = mAhIn(await factValue(page, "Delivered capacity"));
    await page.getByRole("button", { name: "Analyse again" }).click();
    // The page follows the new analysis and reloads when it has finished; the picker appears with two versions.
    const picker = page.getByLabel("Analysis version");
    await picker.waitFor({ timeout: 90_000 });
    const options = await picker.locator("option").allInnerTexts();
    expect(options).toHaveLength(2);
    expect(options.some((o) => /^Version 2 \(latest\) · \d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC$/.test(o))).toBe(true);
    expect(options.some((o) => /^Version 1 · /.test(o))).toBe(true);
    await picker.selectOption("1");
    await page.waitForURL(/\?version=1$/);
    await page.getByText("You are looking at version 1; version 2 is the latest analysis of this file.").waitFor();
    // Same bytes, same engine, same limits: both versions deliver the same capacity.
    expect(mAhIn(await factValue(page, "Delivered capacity"))).toBe(firstDelivered);
    await screenshot(page, "notebook-run-version-1");
    await picker.selectOption("2");
    await page.waitForURL((url) => !url.search.includes("version"));
  });

  it("lists the run on the cell page with the same delivered capacity", async () => {
    await page.goto(`${app.url}/cells/PB-0007`);
    const runs = page.getByRole("table", { name: "Runs of cell PB-0007" });
    const row = runs.locator("tr", { has: page.locator(`a[href="${new URL(runUrl).pathname}"]`) });
    await row.waitFor();
    const delivered = mAhIn(await row.locator("td").nth(3).innerText());
    expect(Math.abs(delivered - expectedMah) / expectedMah).toBeLessThan(0.005);
    // The newest run stands for the cell in the summary.
    expect(mAhIn(await factValue(page, "Latest delivered capacity"))).toBe(delivered);
    await page.getByRole("figure", { name: /Voltage against delivered capacity/ }).locator("canvas").first().waitFor();
    await screenshot(page, "notebook-cell");
  });

  it("shows the cell in its batch with that capacity, and filters and sorts the table", async () => {
    await page.getByRole("link", { name: "P1000-2611-B" }).first().click();
    await page.waitForURL(/\/batches\/[0-9a-f-]{36}/);
    const table = page.getByRole("table", { name: /Cells of batch P1000-2611-B/ });
    const row = table.locator("tr", { has: page.getByRole("link", { name: "PB-0007", exact: true }) });
    await row.waitFor();
    expect(Math.abs(mAhIn(await row.innerText()) - expectedMah) / expectedMah).toBeLessThan(0.005);
    await page.getByLabel("Search serial").fill("PB-0007");
    await page.waitForURL(/q=PB-0007/);
    // The server filters: one row comes back.
    await page.waitForFunction(() => document.querySelectorAll("table tbody tr").length === 1);
    expect(await table.locator("tbody tr").first().innerText()).toContain("PB-0007");
    await page.getByLabel("Search serial").fill("");
    await page.waitForFunction(() => document.querySelectorAll("table tbody tr").length === 24);
    await table.getByRole("button", { name: /Latest delivered capacity/ }).click();
    await page.waitForURL(/sort=capacity/);
    await table.locator("thead th[aria-sort=ascending]", { hasText: "Latest delivered capacity" }).waitFor();
    // Sorted on the server, lowest first: the demo's fast-fading cell PB-0019 (tests/support/demo/scenario.ts) leads.
    await page.waitForFunction(() => document.querySelector("table tbody tr")?.textContent?.includes("PB-0019") ?? false);
    const capacities = (await table.locator("tbody tr td:nth-child(3)").allInnerTexts()).map(mAhIn);
    expect(capacities).toHaveLength(24);
    expect([...capacities].sort((a, b) => a - b)).toEqual(capacities);
    await page.getByRole("figure", { name: "Latest delivered capacity of the batch's cells" }).locator("canvas").first().waitFor();
    await screenshot(page, "notebook-batch");
  });
});
