/**
 * Checkout, seats and portal route handlers against the local Stripe fake: what the Checkout
 * Session carries, one customer per workspace, the return sync, refusals with clear messages
 * that change nothing (here and in Stripe), and the billing summary and invoices.
 */
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { users } from "@/db/schema";
import { read } from "@/db/write";
import { authorize } from "@/lib/auth/guard";
import { syncAfterCheckout } from "@/lib/billing/checkout";
import { listInvoices } from "@/lib/billing/portal";
import * as checkoutRoute from "@/app/api/w/[slug]/billing/checkout/route";
import * as seatsRoute from "@/app/api/w/[slug]/billing/seats/route";
import * as portalRoute from "@/app/api/w/[slug]/billing/portal/route";
import * as billingRoute from "@/app/api/w/[slug]/billing/route";
import { call, makeWorld, setupDb, type World } from "../helpers";
import { billingAudit, billingColumns, freePort, pointAppAt, startFake, subscribe, workspaceRow, type FakeStripe } from "./support";

let f: FakeStripe;

beforeAll(async () => {
  await setupDb();
  f = await startFake();
});
afterAll(async () => {
  await f?.fake.close();
});

async function ownerContext(w: World) {
  const db = await read();
  const user = await db.query.users.findFirst({ where: eq(users.id, w.owner.id) });
  return authorize(user ?? null, w.slug, "billing.manage");
}

/** Subscribed and applied through the return sync (no webhook). */
async function subscribedWorld(packs: string[], seats: number) {
  const w = await makeWorld();
  const ids = await subscribe(f, w, packs, seats);
  const r = await syncAfterCheckout(await ownerContext(w), ids.sessionId);
  expect(r?.outcome).toBe("applied");
  return { w, ...ids };
}

const checkout = (w: World, body: unknown, cookie = w.owner.cookie) => call(checkoutRoute.POST, { method: "POST", params: { slug: w.slug }, body, cookie });
const seats = (w: World, body: unknown, cookie = w.owner.cookie) => call(seatsRoute.POST, { method: "POST", params: { slug: w.slug }, body, cookie });
const err = (r: { body: Record<string, unknown> }) => r.body.error as { code: string; message: string; fields?: Record<string, string> };

async function customersOf(workspaceId: string) {
  const all = await f.sdk.customers.list({ limit: 100 });
  return all.data.filter((c) => c.metadata.workspaceId === workspaceId);
}

describe("checkout", () => {
  it("opens a subscription-mode session: one line per pack price, quantity = seats, the workspace on customer, session and subscription", async () => {
    const w = await makeWorld();
    const r = await checkout(w, { packs: ["reference", "amplifier"], seats: 4 });
    expect(r.status).toBe(200);
    expect(r.body.url).toBe(`${f.fake.url}/checkout/${r.body.sessionId as string}`);
    const session = await f.sdk.checkout.sessions.retrieve(r.body.sessionId as string, { expand: ["line_items"] });
    expect(session).toMatchObject({ mode: "subscription", client_reference_id: w.workspaceId, metadata: { workspaceId: w.workspaceId } });
    expect(session.success_url).toBe(`http://localhost:3999/w/${w.slug}/billing?checkout=success&session_id={CHECKOUT_SESSION_ID}`);
    expect(session.cancel_url).toBe(`http://localhost:3999/w/${w.slug}/billing?checkout=cancelled`);
    const lines = session.line_items?.data ?? [];
    expect(lines.map((l) => [l.price?.lookup_key, l.quantity])).toEqual([
      ["loopwright_amplifier_seat_monthly", 4],
      ["loopwright_reference_seat_monthly", 4],
    ]);
    // 4 seats × ($29 + $19) = $192.00 (prices of lib/billing/plans.ts, multiplied by hand).
    expect(session.amount_total).toBe(19_200);
    const ws = await workspaceRow(w.workspaceId);
    expect(session.customer).toBe(ws.stripeCustomerId);
    const customer = await f.sdk.customers.retrieve(ws.stripeCustomerId as string);
    expect(customer).toMatchObject({ email: w.owner.email, metadata: { workspaceId: w.workspaceId } });
    // Paying creates a subscription that carries the workspace id too.
    await fetch(`${f.fake.url}/_fake/checkout/${session.id}/complete`, { method: "POST" });
    const paid = await f.sdk.checkout.sessions.retrieve(session.id);
    const sub = await f.sdk.subscriptions.retrieve(paid.subscription as string);
    expect(sub.metadata.workspaceId).toBe(w.workspaceId);
    expect(ws.subscriptionStatus).toBe("trialing"); // nothing applied before payment
  });

  it("bills all three packs as the bundle", async () => {
    const w = await makeWorld();
    const r = await checkout(w, { packs: ["amplifier", "filter", "reference"], seats: 3 });
    const lines = await f.sdk.checkout.sessions.listLineItems(r.body.sessionId as string);
    expect(lines.data.map((l) => [l.price?.lookup_key, l.quantity])).toEqual([["loopwright_bundle_seat_monthly", 3]]);
  });

  it("creates the Stripe customer once per workspace, even for simultaneous checkouts", async () => {
    const w = await makeWorld();
    const [a, b] = await Promise.all([checkout(w, { packs: ["filter"], seats: 3 }), checkout(w, { packs: ["filter"], seats: 3 })]);
    const c = await checkout(w, { packs: ["amplifier"], seats: 5 });
    expect([a.status, b.status, c.status]).toEqual([200, 200, 200]);
    const customers = await customersOf(w.workspaceId);
    expect(customers).toHaveLength(1);
    const sessions = await Promise.all([a, b, c].map((r) => f.sdk.checkout.sessions.retrieve(r.body.sessionId as string)));
    expect(new Set(sessions.map((s) => s.customer))).toEqual(new Set([customers[0].id]));
  });

  it("refuses bad input with a message naming the field and rule, and changes nothing here or in Stripe", async () => {
    const w = await makeWorld();
    const before = billingColumns(await workspaceRow(w.workspaceId));
    const cases: Array<[unknown, number, string, RegExp]> = [
      [{ packs: ["amplifier"], seats: 0 }, 422, "seats", /at least 1 seat/],
      [{ packs: ["amplifier"], seats: -4 }, 422, "seats", /at least 1 seat/],
      [{ packs: ["amplifier"], seats: 2.5 }, 422, "seats", /whole number/],
      [{ packs: ["amplifier"] }, 422, "seats", /whole number/],
      [{ packs: ["amplifier", "power"], seats: 3 }, 422, "packs.1", /"power" is not a pack/],
      [{ packs: [], seats: 3 }, 422, "packs", /at least one pack/],
      // The world has 3 seat members (owner, engineer, checker).
      [{ packs: ["amplifier"], seats: 2 }, 422, "seats", /at least 3/],
    ];
    for (const [body, status, field, message] of cases) {
      const r = await checkout(w, body);
      expect(r.status, JSON.stringify(body)).toBe(status);
      expect(err(r).code).toBe("invalid_input");
      expect(err(r).fields?.[field], JSON.stringify(body)).toMatch(message);
      expect(err(r).message).toContain(field);
    }
    const notJson = await call(checkoutRoute.POST, { method: "POST", params: { slug: w.slug }, rawBody: "{packs", headers: { "content-type": "application/json" }, cookie: w.owner.cookie });
    expect(notJson.status).toBe(400);
    for (const who of ["engineer", "checker", "client"] as const) {
      const r = await checkout(w, { packs: ["amplifier"], seats: 3 }, w[who].cookie);
      expect(r.status, who).toBe(403);
      expect(err(r).code).toBe("forbidden");
    }
    expect(billingColumns(await workspaceRow(w.workspaceId))).toEqual(before);
    expect(await customersOf(w.workspaceId)).toHaveLength(0);
    expect(await billingAudit(w.workspaceId)).toHaveLength(0);
  });

  it("refuses a second checkout while a subscription runs", async () => {
    const { w } = await subscribedWorld(["amplifier"], 3);
    const r = await checkout(w, { packs: ["filter"], seats: 3 });
    expect(r.status).toBe(409);
    expect(err(r).message).toMatch(/already has a subscription/);
  });

  it("answers 503 with a clear message when Stripe cannot be reached", async () => {
    const w = await makeWorld();
    pointAppAt(await freePort());
    try {
      const r = await checkout(w, { packs: ["amplifier"], seats: 3 });
      expect(r.status).toBe(503);
      expect(err(r)).toMatchObject({ code: "unavailable", message: expect.stringMatching(/Nothing was changed/) });
    } finally {
      pointAppAt(f.fake.port);
    }
    expect((await workspaceRow(w.workspaceId)).stripeCustomerId).toBeNull();
  });

  it("the return from the hosted page applies the subscription at once; a foreign or unpaid session applies nothing", async () => {
    const w = await makeWorld();
    const other = await makeWorld();
    const open = await checkout(w, { packs: ["filter"], seats: 3 });
    const ctx = await ownerContext(w);
    expect(await syncAfterCheckout(ctx, open.body.sessionId as string)).toBeNull(); // not paid yet
    const foreign = await subscribe(f, other, ["amplifier"], 3);
    expect(await syncAfterCheckout(ctx, foreign.sessionId)).toBeNull(); // another workspace's session
    expect(await syncAfterCheckout(ctx, "not-a-session")).toBeNull();
    await fetch(`${f.fake.url}/_fake/checkout/${open.body.sessionId as string}/complete`, { method: "POST" });
    expect((await syncAfterCheckout(ctx, open.body.sessionId as string))?.outcome).toBe("applied");
    expect(await workspaceRow(w.workspaceId)).toMatchObject({ subscriptionStatus: "active", packs: ["filter"], seatsPaid: 3 });
    expect((await workspaceRow(other.workspaceId)).subscriptionStatus).toBe("trialing");
  });
});

describe("seats", () => {
  it("sets every subscription item's quantity through Stripe and applies it", async () => {
    const { w, subscriptionId } = await subscribedWorld(["amplifier", "reference"], 3);
    const r = await seats(w, { seats: 6 });
    expect(r.status).toBe(200);
    expect(r.body.seatsPaid).toBe(6);
    const sub = await f.sdk.subscriptions.retrieve(subscriptionId);
    expect(sub.items.data.map((i) => i.quantity)).toEqual([6, 6]);
    expect((await workspaceRow(w.workspaceId)).seatsPaid).toBe(6);
    const summary = await call(billingRoute.GET, { params: { slug: w.slug }, cookie: w.owner.cookie });
    expect(summary.body.billing).toMatchObject({ status: "active", seats: { used: 3, paid: 6 }, hasSubscription: true });
  });

  it("refuses zero, negative, fewer than the seat members, non-owners and missing subscriptions, changing nothing", async () => {
    const { w, subscriptionId } = await subscribedWorld(["filter"], 4);
    const before = billingColumns(await workspaceRow(w.workspaceId));
    for (const [body, field, message] of [
      [{ seats: 0 }, "seats", /at least 1 seat/],
      [{ seats: -2 }, "seats", /at least 1 seat/],
      [{ seats: "five" }, "seats", /whole number/],
      [{ seats: 2 }, "seats", /at least 3, the number of seat members/],
    ] as const) {
      const r = await seats(w, body);
      expect(r.status, JSON.stringify(body)).toBe(422);
      expect(err(r).fields?.[field]).toMatch(message);
    }
    const fewer = await seats(w, { seats: 2 });
    expect(err(fewer).message).toMatch(/3 seat members .* needs at least 3 seats/);
    expect((await seats(w, { seats: 9 }, w.engineer.cookie)).status).toBe(403);
    expect((await seats(w, { seats: 9 }, w.client.cookie)).status).toBe(403);
    expect(billingColumns(await workspaceRow(w.workspaceId))).toEqual(before);
    expect((await f.sdk.subscriptions.retrieve(subscriptionId)).items.data[0].quantity).toBe(4);

    const trial = await makeWorld();
    const none = await seats(trial, { seats: 5 });
    expect(none.status).toBe(409);
    expect(err(none).message).toMatch(/no subscription to add seats to/);
  });
});

describe("portal, summary and invoices", () => {
  it("opens the billing portal for the workspace's customer; without one it says to subscribe first", async () => {
    const { w, customerId } = await subscribedWorld(["reference"], 3);
    const r = await call(portalRoute.POST, { method: "POST", params: { slug: w.slug }, cookie: w.owner.cookie });
    expect(r.status).toBe(200);
    const page = await fetch(r.body.url as string);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain(`/w/${w.slug}/billing?portal=return`);
    expect((await workspaceRow(w.workspaceId)).stripeCustomerId).toBe(customerId);
    const trial = await makeWorld();
    const none = await call(portalRoute.POST, { method: "POST", params: { slug: trial.slug }, cookie: trial.owner.cookie });
    expect(none.status).toBe(409);
    expect(err(none).message).toMatch(/subscribe first/);
  });

  it("lists the workspace's invoices from Stripe", async () => {
    const { w } = await subscribedWorld(["amplifier", "reference"], 3);
    const invoices = await listInvoices(await workspaceRow(w.workspaceId));
    expect(invoices).toHaveLength(1);
    // 3 seats × ($29 + $19) = $144.00.
    expect(invoices[0]).toMatchObject({ status: "paid", amount: 14_400, currency: "usd" });
    expect(invoices[0].url).toMatch(/\/invoice\/in_/);
    expect(await listInvoices(await workspaceRow((await makeWorld()).workspaceId))).toEqual([]);
  });

  it("summarises a trial: all packs unlocked, trial seats, no subscription", async () => {
    const w = await makeWorld();
    const r = await call(billingRoute.GET, { params: { slug: w.slug }, cookie: w.owner.cookie });
    expect(r.status).toBe(200);
    const b = r.body.billing as { status: string; statusText: string; packs: Array<{ id: string; unlocked: boolean }>; hasSubscription: boolean };
    expect(b.status).toBe("trialing");
    expect(b.statusText).toMatch(/^Trial until \d{4}-\d{2}-\d{2}$/);
    expect(b.packs.map((p) => [p.id, p.unlocked])).toEqual([
      ["amplifier", true],
      ["filter", true],
      ["reference", true],
    ]);
    expect(b.hasSubscription).toBe(false);
  });
});
