/**
 * Test helpers for the Stripe fake (used by fakes/stripe/*.test.ts; usable by app tests too):
 * a webhook receiver that records raw bodies and signature headers, an SDK client pointed at
 * a fake, and a small HTML form reader for submitting the hosted pages like a browser.
 */
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import Stripe from "stripe";
import type { StripeFake } from "./server";

/** One webhook request as the receiver saw it. */
export interface ReceivedWebhook {
  body: string;
  signature: string;
  /** Unix ms of arrival. */
  at: number;
  /** HTTP status the receiver answered. */
  answered: number;
}

/** A local HTTP endpoint that records webhook POSTs. */
export interface WebhookReceiver {
  url: string;
  received: ReceivedWebhook[];
  /** Event ids in arrival order (parsed without verification). */
  ids(): string[];
  /** Every received event, verified with the SDK's constructEvent against `secret` (throws on a bad signature). */
  verified(secret: string): Stripe.Event[];
  close(): Promise<void>;
}

/**
 * Starts a receiver on a free port. `answer(n, body)` picks the status for the n-th request
 * (0-based); default 200.
 */
export async function startWebhookReceiver(answer: (n: number, body: string) => number = () => 200): Promise<WebhookReceiver> {
  const received: ReceivedWebhook[] = [];
  const server: Server = createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", () => {
      const body = Buffer.concat(chunks).toString("utf8");
      const status = answer(received.length, body);
      received.push({ body, signature: String(req.headers["stripe-signature"] ?? ""), at: Date.now(), answered: status });
      res.writeHead(status, { "content-type": "application/json" });
      res.end(JSON.stringify({ received: status < 300 }));
    });
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const port = (server.address() as AddressInfo).port;
  const sdk = new Stripe("sk_test_receiver");
  return {
    url: `http://127.0.0.1:${port}/webhooks`,
    received,
    ids: () => received.map((r) => (JSON.parse(r.body) as { id: string }).id),
    verified: (secret) => received.map((r) => sdk.webhooks.constructEvent(r.body, r.signature, secret)),
    close: () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}

/** An SDK client for a running fake (no automatic retries, so errors surface at once). */
export function sdkFor(fake: StripeFake, key = "sk_test_loopwright_fake"): Stripe {
  return new Stripe(key, { ...fake.sdkConfig, maxNetworkRetries: 0 });
}

function decodeEntities(s: string): string {
  return s.replace(/&quot;/g, '"').replace(/&#39;/g, "'").replace(/&lt;/g, "<").replace(/&gt;/g, ">").replace(/&amp;/g, "&");
}

/** The form that contains a submit button labelled exactly `buttonText`: its action and named input values. */
export function findForm(html: string, buttonText: string): { action: string; method: string; fields: Record<string, string> } {
  const forms = html.match(/<form\b[\s\S]*?<\/form>/g) ?? [];
  for (const f of forms) {
    const buttons = [...f.matchAll(/<button\b[^>]*>([\s\S]*?)<\/button>/g)].map((m) => decodeEntities(m[1].trim()));
    if (!buttons.includes(buttonText)) continue;
    const action = decodeEntities(/\baction="([^"]*)"/.exec(f)?.[1] ?? "");
    const method = (/\bmethod="([^"]*)"/.exec(f)?.[1] ?? "get").toUpperCase();
    const fields: Record<string, string> = {};
    for (const m of f.matchAll(/<input\b[^>]*>/g)) {
      const name = /\bname="([^"]*)"/.exec(m[0])?.[1];
      if (!name) continue;
      fields[decodeEntities(name)] = decodeEntities(/\bvalue="([^"]*)"/.exec(m[0])?.[1] ?? "");
    }
    return { action, method, fields };
  }
  throw new Error(`No form with a button labelled "${buttonText}" on the page`);
}

/** The href of the link whose text is exactly `text`. */
export function findLink(html: string, text: string): string {
  for (const m of html.matchAll(/<a\b[^>]*href="([^"]*)"[^>]*>([\s\S]*?)<\/a>/g)) {
    if (decodeEntities(m[2].trim()) === text) return decodeEntities(m[1]);
  }
  throw new Error(`No link labelled "${text}" on the page`);
}

/**
 * Fetches `pageUrl`, fills the form with button `buttonText` (plus `values`) and submits it
 * without following the redirect. Returns the response status, Location and body.
 */
export async function submitForm(pageUrl: string, buttonText: string, values: Record<string, string> = {}): Promise<{ status: number; location: string | null; body: string }> {
  const page = await fetch(pageUrl);
  if (page.status !== 200) throw new Error(`GET ${pageUrl} answered ${page.status}`);
  const form = findForm(await page.text(), buttonText);
  const target = new URL(form.action, pageUrl);
  const res = await fetch(target, {
    method: form.method,
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams({ ...form.fields, ...values }).toString(),
  });
  return { status: res.status, location: res.headers.get("location"), body: await res.text() };
}
