/**
 * The Stripe webhook route handler, called in-process with real event payloads from the local
 * Stripe fake (which also answers the handler's re-fetch of the subscription), signed with the
 * SDK's generateTestHeaderString: signature checks, dedupe, out-of-order delivery, stale
 * events after a cancellation, transient failures, and the fake delivering to the handler
 * itself with its retries.
 */
import Stripe from "stripe";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { accessState, unlockedPacks } from "@/lib/billing/access";
import { call, makeWorld, setupDb } from "../helpers";
import * as projectsRoute from "@/app/api/w/[slug]/projects/route";
import { billingAudit, billingColumns, claimed, deliver, freePort, lastEvent, pointAppAt, startFake, startWebhookBridge, subscribe, workspaceRow, type FakeStripe } from "./support";

let f: FakeStripe;

beforeAll(async () => {
  await setupDb();
  f = await startFake();
});
afterAll(async () => {
  await f?.fake.close();
});

/** A world subscribed on the fake (no webhook delivered yet) and its checkout.session.completed event. */
async function subscribed(packs = ["amplifier", "reference"], seats = 3) {
  const w = await makeWorld();
  const ids = await subscribe(f, w, packs, seats);
  const completed = await lastEvent(f.sdk, "checkout.session.completed", ids.sessionId);
  return { w, ...ids, completed };
}

/** The same event as if Stripe had created it at `createdS` (Unix s), under a new id. */
function recreated(e: Stripe.Event, createdS: number, id = `${e.id}_x${createdS}`): Stripe.Event {
  return { ...structuredClone(e), id, created: createdS };
}

describe("signature", () => {
  it("accepts a correctly signed event and applies the subscription it names", async () => {
    const { w, subscriptionId, customerId, completed } = await subscribed();
    const before = await workspaceRow(w.workspaceId);
    expect(before.subscriptionStatus).toBe("trialing");
    const r = await deliver(completed);
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ received: true, outcome: "applied" });
    const ws = await workspaceRow(w.workspaceId);
    const sub = await f.sdk.subscriptions.retrieve(subscriptionId);
    expect(ws).toMatchObject({ subscriptionStatus: "active", stripeSubscriptionId: subscriptionId, stripeCustomerId: customerId, packs: ["amplifier", "reference"], seatsPaid: 3, cancelAtPeriodEnd: false, pastDueSince: null });
    expect(ws.currentPeriodEnd).toBe(sub.items.data[0].current_period_end * 1000);
    expect(ws.subscriptionWatermark).toBe(completed.created * 1000);
    expect(await claimed(completed.id)).toBe(true);
    expect(unlockedPacks(ws)).toEqual(["amplifier", "reference"]);
  });

  it("refuses a tampered body, a wrong secret, an old timestamp and a missing header with 400, changing nothing", async () => {
    const { w, completed } = await subscribed();
    const body = JSON.stringify(completed, null, 2);
    const before = billingColumns(await workspaceRow(w.workspaceId));
    const good = Stripe.webhooks.generateTestHeaderString({ payload: body, secret: process.env.STRIPE_WEBHOOK_SECRET as string });
    const attempts = [
      // The body changed after signing.
      await deliver(body.replace('"livemode": false', '"livemode": true'), { header: good }),
      await deliver(body, { secret: "whsec_someone_else" }),
      // The SDK's default tolerance is 300 s (STACK.md); 301 s old is outside it.
      await deliver(body, { timestamp: Math.floor(Date.now() / 1000) - 301 }),
      await deliver(body, { header: null }),
      await deliver(body, { header: "t=1,v1=deadbeef" }),
    ];
    expect(body).toContain('"livemode": false');
    for (const r of attempts) {
      expect(r.status).toBe(400);
      expect((r.body.error as { code: string }).code).toBe("bad_request");
    }
    expect(billingColumns(await workspaceRow(w.workspaceId))).toEqual(before);
    expect(await claimed(completed.id)).toBe(false);
    // Inside the tolerance the same body is accepted.
    const ok = await deliver(body, { timestamp: Math.floor(Date.now() / 1000) - 240 });
    expect(ok.status).toBe(200);
  });
});

describe("dedupe", () => {
  it("applies an event delivered twice once", async () => {
    const { w, completed } = await subscribed();
    const first = await deliver(completed);
    const afterFirst = billingColumns(await workspaceRow(w.workspaceId));
    const second = await deliver(completed);
    expect(first.body.outcome).toBe("applied");
    expect(second.status).toBe(200);
    expect(second.body.outcome).toBe("duplicate");
    expect(billingColumns(await workspaceRow(w.workspaceId))).toEqual(afterFirst);
    expect((await billingAudit(w.workspaceId)).filter((a) => a.action === "billing.subscription_synced")).toHaveLength(1);
  });

  it("applies two simultaneous deliveries of the same event once", async () => {
    const { w, completed } = await subscribed();
    const results = await Promise.all([deliver(completed), deliver(completed), deliver(completed)]);
    expect(results.map((r) => r.status)).toEqual([200, 200, 200]);
    expect(results.map((r) => r.body.outcome).sort()).toEqual(["applied", "duplicate", "duplicate"]);
    expect((await billingAudit(w.workspaceId)).filter((a) => a.action === "billing.subscription_synced")).toHaveLength(1);
  });

  it("acknowledges an unhandled type with 200 and does not store it", async () => {
    const { completed } = await subscribed();
    const customerCreated = await lastEvent(f.sdk, "customer.created");
    const r = await deliver(customerCreated);
    expect(r.status).toBe(200);
    expect(r.body.outcome).toBe("unhandled");
    expect(await claimed(customerCreated.id)).toBe(false);
    expect(completed.type).toBe("checkout.session.completed");
  });

  it("acknowledges (and claims) an event for a customer no workspace has", async () => {
    await subscribed();
    const customer = await f.sdk.customers.create({ email: "stranger@example.test" });
    const e = recreated(await lastEvent(f.sdk, "customer.subscription.created"), Math.floor(Date.now() / 1000), "evt_stranger_1");
    (e.data.object as Stripe.Subscription).customer = customer.id;
    (e.data.object as Stripe.Subscription).metadata = {};
    const r = await deliver(e);
    expect(r.status).toBe(200);
    expect(r.body.outcome).toBe("ignored");
    expect(await claimed("evt_stranger_1")).toBe(true);
  });
});

describe("order of delivery", () => {
  it("updated arriving before created ends in the current state (seats 5), whatever comes last", async () => {
    const { w, subscriptionId } = await subscribed(["filter"], 3);
    const sub = await f.sdk.subscriptions.retrieve(subscriptionId);
    await f.sdk.subscriptions.update(subscriptionId, { items: [{ id: sub.items.data[0].id, quantity: 5 }] });
    const updated = await lastEvent(f.sdk, "customer.subscription.updated", subscriptionId);
    const created = await lastEvent(f.sdk, "customer.subscription.created", subscriptionId);
    expect((created.data.object as Stripe.Subscription).items.data[0].quantity).toBe(3);

    expect((await deliver(updated)).body.outcome).toBe("applied");
    expect(await workspaceRow(w.workspaceId)).toMatchObject({ subscriptionStatus: "active", seatsPaid: 5, packs: ["filter"] });
    // `created` is never newer than `updated`; the re-fetch or the watermark keeps seats at 5.
    const late = await deliver(created);
    expect(["stale", "unchanged"]).toContain(late.body.outcome);
    expect((await workspaceRow(w.workspaceId)).seatsPaid).toBe(5);
  });

  it("ignores an event older than the watermark without applying it", async () => {
    const { w, completed, subscriptionId } = await subscribed(["filter"], 4);
    const fresh = recreated(completed, completed.created + 60);
    expect((await deliver(fresh)).body.outcome).toBe("applied");
    const wm = (await workspaceRow(w.workspaceId)).subscriptionWatermark;
    expect(wm).toBe((completed.created + 60) * 1000);
    // A real change in Stripe, but announced by an event older than the watermark: stale.
    const sub = await f.sdk.subscriptions.retrieve(subscriptionId);
    await f.sdk.subscriptions.update(subscriptionId, { items: [{ id: sub.items.data[0].id, quantity: 6 }] });
    const old = recreated(await lastEvent(f.sdk, "customer.subscription.updated", subscriptionId), completed.created + 30);
    const r = await deliver(old);
    expect(r.body.outcome).toBe("stale");
    expect(await claimed(old.id)).toBe(true);
    expect(await workspaceRow(w.workspaceId)).toMatchObject({ seatsPaid: 4, subscriptionWatermark: wm });
  });

  it("deleted then a late updated: the workspace stays cancelled and read-only", async () => {
    const { w, subscriptionId, completed } = await subscribed(["amplifier", "filter"], 3);
    await deliver(completed);
    const sub = await f.sdk.subscriptions.retrieve(subscriptionId);
    await f.sdk.subscriptions.update(subscriptionId, { items: sub.items.data.map((i) => ({ id: i.id, quantity: 4 })) });
    const updated = await lastEvent(f.sdk, "customer.subscription.updated", subscriptionId);
    await f.sdk.subscriptions.cancel(subscriptionId);
    const deleted = await lastEvent(f.sdk, "customer.subscription.deleted", subscriptionId);

    expect((await deliver(deleted)).body.outcome).toBe("applied");
    const cancelled = await workspaceRow(w.workspaceId);
    expect(cancelled.subscriptionStatus).toBe("canceled");
    expect(accessState(cancelled).mode).toBe("read_only");

    // The late `updated` (its payload says active, 4 seats).
    expect((updated.data.object as Stripe.Subscription).status).toBe("active");
    const late = await deliver(updated);
    expect(late.status).toBe(200);
    expect(["stale", "unchanged"]).toContain(late.body.outcome);
    // Even if it claimed to be newer than the deletion, the re-fetch says cancelled.
    const skewed = recreated(updated, deleted.created + 120);
    expect((await deliver(skewed)).status).toBe(200);
    const after = await workspaceRow(w.workspaceId);
    expect(after.subscriptionStatus).toBe("canceled");
    expect(accessState(after).mode).toBe("read_only");
    // Read-only: a write is refused, reading still works.
    const create = await call(projectsRoute.POST, { method: "POST", params: { slug: w.slug }, body: { name: "After cancel" }, cookie: w.engineer.cookie });
    expect(create.status).toBe(403);
    expect((create.body.error as { code: string }).code).toBe("read_only");
    const list = await call(projectsRoute.GET, { params: { slug: w.slug }, cookie: w.engineer.cookie });
    expect(list.status).toBe(200);
    expect((list.body.projects as unknown[]).length).toBe(2);
  });

  it("a late event about an ended subscription never locks out the paying one", async () => {
    const w = await makeWorld();
    const first = await subscribe(f, w, ["reference"], 3);
    await f.sdk.subscriptions.cancel(first.subscriptionId);
    const oldDeleted = await lastEvent(f.sdk, "customer.subscription.deleted", first.subscriptionId);
    // The first subscription's events were never delivered; the owner subscribes again.
    const second = await subscribe(f, w, ["amplifier", "filter", "reference"], 3);
    expect(second.customerId).toBe(first.customerId);
    const secondCompleted = await lastEvent(f.sdk, "checkout.session.completed", second.sessionId);
    expect((await deliver(secondCompleted)).body.outcome).toBe("applied");
    const paying = await workspaceRow(w.workspaceId);
    expect(paying).toMatchObject({ subscriptionStatus: "active", packs: ["amplifier", "filter", "reference"] });

    // The old subscription's deletion arrives late (even dated after the watermark).
    const late = recreated(oldDeleted, Math.floor(paying.subscriptionWatermark / 1000) + 5);
    const r = await deliver(late);
    expect(r.status).toBe(200);
    expect(r.body.outcome).toBe("ignored");
    expect(await workspaceRow(w.workspaceId)).toMatchObject({ subscriptionStatus: "active", stripeSubscriptionId: paying.stripeSubscriptionId, packs: ["amplifier", "filter", "reference"] });
  });
});

describe("payment failure and recovery", () => {
  it("invoice.payment_failed starts the grace period; invoice.paid ends it", async () => {
    const { w, subscriptionId, completed } = await subscribed(["amplifier"], 3);
    await deliver(completed);
    const failed = await fetch(`${f.fake.url}/_fake/subscriptions/${subscriptionId}/fail_payment`, { method: "POST" });
    expect(failed.ok).toBe(true);
    const paymentFailed = await lastEvent(f.sdk, "invoice.payment_failed");
    const r = await deliver(paymentFailed);
    expect(r.body.outcome).toBe("applied");
    const pastDue = await workspaceRow(w.workspaceId);
    expect(pastDue.subscriptionStatus).toBe("past_due");
    expect(pastDue.pastDueSince).toBe(paymentFailed.created * 1000);
    expect(accessState(pastDue).mode).toBe("grace");
    // Grace is 7 days (lib/billing/access.ts GRACE_DAYS), then read-only.
    expect(accessState(pastDue, pastDue.pastDueSince! + 7 * 86_400_000 + 1).mode).toBe("read_only");

    await fetch(`${f.fake.url}/_fake/subscriptions/${subscriptionId}/renew`, { method: "POST" });
    const paid = await lastEvent(f.sdk, "invoice.paid");
    expect((await deliver(paid)).body.outcome).toBe("applied");
    expect(await workspaceRow(w.workspaceId)).toMatchObject({ subscriptionStatus: "active", pastDueSince: null });
  });
});

describe("transient failures", () => {
  it("answers 503 and changes nothing when Stripe cannot be reached; the retry applies it", async () => {
    const { w, completed } = await subscribed(["amplifier"], 3);
    const before = billingColumns(await workspaceRow(w.workspaceId));
    pointAppAt(await freePort()); // nothing listens there
    try {
      const r = await deliver(completed);
      expect(r.status).toBe(503);
      expect((r.body.error as { code: string }).code).toBe("unavailable");
    } finally {
      pointAppAt(f.fake.port);
    }
    expect(billingColumns(await workspaceRow(w.workspaceId))).toEqual(before);
    expect(await claimed(completed.id)).toBe(false);
    const retry = await deliver(completed);
    expect(retry.status).toBe(200);
    expect(retry.body.outcome).toBe("applied");
  });

  it("the fake delivering to the route handler: 503s are retried by the fake until the change is applied", async () => {
    const bridge = await startWebhookBridge();
    const g = await startFake({ webhookUrl: bridge.url, retryDelaysMs: [400, 800, 1600, 3200] });
    try {
      const w = await makeWorld();
      const dead = await freePort();
      // The checkout is opened against the fake; then the app loses Stripe while events go out.
      // Events wait while the app loses its connection to Stripe, then go out.
      g.fake.pauseDeliveries();
      const ids = await subscribe(g, w, ["filter", "reference"], 3);
      pointAppAt(dead);
      g.fake.resumeDeliveries();
      const deadline = Date.now() + 5000;
      while (!bridge.statuses.includes(503) && Date.now() < deadline) await new Promise((r) => setTimeout(r, 25));
      expect(bridge.statuses).toContain(503);
      expect((await workspaceRow(w.workspaceId)).subscriptionStatus).toBe("trialing");
      pointAppAt(g.fake.port);
      expect(await g.fake.waitForDeliveries(15_000)).toBe(true);
      const ws = await workspaceRow(w.workspaceId);
      expect(ws).toMatchObject({ subscriptionStatus: "active", stripeSubscriptionId: ids.subscriptionId, packs: ["filter", "reference"], seatsPaid: 3 });
      expect(g.fake.deliveries().every((d) => d.status === "delivered")).toBe(true);
    } finally {
      pointAppAt(f.fake.port);
      await g.fake.close();
      await bridge.close();
    }
  });
});
