/**
 * Billing test support: the local Stripe fake on a free port with our catalogue synced, the
 * app pointed at it through the same env variables as production, signed deliveries to the
 * webhook route handler (in-process), and a small HTTP bridge so the fake can deliver to the
 * route handler itself.
 */
import { createServer, type Server } from "node:http";
import { createServer as createNetServer, type AddressInfo } from "node:net";
import { eq } from "drizzle-orm";
import Stripe from "stripe";
import { startStripeFake, type StripeFake } from "@/fakes/stripe/server";
import { sdkFor } from "@/fakes/stripe/testing";
import { auditEvents, stripeEvents, workspaces, type Workspace } from "@/db/schema";
import { read } from "@/db/write";
import { resetEnvCache } from "@/lib/env";
import { syncCatalog } from "@/lib/billing/catalog";
import * as webhookRoute from "@/app/api/webhooks/stripe/route";
import * as checkoutRoute from "@/app/api/w/[slug]/billing/checkout/route";
import { call, type World } from "../helpers";

export const WEBHOOK_SECRET = () => process.env.STRIPE_WEBHOOK_SECRET as string;

/** A TCP port on 127.0.0.1 that nothing listens on (just released). */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createNetServer();
    srv.on("error", reject);
    srv.listen(0, "127.0.0.1", () => {
      const port = (srv.address() as AddressInfo).port;
      srv.close(() => resolve(port));
    });
  });
}

/** Points the app's Stripe client at `port` on 127.0.0.1 (over http). */
export function pointAppAt(port: number): void {
  process.env.STRIPE_SECRET_KEY = "sk_test_loopwright_billing_tests";
  process.env.STRIPE_API_HOST = "127.0.0.1";
  process.env.STRIPE_API_PORT = String(port);
  process.env.STRIPE_API_PROTOCOL = "http";
  resetEnvCache();
}

export interface FakeStripe {
  fake: StripeFake;
  sdk: Stripe;
}

/** The fake on a free port (no webhook endpoint unless given), catalogue synced, app pointed at it. */
export async function startFake(opts: { webhookUrl?: string; retryDelaysMs?: number[] } = {}): Promise<FakeStripe> {
  const fake = await startStripeFake({ port: 0, webhookUrl: opts.webhookUrl, webhookSecret: opts.webhookUrl ? WEBHOOK_SECRET() : undefined, retryDelaysMs: opts.retryDelaysMs ?? [50, 100, 200] });
  const sdk = sdkFor(fake);
  await syncCatalog(sdk);
  pointAppAt(fake.port);
  return { fake, sdk };
}

/** A signed POST of `payload` to the webhook route handler. `header` overrides the signature. */
export async function deliver(payload: string | object, opts: { secret?: string; timestamp?: number; header?: string | null } = {}) {
  const body = typeof payload === "string" ? payload : JSON.stringify(payload, null, 2);
  const header =
    opts.header === undefined ? Stripe.webhooks.generateTestHeaderString({ payload: body, secret: opts.secret ?? WEBHOOK_SECRET(), timestamp: opts.timestamp }) : opts.header;
  const headers: Record<string, string> = { "content-type": "application/json" };
  if (header !== null) headers["stripe-signature"] = header;
  return call(webhookRoute.POST, { method: "POST", rawBody: body, headers, url: "http://localhost:3999/api/webhooks/stripe" });
}

/** Every event the fake has created, oldest first (optionally of one type). */
export async function fakeEvents(sdk: Stripe, type?: string): Promise<Stripe.Event[]> {
  const out: Stripe.Event[] = [];
  for await (const e of sdk.events.list({ limit: 100, ...(type ? { type } : {}) })) out.push(e);
  return out.reverse();
}

/** The newest event of `type` whose object has id `objectId` (when given). */
export async function lastEvent(sdk: Stripe, type: string, objectId?: string): Promise<Stripe.Event> {
  const all = (await fakeEvents(sdk, type)).filter((e) => !objectId || (e.data.object as { id?: string }).id === objectId);
  const e = all.at(-1);
  if (!e) throw new Error(`no ${type} event${objectId ? ` for ${objectId}` : ""}`);
  return e;
}

/** Starts a checkout through the route handler as the owner and pays it on the fake; returns ids. */
export async function subscribe(f: FakeStripe, w: World, packs: string[], seats: number): Promise<{ sessionId: string; subscriptionId: string; customerId: string }> {
  const r = await call(checkoutRoute.POST, { method: "POST", params: { slug: w.slug }, body: { packs, seats }, cookie: w.owner.cookie });
  if (r.status !== 200) throw new Error(`checkout answered ${r.status}: ${JSON.stringify(r.body)}`);
  const sessionId = r.body.sessionId as string;
  const res = await fetch(`${f.fake.url}/_fake/checkout/${sessionId}/complete`, { method: "POST" });
  if (!res.ok) throw new Error(`completing the checkout answered ${res.status}: ${await res.text()}`);
  const session = await f.sdk.checkout.sessions.retrieve(sessionId);
  return { sessionId, subscriptionId: session.subscription as string, customerId: session.customer as string };
}

/** The workspace row now. */
export async function workspaceRow(id: string): Promise<Workspace> {
  const db = await read();
  const ws = await db.query.workspaces.findFirst({ where: eq(workspaces.id, id) });
  if (!ws) throw new Error(`no workspace ${id}`);
  return ws;
}

/** Whether the event id is stored as claimed. */
export async function claimed(eventId: string): Promise<boolean> {
  const db = await read();
  return (await db.query.stripeEvents.findFirst({ where: eq(stripeEvents.id, eventId) })) !== undefined;
}

/** Billing audit events of a workspace. */
export async function billingAudit(workspaceId: string) {
  const db = await read();
  const rows = await db.query.auditEvents.findMany({ where: eq(auditEvents.workspaceId, workspaceId) });
  return rows.filter((r) => r.action.startsWith("billing."));
}

/** The billing columns that a webhook may change, for before/after comparisons. */
export function billingColumns(ws: Workspace) {
  const { stripeCustomerId, stripeSubscriptionId, subscriptionStatus, packs, seatsPaid, trialEndsAt, currentPeriodEnd, cancelAtPeriodEnd, pastDueSince, subscriptionWatermark } = ws;
  return { stripeCustomerId, stripeSubscriptionId, subscriptionStatus, packs, seatsPaid, trialEndsAt, currentPeriodEnd, cancelAtPeriodEnd, pastDueSince, subscriptionWatermark };
}

/** An HTTP server on a free port that hands each request to the webhook route handler. */
export async function startWebhookBridge(): Promise<{ url: string; statuses: number[]; close(): Promise<void> }> {
  const statuses: number[] = [];
  const server: Server = createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", () => {
      const headers = new Headers();
      for (const [k, v] of Object.entries(req.headers)) if (typeof v === "string") headers.set(k, v);
      const request = new Request("http://localhost:3999/api/webhooks/stripe", { method: "POST", headers, body: Buffer.concat(chunks) });
      void webhookRoute.POST(request).then(async (r) => {
        statuses.push(r.status);
        res.writeHead(r.status, { "content-type": "application/json" });
        res.end(await r.text());
      });
    });
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  const port = (server.address() as AddressInfo).port;
  return {
    url: `http://127.0.0.1:${port}/api/webhooks/stripe`,
    statuses,
    close: () =>
      new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      }),
  };
}
