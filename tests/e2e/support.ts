/** Shared steps of the browser tests: the mail sink's API, signing up and signing in. */
import { expect, type Page } from "@playwright/test";

export const MAIL_API = () => process.env.E2E_MAIL_API as string;

interface SinkMail {
  id: string;
  subject: string;
  text: string;
  to: Array<{ address: string }>;
}

/** The newest mail to `address` whose subject matches, waiting for it to arrive. */
export async function waitForMail(address: string, subject: RegExp, timeoutMs = 20_000): Promise<SinkMail> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const res = await fetch(`${MAIL_API()}/api/email`);
    const all = (await res.json()) as SinkMail[];
    const hit = all.filter((m) => m.to.some((t) => t.address.toLowerCase() === address.toLowerCase()) && subject.test(m.subject)).at(-1);
    if (hit) return hit;
    await new Promise((r) => setTimeout(r, 300));
  }
  throw new Error(`no mail to ${address} matching ${subject} within ${timeoutMs} ms`);
}

/** The first URL in a mail's text. */
export function firstLink(mail: SinkMail): string {
  const m = /https?:\/\/\S+/.exec(mail.text);
  if (!m) throw new Error(`no link in mail "${mail.subject}"`);
  return m[0];
}

export function uniqueEmail(prefix: string): string {
  return `${prefix}-${Date.now().toString(36)}${Math.random().toString(36).slice(2, 6)}@example.test`;
}

/** Sign up through the form; ends on the new workspace's projects page. Returns the slug. */
export async function signUp(page: Page, opts: { name: string; email: string; password: string; firm: string }): Promise<string> {
  await page.goto("/signup");
  await page.getByLabel("Your name").fill(opts.name);
  await page.getByLabel("Work e-mail").fill(opts.email);
  await page.getByLabel("Password").fill(opts.password);
  await page.getByLabel("Firm name").fill(opts.firm);
  await page.getByRole("button", { name: "Create workspace" }).click();
  await page.waitForURL(/\/w\/[^/]+\/projects$/);
  return new URL(page.url()).pathname.split("/")[2];
}

/** Sign in through the form; waits until the app area is shown. */
export async function signIn(page: Page, email: string, password: string): Promise<void> {
  await page.goto("/signin");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in", exact: true }).click();
  await page.waitForURL(/\/w\//);
  await expect(page.getByRole("navigation", { name: "Workspace sections" })).toBeVisible();
}
