/**
 * The calculation workspace as engineers use it: an owner invites an engineer and a checker; the
 * engineer starts a gain stage, types engineering values and sees them parsed, the results and
 * the Bode plot, lets it autosave and submits it; the checker returns it with a comment; the
 * engineer fixes and resubmits; the preparer's own approval is refused by the API (403); the
 * checker approves. A second test edits one calculation in two browser contexts: the stale save
 * is refused with a clear message, the typed values stay on screen, and can be put back after
 * reloading. It also runs a 100,000-trial Monte Carlo (progress, cancel, histograms) and
 * screens library parts.
 *
 * Screenshots of the sheet are written to $CALC_SHOTS (default test-results/calc-shots).
 */
import path from "node:path";
import { expect, test, type Browser, type Page } from "@playwright/test";
import { firstLink, signUp, uniqueEmail, waitForMail } from "./support";

const SHOTS = process.env.CALC_SHOTS ?? path.join("test-results", "calc-shots");
const shot = (page: Page, name: string, fullPage = true) => page.screenshot({ path: path.join(SHOTS, `${name}.png`), fullPage });

/** Invite someone from the Members page and accept in a new browser context; returns their page. */
async function inviteAndJoin(browser: Browser, owner: Page, slug: string, firm: string, who: { name: string; role: "engineer" | "checker" }): Promise<Page> {
  await owner.goto(`/w/${slug}/members`);
  const email = uniqueEmail(who.role);
  await owner.getByLabel("E-mail", { exact: true }).fill(email);
  await owner.getByLabel("Role", { exact: true }).selectOption(who.role);
  await owner.getByRole("button", { name: "Send invitation" }).click();
  await expect(owner.getByText(`Invitation e-mailed to ${email}.`)).toBeVisible();
  const mail = await waitForMail(email, new RegExp(`invited you to ${firm}`));
  const ctx = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
  const page = await ctx.newPage();
  await page.goto(firstLink(mail));
  await page.getByLabel("Your name").fill(who.name);
  await page.getByLabel("Choose a password").fill(`${who.role} password 1`);
  await page.getByRole("button", { name: "Create account and join" }).click();
  await page.waitForURL(new RegExp(`/w/${slug}/projects$`));
  return page;
}

async function createProject(owner: Page, slug: string, name: string): Promise<string> {
  await owner.goto(`/w/${slug}/projects`);
  await owner.getByLabel("Project name").fill(name);
  await owner.getByRole("button", { name: "Create project" }).click();
  const link = owner.getByRole("link", { name });
  await expect(link).toBeVisible();
  return (await link.getAttribute("href"))!;
}

/** From a project page: New calculation → pick the type → create; ends on the sheet. */
async function newCalculation(page: Page, typeTitle: string, title: string): Promise<string> {
  await page.getByRole("link", { name: "New calculation" }).click();
  await page.getByRole("radio", { name: new RegExp(typeTitle.replace(/[()]/g, "\\$&")) }).check();
  await expect(page.getByLabel("Number")).toHaveValue(/^C-\d{3}$/);
  await page.getByLabel("Title").fill(title);
  await shot(page, `00-new-${typeTitle.split(" ")[0].toLowerCase()}`, false);
  await page.getByRole("button", { name: "Create calculation" }).click();
  await page.waitForURL(/\/calculations\/[^/]+$/);
  await expect(page.getByRole("heading", { name: "Checks", exact: true })).toBeVisible();
  return new URL(page.url()).pathname;
}

const saved = (page: Page) => expect(page.getByTestId("save-status")).toHaveText(/^Saved · v\d+ · \d\d:\d\d$/, { timeout: 15_000 });

async function savedVersion(page: Page): Promise<number> {
  await saved(page);
  return Number(/v(\d+)/.exec((await page.getByTestId("save-status").textContent()) ?? "")![1]);
}

test("gain stage: parsed inputs, live results and Bode plot, autosave, check, return, resubmit, approve", async ({ browser }) => {
  const ownerCtx = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
  const owner = await ownerCtx.newPage();
  const firm = "Harrow Lane Instruments";
  const slug = await signUp(owner, { name: "Orla Owner", email: uniqueEmail("owner"), password: "owner password 1", firm });
  const eng = await inviteAndJoin(browser, owner, slug, firm, { name: "Evan Engineer", role: "engineer" });
  const checker = await inviteAndJoin(browser, owner, slug, firm, { name: "Chloe Checker", role: "checker" });
  const projectUrl = await createProject(owner, slug, "Strain gauge front end");

  // The engineer finds the project's (empty) register and starts a gain stage.
  await eng.goto(projectUrl);
  await expect(eng.getByRole("heading", { name: "Calculation register" })).toBeVisible();
  await expect(eng.getByText("No calculations yet")).toBeVisible();
  const sheetPath = await newCalculation(eng, "Gain stage (inverting / non-inverting)", "Bridge amplifier, gain 10");
  const calcId = sheetPath.split("/").pop()!;

  // Engineering values as typed, parsed right beside the field.
  await eng.getByLabel("Load resistance").fill("4k7");
  await expect(eng.getByTestId("parsed-rLoad")).toHaveText("= 4.7 kΩ");
  await eng.getByLabel("Feedback resistor target").fill("10k");
  await expect(eng.getByTestId("parsed-rfTarget")).toHaveText("= 10 kΩ");
  await eng.getByLabel("Load capacitance").fill("2.2n");
  await expect(eng.getByTestId("parsed-cLoad")).toHaveText("= 2.2 nF");
  await eng.getByLabel("Highest signal frequency").fill("10 kHz");
  await expect(eng.getByTestId("parsed-fMax")).toHaveText("= 10 kHz");
  // A typo is explained at the field, and the server is not asked to save nonsense silently.
  await eng.getByLabel("Load resistance").fill("4k7x");
  await expect(eng.getByTestId("parsed-rLoad")).toContainText("not");
  await eng.getByLabel("Load resistance").fill("4k7");

  // Live results: the results table, the working, the checks and the Bode pair.
  const pad = eng.getByRole("main", { name: "Results pad" });
  await expect(pad.locator('[data-result="r_load_total"]')).toBeVisible();
  await expect(pad.getByRole("table", { name: "Results" }).first()).toBeVisible();
  await expect(pad.locator('[data-formula="gain_ideal"]')).toContainText("G");
  await expect(pad.locator("[data-check]").first()).toBeVisible();
  // The Bode pair sits beside the frequency-response numbers it explains.
  await expect(pad.locator('[data-group="Frequency response"] [data-plot-figure] svg').first()).toBeVisible();
  await expect(pad.getByText("Output swing against the rails").first()).toBeVisible();

  // Autosave: the PATCH carries the version; the status says so.
  const v1 = await savedVersion(eng);
  expect(v1).toBeGreaterThanOrEqual(2);
  await shot(eng, "01-gain-stage-draft");
  const stored = await eng.request.get(`/api/w/${slug}/calculations/${calcId}`);
  expect(((await stored.json()) as { calculation: { inputs: Record<string, unknown> } }).calculation.inputs.rLoad).toBe("4k7");

  // Submit for check to the checker (not to yourself: only reviewers other than the preparer are offered).
  await eng.getByRole("button", { name: "Submit for check" }).click();
  const submit = eng.getByRole("dialog", { name: "Submit for check" });
  await expect(submit.getByLabel("Checker", { exact: true }).locator("option", { hasText: "Evan Engineer" })).toHaveCount(0);
  await submit.getByLabel("Checker", { exact: true }).selectOption({ label: "Chloe Checker (checker)" });
  await submit.getByRole("button", { name: "Submit for check" }).click();
  await expect(eng.getByTestId("calc-status")).toHaveText("In check");
  await expect(eng.getByTestId("read-only-reason")).toContainText("in check with Chloe Checker");
  await expect(eng.getByLabel("Load resistance")).toBeDisabled();
  // The engineer sees why there is nothing to approve for them.
  await expect(eng.getByRole("button", { name: "Approve" })).toBeDisabled();
  await expect(eng.getByText("You prepared this calculation, so another checker must return or approve it.")).toBeVisible();

  // The checker returns it with a comment (a comment is required).
  await checker.goto(sheetPath);
  await expect(checker.getByTestId("calc-status")).toHaveText("In check");
  await checker.getByRole("button", { name: "Return to draft" }).click();
  const ret = checker.getByRole("dialog", { name: "Return to draft" });
  await ret.getByRole("button", { name: "Return to draft" }).click();
  await expect(ret.getByText("a comment is required")).toBeVisible();
  await ret.getByLabel("What must change (required)").fill("Use 0.1 % resistors: the gain error budget is tight at 1 %.");
  await ret.getByRole("button", { name: "Return to draft" }).click();
  await expect(checker.getByTestId("calc-status")).toHaveText("Draft");

  // The engineer sees the return comment, fixes and resubmits.
  await eng.reload();
  await expect(eng.getByTestId("calc-status")).toHaveText("Draft");
  await expect(eng.getByText("Returned by Chloe Checker")).toBeVisible();
  await expect(eng.getByRole("list", { name: "Comments" })).toContainText("Use 0.1 % resistors");
  await eng.getByLabel("Resistor tolerance").fill("0.1");
  await expect(eng.getByTestId("parsed-tolerance")).toHaveText("= 0.1 %");
  await saved(eng);
  await eng.getByRole("button", { name: "Submit for check" }).click();
  await eng.getByRole("dialog", { name: "Submit for check" }).getByLabel("Checker", { exact: true }).selectOption({ label: "Chloe Checker (checker)" });
  await eng.getByRole("dialog", { name: "Submit for check" }).getByRole("button", { name: "Submit for check" }).click();
  await expect(eng.getByTestId("calc-status")).toHaveText("In check");

  // The preparer cannot approve their own calculation: the API refuses with 403.
  const cur = (await (await eng.request.get(`/api/w/${slug}/calculations/${calcId}`)).json()) as { calculation: { version: number; inputs: Record<string, unknown> } };
  expect(cur.calculation.inputs.tolerance).toBe("0.1");
  const own = await eng.request.post(`/api/w/${slug}/calculations/${calcId}/transitions`, { data: { action: "approve", version: cur.calculation.version } });
  expect(own.status()).toBe(403);

  // The checker approves.
  await checker.reload();
  await checker.getByRole("button", { name: "Approve" }).click();
  await checker.getByRole("dialog", { name: "Approve" }).getByRole("button", { name: "Approve" }).click();
  await expect(checker.getByTestId("calc-status")).toHaveText("Approved");
  await expect(checker.getByRole("region", { name: "Workflow" })).toContainText("Checked and approved by Chloe Checker");
  await expect(checker.getByRole("button", { name: "Reopen as draft" })).toBeEnabled();
  await shot(checker, "02-gain-stage-approved");

  // The register shows it with its status, people and check summary; sorting and search work.
  await eng.goto(projectUrl);
  const reg = eng.getByRole("table", { name: "Calculation register" });
  const row = reg.getByRole("row", { name: /Bridge amplifier, gain 10/ });
  await expect(row).toContainText("Approved");
  await expect(row).toContainText("Evan Engineer");
  await expect(row).toContainText("Chloe Checker");
  await expect(row).toContainText(/\d+ pass/);
  await eng.getByLabel("Search").fill("no such calculation");
  await expect(eng.getByText("No calculation matches")).toBeVisible();
  await eng.getByLabel("Search").fill("bridge");
  await expect(row).toBeVisible();
  await eng.getByRole("button", { name: /^Title/ }).click();
  await expect(eng).toHaveURL(/sort=title/);
  await expect(reg.getByRole("columnheader", { name: /Title/ })).toHaveAttribute("aria-sort", "ascending");
  await eng.getByLabel("Status").selectOption("draft");
  await expect(eng.getByText("No calculation matches")).toBeVisible();
  await eng.getByLabel("Status").selectOption("approved");
  await expect(row).toBeVisible();
  await shot(eng, "07-register", false);

  // The revision history lists every change and compares two saved states.
  await eng.goto(`${sheetPath}/history`);
  await expect(eng.getByRole("table", { name: "Revisions" })).toContainText("Chloe Checker");
  await expect(eng.getByRole("table", { name: "Saved changes" })).toContainText("Returned to draft");
  const created = eng.getByRole("table", { name: "Saved changes" }).getByRole("row").last();
  await created.getByRole("radio").first().check();
  await expect(eng.getByRole("table", { name: "Inputs (as typed)" })).toContainText("4k7");
  await shot(eng, "03-history-compare");

  await Promise.all([ownerCtx.close(), eng.context().close(), checker.context().close()]);
});

test("two contexts edit one draft: the stale save is refused and keeps its values; Monte Carlo and part screening", async ({ browser }) => {
  const aCtx = await browser.newContext({ viewport: { width: 1440, height: 1000 } });
  const a = await aCtx.newPage();
  const firm = "Kestrel Bridge Electronics";
  const slug = await signUp(a, { name: "Asha Owner", email: uniqueEmail("owner"), password: "owner password 1", firm });
  const b = await inviteAndJoin(browser, a, slug, firm, { name: "Bram Engineer", role: "engineer" });
  const projectUrl = await createProject(a, slug, "Anti-alias filter for the ADC");
  await a.goto(projectUrl);
  const sheetPath = await newCalculation(a, "Active low-pass filter", "4th-order anti-alias, 1 kHz");

  // Both open the same draft (same version).
  await b.goto(sheetPath);
  await expect(b.getByTestId("save-status")).toHaveText(/Saved · v1/);

  // A saves first.
  await a.getByLabel("Cutoff frequency").fill("2k");
  await expect(a.getByTestId("parsed-cutoff")).toHaveText("= 2 kHz");
  expect(await savedVersion(a)).toBe(2);

  // B, still on v1, edits: the save is refused with the clear message and B's value stays.
  await b.getByLabel("Resistor level aimed at").fill("4k7");
  const stale = b.getByRole("alert").filter({ hasText: "saved a newer version" });
  await expect(stale).toBeVisible({ timeout: 15_000 });
  await expect(stale).toContainText("Asha Owner saved a newer version (v2)");
  await expect(b.getByLabel("Resistor level aimed at")).toHaveValue("4k7");
  await expect(b.getByTestId("save-status")).toHaveText(/Not saved/);
  await shot(b, "04-stale-save");
  // Nothing was overwritten on the server.
  const server = (await (await b.request.get(`/api/w/${slug}/calculations/${sheetPath.split("/").pop()}`)).json()) as { calculation: { version: number; inputs: Record<string, unknown> } };
  expect(server.calculation.version).toBe(2);
  expect(server.calculation.inputs.cutoff).toBe("2k");
  expect(server.calculation.inputs.resistorLevel).toBe("10k");

  // Reload shows A's change; B can put their value back on top, knowingly.
  await b.getByRole("button", { name: "Reload the saved version" }).click();
  await expect(b.getByLabel("Cutoff frequency")).toHaveValue("2k");
  await expect(b.getByLabel("Resistor level aimed at")).toHaveValue("10k");
  await b.getByRole("button", { name: "Put my values back" }).click();
  await expect(b.getByLabel("Resistor level aimed at")).toHaveValue("4k7");
  await expect(b.getByLabel("Cutoff frequency")).toHaveValue("2k");
  expect(await savedVersion(b)).toBe(3);

  // The filter sheet: section table, component list, Monte Carlo histograms.
  await a.reload();
  const pad = a.getByRole("main", { name: "Results pad" });
  await expect(pad.getByRole("table", { name: "Sections" })).toBeVisible();
  await expect(pad.getByRole("table", { name: "Component list" })).toBeVisible();

  // A large Monte Carlo: progress and cancel, then a full run with its histograms.
  await a.getByLabel("Trials N", { exact: true }).fill("100000");
  // Start, and press Cancel as soon as the first progress line has moved the bar (in the page,
  // so the click is not later than a person's would be).
  await a.evaluate(async () => {
    const button = (name: string) => [...document.querySelectorAll("button")].find((b) => b.textContent === name);
    button("Run Monte Carlo")!.click();
    for (let i = 0; i < 2000; i++) {
      const bar = document.querySelector('[role="progressbar"]');
      if (bar && Number(bar.getAttribute("aria-valuenow")) > 0) break;
      await new Promise((r) => setTimeout(r, 2));
    }
    button("Cancel")?.click();
  });
  await expect(a.getByText(/Cancelled after [\d,]+ of 100,000 trials/)).toBeVisible();
  expect(await a.getByText(/Cancelled after/).textContent()).not.toContain("after 100,000");
  await a.getByRole("button", { name: "Run Monte Carlo" }).click();
  await expect(a.getByRole("progressbar", { name: "Monte Carlo progress" }).or(a.getByTestId("mc-result"))).toBeVisible();
  const mc = a.getByTestId("mc-result");
  await expect(mc).toContainText("100,000 trials", { timeout: 30_000 });
  await expect(mc.getByRole("table", { name: "Monte Carlo statistics" })).toBeVisible();
  // Unity-gain sections: only the frequency spreads, so one histogram (no one-bin gain plot).
  await expect(mc.locator("[data-plot-figure]")).toHaveCount(1);
  await shot(a, "05-filter-monte-carlo");

  // Part screening over the library: add two parts, screen, use one.
  for (const [name, gbw, sr] of [
    ["LW-OA320 rail-to-rail CMOS 5 V", "10M", "8 V/µs"],
    ["LW-OA150 micropower CMOS 5 V", "50k", "0.02 V/µs"],
  ]) {
    const r = await a.request.post(`/api/w/${slug}/parts`, {
      data: {
        kind: "opamp",
        name,
        values: { supplyMin: "1.8", supplyMax: "5.5", gbw, slewRate: sr, aolDb: "110", vos: "1.5m", vosDrift: "2u", ib: "10p", ios: "5p", en: "12n", in: "3f", enCorner: "1k", vicmNeg: "-0.1", vicmPos: "-0.1", swingNeg: "50m", swingPos: "50m", swingLoad: "2k", ioutMax: "40m", rout: "100" },
      },
    });
    expect(r.status(), await r.text()).toBe(201);
  }
  await a.getByRole("button", { name: "Screen library parts" }).click();
  const dlg = a.getByRole("dialog", { name: "Screen library parts" });
  const rows = dlg.getByRole("table", { name: "Screening results" }).locator("tbody tr");
  await expect(rows).toHaveCount(2);
  // The 50 kHz part cannot do a 2 kHz fourth-order filter: it ranks last and names its failing check.
  await expect(rows.nth(0)).toContainText("LW-OA320");
  await expect(rows.nth(1)).toContainText("LW-OA150");
  await expect(rows.nth(1)).toContainText("Fail");
  await shot(a, "06-screening", false);
  await rows.nth(0).getByRole("button", { name: "Use this part" }).click();
  await expect(dlg).toBeHidden();
  await expect(a.locator('[data-field="opamp"] select').first().locator("option:checked")).toHaveText("LW-OA320 rail-to-rail CMOS 5 V");
  await expect(a.getByText("From the parts library.")).toBeVisible();
  await saved(a);

  await Promise.all([aCtx.close(), b.context().close()]);
});
