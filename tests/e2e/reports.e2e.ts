/**
 * Reports and the auditor's walk, in a real browser against the built server: an engineer retires
 * the demo's fading cell PB-0019 through its flag; a QA lead then follows the cell on the audit
 * trail from its registration to its retirement, opens its printable report (figures, fade chart,
 * findings, the flag's steps, the safety cautions, the same history), signs a decision on lot
 * P1000-2611-B and finds the signature on the lot report. Both reports are printed to PDF by
 * Chromium with the print stylesheet. A technician's copy of the report leaves out the history.
 */
import fs from "node:fs";
import path from "node:path";
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { appAndBrowser } from "./support/app-and-browser";
import { artifactsDir, freshPage, screenshot, signIn } from "./support/browser";

const session = appAndBrowser();

const retireReason = "Capacity under 80 % of rated: taken out of service (report walk)";

/** Prints the page as Chromium would to paper and keeps the PDF beside the screenshots. */
async function printToPdf(page: Page, name: string): Promise<Buffer> {
  await page.emulateMedia({ media: "print" });
  const pdf = await page.pdf({ format: "A4", printBackground: true });
  fs.mkdirSync(artifactsDir, { recursive: true });
  fs.writeFileSync(path.join(artifactsDir, `${name}.pdf`), pdf);
  await page.emulateMedia({ media: "screen" });
  return pdf;
}

/** Pages in a PDF, counted from its page objects (ISO 32000-1 §7.7.3.3: each page is a /Type /Page dictionary). */
function pdfPageCount(pdf: Buffer): number {
  return (pdf.toString("latin1").match(/\/Type\s*\/Page[^s]/g) ?? []).length;
}

describe("an auditor follows a cell from receipt to retirement", () => {
  it("lets the engineer retire PB-0019 through its open flag", async () => {
    const page = await freshPage(session.browser);
    await signIn(page, session.app.url, "engineer@larkspur.test", "demo-engineer-1");
    // The demo's flag is raised when the seeded analysis finishes; wait for it.
    const flagLink = page.getByRole("table", { name: "Flags of cell PB-0019" }).getByRole("link").first();
    for (let attempt = 0; attempt < 30; attempt++) {
      await page.goto(`${session.app.url}/cells/PB-0019/health`);
      if (await flagLink.count()) break;
      await page.waitForTimeout(2000);
    }
    await flagLink.click();
    await page.waitForURL(/\/flags\/[0-9a-f-]{36}$/);
    await page.getByLabel("Retire the cell").check();
    await page.getByLabel("Reason").fill(retireReason);
    await page.getByRole("button", { name: "Retire the cell" }).click();
    await page.getByRole("table", { name: "Every step of this flag" }).getByText(retireReason).waitFor();
    await page.context().close();
  });

  it("finds the cell's whole life on the audit trail by its serial", async () => {
    const page = await freshPage(session.browser);
    await signIn(page, session.app.url, "qa@larkspur.test", "demo-qa-lead-1");
    await page.goto(`${session.app.url}/audit`);
    await page.getByLabel("Search record").fill("PB-0019");
    await page.waitForURL(/[?&]q=PB-0019/);
    const table = page.getByRole("table", { name: /Audit trail/ });
    // The table follows the search as it is typed: wait until every row is one of this cell's.
    await page.waitForFunction(() => {
      const rows = [...document.querySelectorAll("table tbody tr")];
      return rows.length > 0 && rows.every((row) => (row.textContent ?? "").includes("PB-0019"));
    });
    await table.getByText(retireReason).first().waitFor();
    const text = await table.innerText();
    // Registration (seeded import or create), the cycle-life upload, its analysis, the rule's flag, the retirement.
    expect(text).toMatch(/\b(import|create)\b/);
    expect(text).toContain("PB-0019-cycle-life.tsv");
    expect(text).toContain("upload");
    expect(text).toContain("analyse");
    expect(text).toMatch(/\bopen\b/);
    expect(text).toContain("transition");
    expect(text).toContain("retired");
    await screenshot(page, "report-audit-walk");
    await page.context().close();
  });

  it("prints the cell report with figures, chart, findings, flag steps, cautions and the history", async () => {
    const page = await freshPage(session.browser);
    await signIn(page, session.app.url, "qa@larkspur.test", "demo-qa-lead-1");
    await page.goto(`${session.app.url}/cells/PB-0019`);
    await page.getByRole("link", { name: "Printable cell report" }).click();
    await page.waitForURL(`${session.app.url}/cells/PB-0019/report`);
    const report = page.getByRole("article", { name: "Cell report" });
    await report.getByRole("heading", { name: "Record history" }).waitFor();
    const text = await report.innerText();
    expect(text).toMatch(/Status\s+retired/i);
    expect(text).toContain("Lithium cells can vent, burn or explode");
    expect(text).toMatch(/Fade per 100 cycles\s+\d/i);
    expect(text).toContain(retireReason);
    expect(text).toMatch(/Prepared \d{4}-\d{2}-\d{2} \d{2}:\d{2} UTC for Ravi Okonkwo \(QA lead\)/);
    // The fade chart is drawn (uPlot's canvas inside its figure).
    expect(await report.locator("figure canvas").count()).toBeGreaterThan(0);
    // Every run's SHA-256, to check the raw files against.
    expect(await report.getByText(/^[0-9a-f]{64}$/).count()).toBeGreaterThan(0);
    // The history runs from the registration (first row) to the retirement (last row).
    const rows = report.getByRole("table", { name: /Every recorded change to cell PB-0019/ }).getByRole("row");
    expect(await rows.nth(1).innerText()).toMatch(/\b(import|create)\b/);
    expect(await rows.last().innerText()).toMatch(/retired/);
    await screenshot(page, "report-cell");

    await page.emulateMedia({ media: "print" });
    expect(await page.locator("header.no-print").isVisible()).toBe(false);
    expect(await page.getByRole("button", { name: "Print or save as PDF" }).isVisible()).toBe(false);
    const pdf = await printToPdf(page, "report-cell-PB-0019");
    expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    expect(pdfPageCount(pdf)).toBeGreaterThanOrEqual(2);
    await page.context().close();
  });

  it("shows the QA lead's signed lot decision on the lot report", async () => {
    const page = await freshPage(session.browser);
    await signIn(page, session.app.url, "qa@larkspur.test", "demo-qa-lead-1");
    await page.goto(`${session.app.url}/batches`);
    await page.getByRole("link", { name: "P1000-2611-B" }).click();
    await page.getByRole("link", { name: "Quality figures and decision" }).click();
    await page.getByLabel("Put the lot on hold").check();
    await page.getByLabel("Reason").fill("PB-0015 is a low outlier; hold until its retest");
    await page.getByLabel("Your password").fill("demo-qa-lead-1");
    await page.getByRole("button", { name: "Sign and record the decision" }).click();
    await page.getByText(/Recorded: the lot is on hold\./).waitFor();
    await page.getByRole("link", { name: "Printable lot report" }).click();
    const report = page.getByRole("article", { name: "Lot report" });
    await report.getByRole("heading", { name: "Decisions and signatures" }).waitFor();
    const text = await report.innerText();
    expect(text).toMatch(/Signed by Ravi Okonkwo, \d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}Z, meaning: reviewed/);
    expect(text).toContain("PB-0015 is a low outlier; hold until its retest");
    expect(text).toContain("Lithium cells can vent, burn or explode");
    expect(text).toMatch(/Cp|Cpk|Cpl/);
    expect(text).toContain("PB-0015");
    expect(await report.locator("figure canvas").count()).toBeGreaterThan(0);
    await screenshot(page, "report-lot");
    const pdf = await printToPdf(page, "report-lot-P1000-2611-B");
    expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    await page.context().close();
  });

  it("leaves the record history out of a technician's copy", async () => {
    const page = await freshPage(session.browser);
    await signIn(page, session.app.url, "tech@larkspur.test", "demo-technician-1");
    await page.goto(`${session.app.url}/cells/PB-0019/report`);
    const report = page.getByRole("article", { name: "Cell report" });
    await report.getByRole("heading", { name: "Flags and their signatures" }).waitFor();
    expect(await report.getByRole("heading", { name: "Record history" }).count()).toBe(0);
    await page.context().close();
  });
});
