/**
 * The parts library as an engineer uses it: add an op-amp through the form typing engineering
 * notation and see it in the table; import a CSV with one bad row, see the row and the field
 * named, confirm, and see the good rows in the library.
 */
import { expect, test } from "@playwright/test";
import { OPAMP_FIELDS } from "../../lib/calc/core/parts";
import { signUp, uniqueEmail } from "./support";

/** Typed values of a rail-to-rail CMOS op-amp, in the notation an engineer would type. */
const TYPED: Record<string, string> = {
  supplyMin: "2.7", supplyMax: "5.5 V", gbw: "10M", slewRate: "0.5 V/µs", aolDb: "110", vos: "1.5m", vosDrift: "2 µV/°C",
  ib: "10p", ios: "5p", en: "12 nV/√Hz", in: "3f", enCorner: "1k", vicmNeg: "-0.1", vicmPos: "-100m", swingNeg: "50m",
  swingPos: "50 mV", swingLoad: "2k", ioutMax: "40m", rout: "100",
};

test("add an op-amp with engineering notation, then import a CSV with one bad row", async ({ page }) => {
  const slug = await signUp(page, { name: "Pat Parts", email: uniqueEmail("parts"), password: "parts password 1", firm: "Harrow Bench Analog" });
  await page.getByRole("navigation", { name: "Workspace sections" }).getByRole("link", { name: "Parts library" }).click();
  await page.waitForURL(new RegExp(`/w/${slug}/parts$`));

  // Add through the form.
  await page.getByRole("button", { name: "Add op-amp" }).click();
  const form = page.getByRole("form", { name: "New op-amp" });
  await form.getByLabel("Name", { exact: true }).fill("LW-OA321 test rail-to-rail");
  for (const f of OPAMP_FIELDS) await form.getByLabel(`${f.label} (${f.symbol})`, { exact: true }).fill(TYPED[f.key]);
  // The form echoes what it will read.
  await expect(form.getByText("= 10 MHz")).toBeVisible();
  await form.getByRole("button", { name: "Add part" }).click();
  await expect(page.getByText('Added "LW-OA321 test rail-to-rail" to the library.')).toBeVisible();
  const row = page.getByRole("table", { name: "Op-amps" }).getByRole("row").filter({ hasText: "LW-OA321 test rail-to-rail" });
  await expect(row).toContainText("10 MHz");
  await expect(row).toContainText("0.5 V/µs");
  await expect(row).toContainText("1.5 mV");
  await expect(row).toContainText("12 nV/√Hz");

  // A value the parser cannot read names the field, and nothing is added.
  await page.getByRole("button", { name: "Add op-amp" }).click();
  const form2 = page.getByRole("form", { name: "New op-amp" });
  await form2.getByLabel("Name", { exact: true }).fill("LW-OA322 typo");
  for (const f of OPAMP_FIELDS) await form2.getByLabel(`${f.label} (${f.symbol})`, { exact: true }).fill(TYPED[f.key]);
  await form2.getByLabel("Gain-bandwidth product (GBW)", { exact: true }).fill("10 MHzz");
  await form2.getByRole("button", { name: "Add part" }).click();
  await expect(form2.getByRole("alert").filter({ hasText: /^gbw \(Gain-bandwidth product\)/ })).toBeVisible();
  await form2.getByRole("button", { name: "Cancel" }).click();
  await expect(page.getByRole("table", { name: "Op-amps" }).getByText("LW-OA322 typo")).toHaveCount(0);

  // Import a CSV: two good rows and one with a wrong value.
  await page.getByRole("link", { name: "Import CSV" }).click();
  await page.waitForURL(new RegExp(`/w/${slug}/parts/import$`));
  const header = ["name", ...OPAMP_FIELDS.map((f) => `${f.key} [${f.unit}]`), "notes"];
  const line = (name: string, over: Record<string, string> = {}) => [name, ...OPAMP_FIELDS.map((f) => over[f.key] ?? TYPED[f.key]), ""].map((c) => (/[",]/.test(c) ? `"${c.replace(/"/g, '""')}"` : c)).join(",");
  const csv = [header.join(","), line("LW-OA601 imported first"), line("LW-OA602 wrong gbw", { gbw: "fast" }), line("LW-OA603 imported second", { gbw: "4e6" })].join("\r\n");
  await page.getByLabel("CSV file").setInputFiles({ name: "opamps.csv", mimeType: "text/csv", buffer: Buffer.from(csv, "utf8") });
  await page.getByRole("button", { name: "Check file" }).click();
  await expect(page.getByTestId("import-summary")).toContainText("3 rows read: 2 ready, 1 with problems");
  const preview = page.getByRole("table", { name: "Import preview of op-amps" });
  const bad = preview.locator('tr[data-row="3"]');
  await expect(bad).toContainText("LW-OA602 wrong gbw");
  await expect(bad).toContainText(/gbw:\s*gbw \(Gain-bandwidth product\): .*"fast"/);
  await expect(bad.locator('td[aria-invalid="true"]')).toHaveText("fast");
  // Nothing is imported before the confirm.
  await page.goto(`/w/${slug}/parts`);
  await expect(page.getByRole("table", { name: "Op-amps" }).getByText("LW-OA601 imported first")).toHaveCount(0);
  await page.goBack();
  await page.getByLabel("CSV file").setInputFiles({ name: "opamps.csv", mimeType: "text/csv", buffer: Buffer.from(csv, "utf8") });
  await page.getByRole("button", { name: "Check file" }).click();
  await page.getByRole("button", { name: "Import 2 valid rows" }).click();
  await expect(page.getByText("Imported 2 op-amps. 1 row with problems was not imported.")).toBeVisible();
  await page.getByRole("link", { name: "Open the parts library" }).click();
  const table = page.getByRole("table", { name: "Op-amps" });
  await expect(table.getByRole("row").filter({ hasText: "LW-OA601 imported first" })).toContainText("10 MHz");
  await expect(table.getByRole("row").filter({ hasText: "LW-OA603 imported second" })).toContainText("4 MHz");
  await expect(table.getByText("LW-OA602 wrong gbw")).toHaveCount(0);
});
