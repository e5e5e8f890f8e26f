/**
 * Billing as an owner would do it, in Chromium against `next start` and the local Stripe fake
 * (tests/e2e/global-setup.ts points the fake's webhooks at the app and syncs the catalogue):
 * subscribe to two packs with 3 seats on the hosted payment page, the third pack stays locked
 * (402 from its compute route), add seats on the portal page, cancel, and the workspace turns
 * read-only while its data stays readable: the calculation opens and its issued report downloads.
 */
import { expect, test, type Page } from "@playwright/test";
import { calcTypesOfPack } from "../../lib/calc/registry";
import type { PackId } from "../../lib/calc/core/types";
import { firstLink, signIn, signUp, uniqueEmail, waitForMail } from "./support";

const STRIPE = () => process.env.E2E_STRIPE_URL as string;

/** POST /api/w/:slug/compute for the first calculation type of `pack`, with its defaults. */
async function compute(page: Page, slug: string, pack: PackId): Promise<{ status: number; code?: string }> {
  const type = calcTypesOfPack(pack)[0];
  if (!type) throw new Error(`no calculation type in the ${pack} pack`);
  const r = await page.request.post(`/api/w/${slug}/compute`, { data: { typeId: type.id, inputs: type.defaults } });
  const body = (await r.json()) as { error?: { code: string } };
  return { status: r.status(), code: body.error?.code };
}

async function waitForWebhooks(): Promise<void> {
  const r = await fetch(`${STRIPE()}/_fake/deliveries/wait?timeout_ms=15000`, { method: "POST" });
  expect(((await r.json()) as { idle: boolean }).idle).toBe(true);
}

test("subscribe to two packs, add seats in the portal, cancel: read-only, data kept", async ({ page, browser }) => {
  const slug = await signUp(page, { name: "Priya Principal", email: uniqueEmail("billing-owner"), password: "owner password 1", firm: "Marsh Lane Instruments" });
  await page.getByLabel("Project name").fill("Bridge amplifier for load cells");
  await page.getByRole("button", { name: "Create project" }).click();
  await expect(page.getByRole("link", { name: "Bridge amplifier for load cells" })).toBeVisible();

  // During the trial, a checker joins and a calculation is prepared, approved and issued, so the
  // cancelled workspace later has a signed report to download.
  const checkerEmail = uniqueEmail("billing-checker");
  expect((await page.request.post(`/api/w/${slug}/invitations`, { data: { email: checkerEmail, role: "checker" } })).status()).toBe(201);
  const token = firstLink(await waitForMail(checkerEmail, /invited you/)).split("/invite/")[1];
  const checkerCtx = await browser.newContext();
  const checker = await checkerCtx.newPage();
  expect((await checker.request.post(`/api/invitations/${token}/accept`, { data: { name: "Cole Checker", password: "checker password 1" } })).status()).toBe(201);
  await signIn(checker, checkerEmail, "checker password 1");
  const projectId = (((await (await page.request.get(`/api/w/${slug}/projects`)).json()) as { projects: Array<{ id: string }> }).projects)[0].id;
  const made = (await (await page.request.post(`/api/w/${slug}/projects/${projectId}/calculations`, { data: { typeId: "amplifier.gain-stage", title: "Load-cell gain stage" } })).json()) as { calculation: { id: string; version: number } };
  const calcId = made.calculation.id;
  const team = ((await (await page.request.get(`/api/w/${slug}/team?role=checker`)).json()) as { team: Array<{ userId: string }> }).team;
  expect((await page.request.post(`/api/w/${slug}/calculations/${calcId}/transitions`, { data: { action: "submit", version: 1, checkerId: team[0].userId } })).status()).toBe(200);
  expect((await checker.request.post(`/api/w/${slug}/calculations/${calcId}/transitions`, { data: { action: "approve", version: 2 } })).status()).toBe(200);
  const issued = await checker.request.post(`/api/w/${slug}/calculations/${calcId}/issue`, { data: { version: 3 } });
  expect(issued.status()).toBe(201);
  const reportId = ((await issued.json()) as { report: { id: string } }).report.id;

  // The trial: every pack runs, no card needed.
  await page.getByRole("navigation", { name: "Workspace sections" }).getByRole("link", { name: "Billing" }).click();
  await expect(page.getByTestId("billing-status")).toContainText("Trial");
  expect((await compute(page, slug, "filter")).status).toBe(200);

  // Choose two packs and 3 seats: 3 × ($29 + $19) = $144.00 a month (prices in lib/billing/plans.ts).
  const form = page.getByRole("form", { name: "Subscribe" });
  await form.getByRole("checkbox", { name: /Amplifier pack/ }).check();
  await form.getByRole("checkbox", { name: /Reference pack/ }).check();
  await form.getByLabel("Seats", { exact: true }).fill("3");
  await expect(page.getByTestId("checkout-total")).toHaveText("$144.00");
  await form.getByRole("button", { name: "Continue to payment" }).click();

  // Stripe's hosted page (the fake's): pay.
  await page.waitForURL(`${STRIPE()}/checkout/**`);
  await expect(page.getByText("Amplifier pack")).toBeVisible();
  await page.getByRole("button", { name: "Pay and subscribe" }).click();
  await page.waitForURL(new RegExp(`/w/${slug}/billing\\?checkout=success`));
  await expect(page.getByText(/Thank you: the subscription is in place/)).toBeVisible();
  await expect(page.getByTestId("billing-status")).toContainText("Active");
  await expect(page.getByTestId("pack-amplifier")).toContainText("Unlocked");
  await expect(page.getByTestId("pack-reference")).toContainText("Unlocked");
  await expect(page.getByTestId("pack-filter")).toContainText("Locked");
  await expect(page.getByTestId("seats-paid")).toHaveText("3");

  // The subscribed pack runs; the third pack answers 402 pack_locked from its compute route.
  expect((await compute(page, slug, "amplifier")).status).toBe(200);
  expect(await compute(page, slug, "filter")).toEqual({ status: 402, code: "pack_locked" });
  await waitForWebhooks();
  expect(await compute(page, slug, "filter")).toEqual({ status: 402, code: "pack_locked" });

  // Add seats on the portal page; back on the billing page the count follows.
  await page.getByRole("button", { name: "Manage billing" }).click();
  await page.waitForURL(`${STRIPE()}/portal/**`);
  const subscriptionId = await page.locator("section[data-subscription]").getAttribute("data-subscription");
  expect(subscriptionId).toMatch(/^sub_/);
  await page.getByLabel(/^Seats/).fill("5");
  await page.getByRole("button", { name: "Update seats" }).click();
  await expect(page.getByText("Seats updated.")).toBeVisible();
  await page.getByRole("link", { name: "Return to Loopwright" }).click();
  await page.waitForURL(new RegExp(`/w/${slug}/billing\\?portal=return`));
  await expect(page.getByTestId("seats-paid")).toHaveText("5");
  await waitForWebhooks();
  await page.reload();
  await expect(page.getByTestId("seats-paid")).toHaveText("5");

  // Cancel in the portal (at the end of the period, Stripe's portal default).
  await page.getByRole("button", { name: "Manage billing" }).click();
  await page.waitForURL(`${STRIPE()}/portal/**`);
  await page.getByRole("button", { name: "Cancel subscription" }).click();
  await expect(page.getByText("The subscription will end at the end of the current period.")).toBeVisible();
  await page.getByRole("link", { name: "Return to Loopwright" }).click();
  await page.waitForURL(new RegExp(`/w/${slug}/billing\\?portal=return`));
  await expect(page.getByTestId("billing-status-text")).toContainText("cancels on");

  // The period ends (the fake's clock control): Stripe sends customer.subscription.deleted.
  const renew = await fetch(`${STRIPE()}/_fake/subscriptions/${subscriptionId}/renew`, { method: "POST" });
  expect(renew.ok).toBe(true);
  await waitForWebhooks();
  await page.goto(`/w/${slug}/billing`);
  await expect(page.getByTestId("billing-status")).toContainText("Cancelled");
  const banner = page.getByRole("status").filter({ hasText: "Read-only:" });
  await expect(banner).toContainText("The subscription is cancelled");
  await expect(page.getByTestId("pack-amplifier")).toContainText("Locked");

  // A write is refused; what exists stays readable.
  const write = await page.request.post(`/api/w/${slug}/projects`, { data: { name: "Should not be created" } });
  expect(write.status()).toBe(403);
  expect(((await write.json()) as { error: { code: string } }).error.code).toBe("read_only");
  expect((await compute(page, slug, "amplifier")).code).toBe("pack_locked");
  await page.getByRole("navigation", { name: "Workspace sections" }).getByRole("link", { name: "Projects" }).click();
  await expect(page.getByRole("link", { name: "Bridge amplifier for load cells" })).toBeVisible();
  await expect(page.getByRole("status").filter({ hasText: "Read-only:" })).toBeVisible();
  const list = await page.request.get(`/api/w/${slug}/projects`);
  expect(list.status()).toBe(200);
  expect(((await list.json()) as { projects: Array<{ name: string }> }).projects.map((p) => p.name)).toEqual(["Bridge amplifier for load cells"]);
  // The calculation still opens and its issued report still downloads, byte for byte a PDF.
  expect((await page.request.get(`/api/w/${slug}/calculations/${calcId}`)).status()).toBe(200);
  for (const who of [page, checker]) {
    const pdf = await who.request.get(`/api/w/${slug}/reports/${reportId}/pdf`);
    expect(pdf.status()).toBe(200);
    expect((await pdf.body()).subarray(0, 5).toString()).toBe("%PDF-");
  }
  await checkerCtx.close();
});
