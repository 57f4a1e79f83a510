/**
 * Each role's main flow in a real browser against the built server on the demo data: the
 * engineer steps the fading cell's flag through to a signed clearing, the QA lead reads lot
 * P1000-2611-B's figures and signs a decision, the administrator creates an account and changes
 * its role and finds that in the audit trail, and roles without those rights do not get the forms.
 * A wrong password must change nothing. One server for the file; a fresh browser context per role.
 */
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { appAndBrowser } from "./support/app-and-browser";
import { freshPage, screenshot, signIn } from "./support/browser";
import { demoUser, factValue, numberIn, panel, shownWithin, signatureIn, titleActions } from "./support/forms";

const session = appAndBrowser();

async function signedInAs(role: Parameters<typeof demoUser>[0]): Promise<Page> {
  const page = await freshPage(session.browser);
  const user = demoUser(role);
  await signIn(page, session.app.url, user.email, user.password);
  return page;
}

/** The message the server gives for a wrong signing password, as the person reads it under the form. */
const wrongPasswordText = "The password is not right; the record was not signed.";

describe("engineer: the fading demo cell's flag, acknowledged and then cleared with a signature", () => {
  let page: Page;
  let flagUrl = "";
  const engineer = demoUser("engineer");

  beforeAll(async () => {
    page = await signedInAs("engineer");
  });
  afterAll(async () => {
    await page?.context().close();
  });

  it("finds the open state-of-health flag of PB-0019 in the flag list and opens it", async () => {
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Flags" }).click();
    await page.waitForURL(`${session.app.url}/flags`);
    const table = page.getByRole("table", { name: "Flags, open ones first" });
    // PB-0019 fades past 80 % of rated in the demo's cycle-life run: the SOH rule must have fired.
    const row = table.locator("tbody tr", { hasText: "State of health below a bound" }).filter({ hasText: "PB-0019" });
    expect(await row.count()).toBe(1);
    expect(await row.locator("td").first().innerText()).toBe("open");
    expect(await row.innerText()).toMatch(/State of health \d+(\.\d+)? % of rated .*below 80 %/);
    await screenshot(page, "flow-engineer-flag-list");

    await row.getByRole("link", { name: "State of health below a bound" }).click();
    await page.waitForURL(/\/flags\/[0-9a-f-]{36}$/);
    flagUrl = page.url();
    expect(await page.locator("main h1").innerText()).toBe("State of health below a bound on PB-0019");
    expect(await titleActions(page).innerText()).toBe("open");
    expect(await factValue(page, "Cell")).toBe("PB-0019");
    expect(await factValue(page, "Batch")).toBe("P1000-2611-B");
    await screenshot(page, "flow-engineer-flag-open");
  });

  it("acknowledges the flag with a reason, unsigned, and the history records it", async () => {
    const form = panel(page, "Next step");
    await form.getByRole("radio", { name: "Acknowledge", exact: true }).check();
    // Only clearing is signed: acknowledging asks for no password.
    expect(await form.getByLabel("Your password").count()).toBe(0);
    await form.getByLabel("Reason").fill("Seen the fade on the cycle-life run; cell pulled from the pack build.");
    await form.getByRole("button", { name: "Acknowledge", exact: true }).click();
    await form.getByRole("status").filter({ hasText: "The flag is acknowledged now." }).waitFor();
    // The form stays on the page with the new state's steps, one of them chosen, and no way to acknowledge again.
    await expect.poll(() => form.getByRole("radio").evaluateAll((rs) => rs.map((r) => (r as HTMLInputElement).value))).toEqual(["retest requested", "cleared", "cell retired"]);
    expect(await form.locator("input[type=radio]:checked").count()).toBe(1);
    expect(await form.getByRole("button", { name: "Acknowledge", exact: true }).count()).toBe(0);

    await page.reload();
    expect(await titleActions(page).innerText()).toBe("acknowledged");
    const history = page.getByRole("table", { name: "Every step of this flag" });
    const step = history.locator("tbody tr", { hasText: "open → acknowledged" });
    expect(await step.count()).toBe(1);
    expect(await step.innerText()).toContain(engineer.name);
    expect(await step.innerText()).toContain("cell pulled from the pack build");
    expect(signatureIn(await step.innerText())).toBeNull();
    await screenshot(page, "flow-engineer-flag-acknowledged");
  });

  it("refuses to clear with a wrong password, says so, and leaves the flag as it was", async () => {
    const form = panel(page, "Next step");
    await form.getByRole("radio", { name: "Clear", exact: true }).check();
    await form.getByLabel("Reason").fill("Retest shows the fade is real but the cell is already out of service.");
    await form.getByLabel("Meaning of your signature").selectOption("approved");
    await form.getByLabel("Your password").fill("demo-engineer-2");
    await form.getByRole("button", { name: "Sign and clear" }).click();
    await form.locator("p[role=alert]", { hasText: wrongPasswordText }).waitFor();
    // The typed password is not kept in the form; the chosen step and reason are.
    expect(await form.getByLabel("Your password").inputValue()).toBe("");
    expect(await form.getByRole("radio", { name: "Clear", exact: true }).isChecked()).toBe(true);
    expect(await form.getByLabel("Reason").inputValue()).toContain("already out of service");
    expect(await form.getByLabel("Meaning of your signature").inputValue()).toBe("approved");
    await screenshot(page, "flow-engineer-wrong-password");

    await page.reload();
    expect(await titleActions(page).innerText()).toBe("acknowledged");
    const history = await page.getByRole("table", { name: "Every step of this flag" }).innerText();
    expect(history).not.toContain("→ cleared");
    expect(signatureIn(history)).toBeNull();
  });

  it("clears the flag with the engineer's signature and shows signer, time and meaning on the record", async () => {
    const form = panel(page, "Next step");
    await form.getByRole("radio", { name: "Clear", exact: true }).check();
    await form.getByLabel("Reason").fill("Reviewed the fade evidence; the cell stays out of packs and goes to teardown.");
    await form.getByLabel("Meaning of your signature").selectOption("reviewed");
    await form.getByLabel("Your password").fill(engineer.password);
    const before = Date.now();
    await form.getByRole("button", { name: "Sign and clear" }).click();
    // A closed flag takes no step, so the page comes back without the form and with the new state.
    await expect.poll(() => titleActions(page).innerText(), { timeout: 15_000 }).toBe("cleared");
    const after = Date.now();
    const stepRow = () => page.getByRole("table", { name: "Every step of this flag" }).locator("tbody tr", { hasText: "acknowledged → cleared" });
    const confirmed = signatureIn(await stepRow().innerText());
    expect(confirmed?.signerName).toBe(engineer.name);
    expect(confirmed?.meaning).toBe("reviewed");

    // Stored, not only shown: the reloaded record carries the same signature.
    await page.goto(flagUrl);
    expect(await titleActions(page).innerText()).toBe("cleared");
    const step = stepRow();
    expect(await step.count()).toBe(1);
    const text = await step.innerText();
    expect(text).toContain(engineer.name);
    expect(text).toContain("goes to teardown");
    const shown = signatureIn(text);
    expect(shown).toMatchObject({ signerName: engineer.name, meaning: "reviewed" });
    expect(shown && shownWithin(shown.signedAt, before, after)).toBe(true);
    expect(shown?.signedAt.toISOString()).toBe(confirmed?.signedAt.toISOString());
    // A closed flag takes no further step.
    expect(await panel(page, "Next step").innerText()).toContain("This flag is closed");
    expect(await panel(page, "Next step").getByRole("button").count()).toBe(0);
    await screenshot(page, "flow-engineer-flag-cleared");

    // The cleared flag leaves the list of flags not yet closed; the cell's other flag (its fade rate) stays.
    await page.goto(`${session.app.url}/flags?q=PB-0019`);
    const rows = page.getByRole("table", { name: "Flags, open ones first" }).locator("tbody tr");
    expect(await rows.count()).toBe(1);
    expect(await rows.first().innerText()).toContain("Fading faster than a bound");
  });
});

describe("QA lead: lot P1000-2611-B's figures and a signed decision", () => {
  let page: Page;
  const qa = demoUser("qa-lead");

  beforeAll(async () => {
    page = await signedInAs("qa-lead");
  });
  afterAll(async () => {
    await page?.context().close();
  });

  it("opens the lot's quality page and sees figures that agree with its own cells, and the low outlier PB-0015", async () => {
    await page.goto(`${session.app.url}/batches`);
    await page.getByRole("link", { name: "P1000-2611-B" }).click();
    await page.waitForURL(/\/batches\/[0-9a-f-]{36}$/);
    await page.getByRole("link", { name: "Quality figures and decision" }).click();
    await page.waitForURL(/\/batches\/[0-9a-f-]{36}\/quality$/);
    expect(await page.locator("main h1").innerText()).toBe("Quality of the lot");
    expect(await titleActions(page).innerText()).toContain("Decision: pending");

    const rows = page.getByRole("table", { name: "Cells of batch P1000-2611-B with their delivered capacity" }).locator("tbody tr");
    const cells = await rows.evaluateAll((trs) => trs.map((tr) => Array.from(tr.querySelectorAll("td"), (td) => td.textContent ?? "")));
    expect(cells).toHaveLength(24);
    const capacities = cells.map((c) => numberIn(c[2] ?? ""));
    expect(capacities.every(Number.isFinite)).toBe(true);

    // Mean and sample standard deviation of the capacities the page lists (NIST/SEMATECH
    // e-Handbook §1.3.5.1 and §1.3.5.6), from values rounded to 0.1 mAh, so to 0.1 mAh.
    const n = capacities.length;
    const mean = capacities.reduce((a, b) => a + b, 0) / n;
    const sd = Math.sqrt(capacities.reduce((a, b) => a + (b - mean) ** 2, 0) / (n - 1));
    expect(await factValue(page, "Cells measured")).toBe("24 of 24");
    expect(Math.abs(numberIn(await factValue(page, "Mean delivered capacity")) - mean)).toBeLessThanOrEqual(0.1);
    expect(Math.abs(numberIn(await factValue(page, "Standard deviation")) - sd)).toBeLessThanOrEqual(0.1);

    // Capability against the lot's spec (e-Handbook §6.1.6): Cpl = (mean − LSL)/3s, Cpu = (USL − mean)/3s, Cpk = min.
    const spec = (await factValue(page, "Capacity spec")).match(/(\d+)–(\d+)\s*mAh/);
    const [lsl, usl] = [Number(spec?.[1]), Number(spec?.[2])];
    expect(lsl).toBeLessThan(usl);
    const cpl = (mean - lsl) / (3 * sd);
    const cpu = (usl - mean) / (3 * sd);
    const [shownCpl, shownCpu] = (await factValue(page, "Cpl / Cpu")).split("/").map(numberIn);
    expect(Math.abs((shownCpl ?? Number.NaN) - cpl)).toBeLessThanOrEqual(0.01);
    expect(Math.abs((shownCpu ?? Number.NaN) - cpu)).toBeLessThanOrEqual(0.01);
    const capability = await factValue(page, "Capability (Cpk)");
    expect(Math.abs(numberIn(capability) - Math.min(cpl, cpu))).toBeLessThanOrEqual(0.01);
    // Verdict bands as the page states them (common practice, no source): below 1 not capable, 1 to 1.33 marginal.
    const cpk = Math.min(cpl, cpu);
    expect(capability).toContain(cpk < 1 ? "not capable" : cpk < 1.33 ? "marginal" : "capable");

    // The lowest cell is the demo's weak PB-0015; Grubbs' statistic for it, G = (mean − min)/s
    // (e-Handbook §1.3.5.17), against the page's first test step, and the cell's row marked outlier.
    const lowest = Math.min(...capacities);
    const low = cells[capacities.indexOf(lowest)] ?? [];
    expect(low[0]).toBe("PB-0015");
    expect(low[5]).toBe("outlier");
    expect(low[4]).toMatch(/low/);
    const g = (mean - lowest) / sd;
    const firstStep = await page.getByRole("table", { name: "Grubbs test steps" }).locator("tbody tr").first().locator("td").allInnerTexts();
    expect(numberIn(firstStep[2] ?? "")).toBe(lowest);
    expect(Math.abs(numberIn(firstStep[3] ?? "") - g)).toBeLessThanOrEqual(0.01);
    expect(numberIn(firstStep[3] ?? "")).toBeGreaterThan(numberIn(firstStep[4] ?? ""));
    expect(firstStep[5]).toBe("outlier");
    // No other cell of the lot is called an outlier by Grubbs.
    expect(cells.filter((c) => c[5] === "outlier").map((c) => c[0])).toEqual(["PB-0015"]);
    await screenshot(page, "flow-qa-quality-figures");
  });

  it("refuses a decision signed with a wrong password, and the lot stays pending", async () => {
    const form = panel(page, "Decide on the lot");
    await form.getByRole("radio", { name: "Reject the lot" }).check();
    // Rejecting proposes the matching meaning.
    expect(await form.getByLabel("Meaning of your signature").inputValue()).toBe("rejected");
    await form.getByLabel("Reason").fill("Wrong password attempt: this must not be recorded.");
    await form.getByLabel("Your password").fill("not-the-qa-password");
    await form.getByRole("button", { name: "Sign and record the decision" }).click();
    await form.locator("p[role=alert]", { hasText: wrongPasswordText }).waitFor();
    expect(await form.getByLabel("Your password").inputValue()).toBe("");
    expect(await form.getByRole("radio", { name: "Reject the lot" }).isChecked()).toBe(true);
    expect(await form.getByLabel("Meaning of your signature").inputValue()).toBe("rejected");
    await screenshot(page, "flow-qa-wrong-password");

    await page.reload();
    expect(await titleActions(page).innerText()).toContain("Decision: pending");
    expect(await panel(page, "Decisions").innerText()).toContain("No decision yet: the lot is pending.");
  });

  it("rejects the lot with a reason and a signature, and the decision shows signer, time, meaning and the figures in view", async () => {
    const openFlags = await page.getByRole("table", { name: "Flags of batch P1000-2611-B" }).locator("tbody tr").count();
    const meanShown = await factValue(page, "Mean delivered capacity");
    const form = panel(page, "Decide on the lot");
    await form.getByRole("radio", { name: "Reject the lot" }).check();
    await form.getByLabel("Reason").fill("PB-0015 is a low outlier and the capability is only marginal; lot goes back to the supplier.");
    expect(await form.getByLabel("Meaning of your signature").inputValue()).toBe("rejected");
    await form.getByLabel("Your password").fill(qa.password);
    const before = Date.now();
    await form.getByRole("button", { name: "Sign and record the decision" }).click();
    const status = form.getByRole("status").filter({ hasText: "Recorded: the lot is rejected." });
    await status.waitFor();
    const after = Date.now();
    expect(signatureIn(await status.innerText())).toMatchObject({ signerName: qa.name, meaning: "rejected" });

    await page.reload();
    expect(await titleActions(page).innerText()).toContain("Decision: rejected");
    const decision = panel(page, "Decisions").locator("li");
    expect(await decision.count()).toBe(1);
    const text = await decision.innerText();
    expect(text).toContain(`pending → rejected by ${qa.name}`);
    expect(text).toContain("lot goes back to the supplier");
    const shown = signatureIn(text);
    expect(shown).toMatchObject({ signerName: qa.name, meaning: "rejected" });
    expect(shown && shownWithin(shown.signedAt, before, after)).toBe(true);
    // The figures the decision rested on are kept with it.
    expect(text).toContain(`In view: n = 24, mean ${meanShown}`);
    expect(text).toContain(`${openFlags} flag${openFlags === 1 ? "" : "s"} not closed`);
    // A decided lot offers only the other decisions.
    const choices = await panel(page, "Decide on the lot").getByRole("radio").evaluateAll((rs) => rs.map((r) => (r as HTMLInputElement).value));
    expect(choices).toEqual(["accepted", "on hold"]);
    await screenshot(page, "flow-qa-lot-decided");
  });
});

describe("administrator: a new account, a role change, and both in the audit trail", () => {
  let page: Page;
  const admin = demoUser("admin");
  const newcomer = { name: "Ingrid Haldane", email: "ingrid.haldane@larkspur.test", password: "bench-rota-2026" };

  beforeAll(async () => {
    page = await signedInAs("admin");
  });
  afterAll(async () => {
    await page?.context().close();
  });

  it("creates an account for a new technician on the People page", async () => {
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "People" }).click();
    await page.waitForURL(`${session.app.url}/admin/users`);
    const people = page.getByRole("table", { name: "People with an account" });
    expect(await people.locator("tbody tr", { hasText: newcomer.email }).count()).toBe(0);
    const form = panel(page, "Create an account");
    await form.getByLabel("Name").fill(newcomer.name);
    await form.getByLabel("E-mail").fill(newcomer.email);
    await form.getByLabel("Initial password").fill(newcomer.password);
    await form.getByLabel("Role", { exact: true }).selectOption("technician");
    await form.getByRole("button", { name: "Create account" }).click();
    await form.getByRole("status").filter({ hasText: `Account created for ${newcomer.email}.` }).waitFor();

    await page.reload();
    const row = people.locator("tbody tr", { hasText: newcomer.email });
    expect(await row.count()).toBe(1);
    expect(await row.getByLabel(`Role of ${newcomer.name}`).inputValue()).toBe("technician");
    await screenshot(page, "flow-admin-user-created");
  });

  it("changes the new account's role to engineer, and the list keeps it", async () => {
    const row = page.getByRole("table", { name: "People with an account" }).locator("tbody tr", { hasText: newcomer.email });
    const change = row.getByRole("button", { name: "Change role" });
    expect(await change.isDisabled()).toBe(true);
    await row.getByLabel(`Role of ${newcomer.name}`).selectOption("engineer");
    await change.click();
    await row.getByRole("status").filter({ hasText: "Saved" }).waitFor();

    await page.reload();
    const reloaded = page.getByRole("table", { name: "People with an account" }).locator("tbody tr", { hasText: newcomer.email });
    expect(await reloaded.getByLabel(`Role of ${newcomer.name}`).inputValue()).toBe("engineer");
    await screenshot(page, "flow-admin-role-changed");

    // The account works: its owner signs in with the initial password and holds the new role.
    const theirs = await freshPage(session.browser);
    await signIn(theirs, session.app.url, newcomer.email, newcomer.password);
    expect(await theirs.getByTestId("role-badge").innerText()).toMatch(/engineer/i);
    await theirs.context().close();
  });

  it("finds the role change, with the role before and after, in the audit trail", async () => {
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Audit trail" }).click();
    await page.waitForURL(`${session.app.url}/audit`);
    await page.getByLabel("Action", { exact: true }).selectOption("change role");
    const table = page.getByRole("table", { name: /Audit trail/ });
    const event = table.locator("tbody tr", { hasText: newcomer.name });
    // The table loads from the API after the filter changes: wait until only the role change is left.
    await expect.poll(() => event.count(), { timeout: 10_000 }).toBe(1);
    await expect.poll(() => table.locator("tbody tr").locator("td:nth-child(3)").allInnerTexts(), { timeout: 10_000 }).toSatisfy((actions: string[]) => actions.every((a) => a === "change role"));
    const cells = await event.locator("td").allInnerTexts();
    expect(cells[1]).toBe(admin.name);
    expect(cells[2]).toBe("change role");
    expect(cells[3]).toContain("user");
    expect(await event.locator("del").innerText()).toBe("technician");
    expect(await event.locator("ins").innerText()).toBe("engineer");
    await screenshot(page, "flow-admin-audit-role-change");

    // The account's creation is there too, under its own action.
    await page.getByLabel("Action", { exact: true }).selectOption("create");
    const created = table.locator("tbody tr", { hasText: newcomer.email });
    await expect.poll(() => created.count(), { timeout: 10_000 }).toBe(1);
    expect(await created.locator("td").nth(2).innerText()).toBe("create");
    expect(await created.locator("td").nth(1).innerText()).toBe(admin.name);
  });
});

describe("roles without the right do not get the signing and admin forms", () => {
  it("shows a technician the lot's figures and a flag without the decision or step forms", async () => {
    const page = await signedInAs("technician");
    await page.goto(`${session.app.url}/batches`);
    await page.getByRole("link", { name: "P1000-2611-B" }).click();
    await page.getByRole("link", { name: "Quality figures and decision" }).click();
    await page.waitForURL(/\/quality$/);
    await page.getByRole("heading", { name: "Delivered capacity and capability" }).waitFor();
    expect(await page.getByRole("heading", { name: "Decide on the lot" }).count()).toBe(0);
    expect(await page.getByRole("button", { name: "Sign and record the decision" }).count()).toBe(0);
    expect(await page.getByLabel("Your password").count()).toBe(0);

    await page.goto(`${session.app.url}/flags?q=PB-0019`);
    await page.getByRole("link", { name: "Fading faster than a bound" }).click();
    await page.waitForURL(/\/flags\/[0-9a-f-]{36}$/);
    expect(await panel(page, "Next step").innerText()).toContain("Engineers move flags; this one waits for them.");
    expect(await page.getByRole("radio").count()).toBe(0);
    await screenshot(page, "flow-technician-flag-read-only");
    await page.context().close();
  });

  for (const role of ["qa-lead", "engineer"] as const) {
    it(`answers the ${role} on the People page with the not-allowed page and no list`, async () => {
      const page = await signedInAs(role);
      const response = await page.goto(`${session.app.url}/admin/users`);
      expect(response?.status()).toBe(403);
      await page.getByRole("heading", { name: "This page is not open to your role" }).waitFor();
      expect(await page.getByRole("table", { name: "People with an account" }).count()).toBe(0);
      expect(await page.getByRole("button", { name: "Create account" }).count()).toBe(0);
      await screenshot(page, `flow-${role}-people-forbidden`);
      await page.context().close();
    });
  }
});
