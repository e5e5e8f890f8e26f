/**
 * End-to-end flows through the fake's hosted pages and webhooks: checkout paid on the pay
 * page, seat change and cancellation on the portal page, failed and recovered payments,
 * retries, pauses, duplicates and out-of-order delivery. Every webhook is verified with the
 * SDK's own stripe.webhooks.constructEvent.
 */
import { spawn } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import Stripe from "stripe";
import { afterEach, describe, expect, it } from "vitest";
import { startStripeFake, type StripeFake, type StripeFakeOptions } from "./server";
import { findForm, findLink, sdkFor, startWebhookReceiver, submitForm, type WebhookReceiver } from "./testing";
import { signatureHeader } from "./webhooks";

const SECRET = "whsec_test_flows_secret";
const cleanups: (() => Promise<void>)[] = [];
afterEach(async () => {
  while (cleanups.length) await cleanups.pop()?.();
});

async function setup(opts: Partial<StripeFakeOptions> = {}, answer?: (n: number, body: string) => number): Promise<{ fake: StripeFake; stripe: Stripe; hook: WebhookReceiver }> {
  const hook = await startWebhookReceiver(answer);
  const fake = await startStripeFake({ port: 0, webhookUrl: hook.url, webhookSecret: SECRET, retryDelaysMs: [20, 40], ...opts });
  cleanups.push(() => hook.close(), () => fake.close());
  return { fake, stripe: sdkFor(fake), hook };
}

async function seatPrice(stripe: Stripe): Promise<Stripe.Price> {
  const product = await stripe.products.create({ id: "amplifier_pack", name: "Amplifier pack" });
  return stripe.prices.create({ product: product.id, currency: "usd", unit_amount: 4900, recurring: { interval: "month" }, lookup_key: "amplifier_monthly" });
}

/** Pays a new 3-seat checkout on the hosted page; returns the session and subscription ids. */
async function payCheckout(fake: StripeFake, stripe: Stripe, extra: Partial<Stripe.Checkout.SessionCreateParams> = {}): Promise<{ session: Stripe.Checkout.Session; subId: string; location: string | null }> {
  const price = await seatPrice(stripe);
  const session = await stripe.checkout.sessions.create({
    mode: "subscription",
    line_items: [{ price: price.id, quantity: 3 }],
    customer_email: "owner@firm.example",
    client_reference_id: "ws_7",
    metadata: { workspace_id: "ws_7" },
    subscription_data: { metadata: { workspace_id: "ws_7" } },
    success_url: "http://127.0.0.1:3999/billing/return?session_id={CHECKOUT_SESSION_ID}",
    cancel_url: "http://127.0.0.1:3999/billing",
    ...extra,
  });
  const paid = await submitForm(session.url as string, "Pay and subscribe");
  expect(paid.status).toBe(303);
  const done = await stripe.checkout.sessions.retrieve(session.id);
  return { session: done, subId: done.subscription as string, location: paid.location };
}

function types(events: Stripe.Event[]): string[] {
  return events.map((e) => e.type);
}

describe("checkout on the hosted pay page", () => {
  it("shows items, quantity and total, and paying delivers correctly signed webhooks and redirects to success_url", async () => {
    const { fake, stripe, hook } = await setup();
    const price = await seatPrice(stripe);
    const session = await stripe.checkout.sessions.create({
      mode: "subscription",
      line_items: [{ price: price.id, quantity: 3 }],
      customer_email: "owner@firm.example",
      client_reference_id: "ws_7",
      metadata: { workspace_id: "ws_7" },
      subscription_data: { metadata: { workspace_id: "ws_7" } },
      success_url: "http://127.0.0.1:3999/billing/return?session_id={CHECKOUT_SESSION_ID}",
      cancel_url: "http://127.0.0.1:3999/billing",
    });
    const html = await (await fetch(session.url as string)).text();
    expect(html).toContain("Amplifier pack");
    expect(html).toMatch(/data-testid="quantity">3</);
    // 3 seats × 49.00 USD = 147.00 USD.
    expect(html).toMatch(/data-testid="total">147\.00 USD</);
    expect(findLink(html, "Cancel and go back")).toBe("http://127.0.0.1:3999/billing");
    expect(html).toMatch(/Local test page/);

    expect(await fake.waitForDeliveries(5000)).toBe(true);
    expect(types(hook.verified(SECRET))).toEqual(["product.created", "price.created"]);
    const paid = await submitForm(session.url as string, "Pay and subscribe");
    expect(paid.status).toBe(303);
    expect(paid.location).toBe(`http://127.0.0.1:3999/billing/return?session_id=${session.id}`);
    expect(await fake.waitForDeliveries(5000)).toBe(true);

    const events = hook.verified(SECRET).slice(2);
    expect(types(events)).toEqual([
      "customer.created",
      "customer.subscription.created",
      "invoice.created",
      "invoice.finalized",
      "invoice.paid",
      "invoice.payment_succeeded",
      "checkout.session.completed",
    ]);
    // Delivered in creation order.
    const created = events.map((e) => e.created);
    expect([...created].sort((a, b) => a - b)).toEqual(created);
    const completed = events.find((e) => e.type === "checkout.session.completed")?.data.object as Stripe.Checkout.Session;
    const sub = await stripe.subscriptions.retrieve(completed.subscription as string);
    expect(completed).toMatchObject({ id: session.id, status: "complete", payment_status: "paid", client_reference_id: "ws_7", metadata: { workspace_id: "ws_7" }, customer: sub.customer });
    expect(sub).toMatchObject({ status: "active", metadata: { workspace_id: "ws_7" } });
    expect(sub.items.data[0].quantity).toBe(3);
    const created1 = events.find((e) => e.type === "customer.subscription.created")?.data.object as Stripe.Subscription;
    expect(created1.id).toBe(sub.id);
    const paidInv = events.find((e) => e.type === "invoice.paid")?.data.object as Stripe.Invoice;
    expect(paidInv).toMatchObject({ status: "paid", amount_paid: 14700 });
    expect(paidInv.parent?.subscription_details?.subscription).toBe(sub.id);
    // The signature really binds body and secret: another secret or a changed body fails.
    const first = hook.received[2];
    expect(() => stripe.webhooks.constructEvent(first.body, first.signature, "whsec_wrong")).toThrow(Stripe.errors.StripeSignatureVerificationError);
    expect(() => stripe.webhooks.constructEvent(first.body.replace("customer", "Customer"), first.signature, SECRET)).toThrow(Stripe.errors.StripeSignatureVerificationError);
    expect(first.signature).toMatch(/^t=\d+,v1=[0-9a-f]{64}$/);
    // A paid session cannot be paid again.
    const again = await fetch(`${fake.url}/checkout/${session.id}/pay`, { method: "POST", redirect: "manual" });
    expect(again.status).toBe(400);
    expect(fake.deliveries().every((d) => d.status === "delivered")).toBe(true);
  });

  it("signs like Stripe: HMAC-SHA256 of `${t}.${body}` in hex (checked against the SDK's generateTestHeaderString)", () => {
    const body = JSON.stringify({ id: "evt_1", object: "event" });
    const sdk = new Stripe("sk_test_x");
    expect(signatureHeader(body, SECRET, 1_700_000_000)).toBe(sdk.webhooks.generateTestHeaderString({ payload: body, secret: SECRET, timestamp: 1_700_000_000 }));
  });

  it("asks for an email when the session has no customer, and starts a trial with a zero invoice", async () => {
    const { fake, stripe } = await setup();
    const price = await seatPrice(stripe);
    const session = await stripe.checkout.sessions.create({
      mode: "subscription",
      line_items: [{ price: price.id, quantity: 2 }],
      subscription_data: { trial_period_days: 14 },
      success_url: "http://127.0.0.1:3999/ok",
    });
    const noEmail = await submitForm(session.url as string, "Pay and subscribe");
    expect(noEmail.status).toBe(400);
    expect(noEmail.body).toMatch(/valid email/);
    const ok = await submitForm(session.url as string, "Pay and subscribe", { email: "new@firm.example" });
    expect(ok.status).toBe(303);
    const done = await stripe.checkout.sessions.retrieve(session.id, { expand: ["subscription", "customer", "invoice"] });
    const sub = done.subscription as Stripe.Subscription;
    expect(done.payment_status).toBe("no_payment_required");
    expect((done.customer as Stripe.Customer).email).toBe("new@firm.example");
    expect(sub.status).toBe("trialing");
    expect((sub.trial_end as number) - (sub.trial_start as number)).toBe(14 * 86400);
    expect(sub.items.data[0].current_period_end).toBe(sub.trial_end);
    expect((done.invoice as Stripe.Invoice).amount_paid).toBe(0);
    await fake.waitForDeliveries(5000);
    // The trial ends: the first real payment is taken and the subscription becomes active.
    const renewed = (await (await fetch(`${fake.url}/_fake/subscriptions/${sub.id}/renew`, { method: "POST" })).json()) as { subscription: Stripe.Subscription; invoice: Stripe.Invoice };
    expect(renewed.subscription.status).toBe("active");
    expect(renewed.invoice).toMatchObject({ status: "paid", amount_paid: 9800, billing_reason: "subscription_cycle" });
  });
});

describe("billing portal page", () => {
  it("changes seats and schedules cancellation through the page, with the same webhooks as the API", async () => {
    const { fake, stripe, hook } = await setup();
    const { subId } = await payCheckout(fake, stripe);
    const sub = await stripe.subscriptions.retrieve(subId);
    const portal = await stripe.billingPortal.sessions.create({ customer: sub.customer as string, return_url: "http://127.0.0.1:3999/billing" });
    await fake.waitForDeliveries(5000);
    const before = hook.received.length;

    const html = await (await fetch(portal.url)).text();
    expect(findLink(html, "Return to Loopwright")).toBe("http://127.0.0.1:3999/billing");
    const seatsForm = findForm(html, "Update seats");
    expect(seatsForm.fields).toMatchObject({ subscription: subId, quantity: "3" });
    findForm(html, "Cancel subscription");

    const bad = await submitForm(portal.url, "Update seats", { quantity: "0" });
    expect(bad.status).toBe(400);
    expect(bad.body).toMatch(/at least 1 seat/);
    expect((await stripe.subscriptions.retrieve(subId)).items.data[0].quantity).toBe(3);

    const seats = await submitForm(portal.url, "Update seats", { quantity: "5" });
    expect(seats.status).toBe(303);
    expect((await stripe.subscriptions.retrieve(subId)).items.data[0].quantity).toBe(5);
    await fake.waitForDeliveries(5000);
    const afterSeats = hook.verified(SECRET).slice(before);
    expect(types(afterSeats)).toEqual(["customer.subscription.updated"]);
    const upd = afterSeats[0].data as { object: Stripe.Subscription; previous_attributes?: Partial<Stripe.Subscription> };
    expect(upd.object.items.data[0].quantity).toBe(5);
    expect(upd.previous_attributes?.items?.data[0].quantity).toBe(3);

    const cancel = await submitForm(portal.url, "Cancel subscription");
    expect(cancel.status).toBe(303);
    const scheduled = await stripe.subscriptions.retrieve(subId);
    expect(scheduled).toMatchObject({ status: "active", cancel_at_period_end: true });
    const page = await (await fetch(portal.url)).text();
    expect(page).toMatch(/cancels on/);
    findForm(page, "Keep subscription");
    await fake.waitForDeliveries(5000);
    const last = hook.verified(SECRET).at(-1) as Stripe.Event;
    expect(last.type).toBe("customer.subscription.updated");
    expect((last.data.object as Stripe.Subscription).cancel_at_period_end).toBe(true);
    expect((last.data.previous_attributes as Partial<Stripe.Subscription>).cancel_at_period_end).toBe(false);

    // At the end of the period the subscription ends.
    await fetch(`${fake.url}/_fake/subscriptions/${subId}/renew`, { method: "POST" });
    await fake.waitForDeliveries(5000);
    expect((await stripe.subscriptions.retrieve(subId)).status).toBe("canceled");
    expect((hook.verified(SECRET).at(-1) as Stripe.Event).type).toBe("customer.subscription.deleted");
  });

  it("cancels at once when the fake is set to portalCancel: immediately", async () => {
    const { fake, stripe, hook } = await setup({ portalCancel: "immediately" });
    const { subId } = await payCheckout(fake, stripe);
    const sub = await stripe.subscriptions.retrieve(subId);
    const portal = await stripe.billingPortal.sessions.create({ customer: sub.customer as string, return_url: "http://127.0.0.1:3999/billing" });
    const res = await submitForm(portal.url, "Cancel subscription");
    expect(res.status).toBe(303);
    expect((await stripe.subscriptions.retrieve(subId)).status).toBe("canceled");
    await fake.waitForDeliveries(5000);
    const last = hook.verified(SECRET).at(-1) as Stripe.Event;
    expect(last.type).toBe("customer.subscription.deleted");
    expect((last.data.object as Stripe.Subscription).status).toBe("canceled");
  });
});

describe("failed and recovered payments", () => {
  it("fail_payment opens an unpaid invoice and makes the subscription past_due; renew pays it", async () => {
    const { fake, stripe, hook } = await setup();
    const { subId } = await payCheckout(fake, stripe);
    await fake.waitForDeliveries(5000);
    const before = hook.received.length;
    const res = await fetch(`${fake.url}/_fake/subscriptions/${subId}/fail_payment`, { method: "POST" });
    expect(res.status).toBe(200);
    const sub = await stripe.subscriptions.retrieve(subId, { expand: ["latest_invoice"] });
    expect(sub.status).toBe("past_due");
    const inv = sub.latest_invoice as Stripe.Invoice;
    expect(inv).toMatchObject({ status: "open", amount_due: 14700, amount_paid: 0, amount_remaining: 14700, attempt_count: 1, attempted: true, billing_reason: "subscription_cycle" });
    expect(inv.next_payment_attempt).not.toBeNull();
    expect((await stripe.invoices.list({ subscription: subId, status: "open" })).data.map((i) => i.id)).toEqual([inv.id]);
    await fake.waitForDeliveries(5000);
    const evs = hook.verified(SECRET).slice(before);
    expect(types(evs)).toContain("invoice.payment_failed");
    const upd = evs.find((e) => e.type === "customer.subscription.updated");
    expect((upd?.data.object as Stripe.Subscription).status).toBe("past_due");
    expect((upd?.data.previous_attributes as Partial<Stripe.Subscription>).status).toBe("active");
    expect(types(evs).indexOf("invoice.payment_failed")).toBeLessThan(types(evs).indexOf("customer.subscription.updated"));

    const page = await (await fetch(inv.hosted_invoice_url as string)).text();
    expect(page).toMatch(/data-testid="status">open</);

    await fetch(`${fake.url}/_fake/subscriptions/${subId}/renew`, { method: "POST" });
    const recovered = await stripe.subscriptions.retrieve(subId);
    expect(recovered.status).toBe("active");
    expect((await stripe.invoices.retrieve(inv.id)).status).toBe("paid");
    await fake.waitForDeliveries(5000);
    expect(types(hook.verified(SECRET).slice(before))).toEqual(expect.arrayContaining(["invoice.paid", "customer.subscription.updated"]));
  });

  it("the hosted invoice page pays an open invoice", async () => {
    const { fake, stripe } = await setup();
    const { subId } = await payCheckout(fake, stripe);
    await fetch(`${fake.url}/_fake/subscriptions/${subId}/fail_payment`, { method: "POST" });
    const inv = (await stripe.invoices.list({ subscription: subId, status: "open" })).data[0];
    const res = await submitForm(inv.hosted_invoice_url as string, "Pay this invoice");
    expect(res.status).toBe(303);
    expect((await stripe.invoices.retrieve(inv.id)).status).toBe("paid");
    expect((await stripe.subscriptions.retrieve(subId)).status).toBe("active");
  });
});

describe("webhook delivery", () => {
  it("retries a non-2xx answer with backoff and logs each attempt", async () => {
    // The endpoint fails the first two requests of every event, then accepts.
    const tries = new Map<string, number>();
    const { fake, stripe, hook } = await setup({ retryDelaysMs: [30, 30, 30] }, (_n, body) => {
      const id = (JSON.parse(body) as { id: string }).id;
      const n = (tries.get(id) ?? 0) + 1;
      tries.set(id, n);
      return n <= 2 ? 500 : 200;
    });
    await stripe.customers.create({ email: "retry@firm.example" });
    expect(await fake.waitForDeliveries(5000)).toBe(true);
    const [rec] = fake.deliveries();
    expect(rec.type).toBe("customer.created");
    expect(rec.status).toBe("delivered");
    expect(rec.attempts.map((a) => a.status)).toEqual([500, 500, 200]);
    expect(rec.attempts[1].at - rec.attempts[0].at).toBeGreaterThanOrEqual(25);
    expect(hook.received).toHaveLength(3);
    const event = await stripe.events.retrieve(rec.eventId);
    expect(event.pending_webhooks).toBe(0);
  });

  it("marks an event failed after the last retry", async () => {
    const { fake, stripe } = await setup({ retryDelaysMs: [10, 10] }, () => 503);
    await stripe.customers.create({ email: "down@firm.example" });
    expect(await fake.waitForDeliveries(5000)).toBe(true);
    const [rec] = fake.deliveries();
    expect(rec.status).toBe("failed");
    expect(rec.attempts.map((a) => a.status)).toEqual([503, 503, 503]);
    const failed = await stripe.events.list({ delivery_success: false });
    expect(failed.data.map((e) => e.id)).toEqual([rec.eventId]);
  });

  it("pause + redeliver gives out-of-order delivery and duplicates, all correctly signed", async () => {
    const { fake, stripe, hook } = await setup();
    const { subId } = await payCheckout(fake, stripe);
    await fake.waitForDeliveries(5000);
    const base = hook.received.length;
    const pause = await fetch(`${fake.url}/_fake/deliveries/pause`, { method: "POST" });
    expect(pause.status).toBe(200);
    await stripe.subscriptions.update(subId, { metadata: { seats_note: "5 seats" } });
    await stripe.subscriptions.cancel(subId);
    await new Promise((r) => setTimeout(r, 100));
    expect(hook.received.length).toBe(base);
    const log = (await (await fetch(`${fake.url}/_fake/events`)).json()) as { paused: boolean; data: { id: string; type: string; delivery: { status: string } }[] };
    expect(log.paused).toBe(true);
    const updated = log.data.find((e) => e.type === "customer.subscription.updated" && e.delivery.status === "pending");
    const deleted = log.data.find((e) => e.type === "customer.subscription.deleted");
    expect(updated && deleted).toBeTruthy();
    // Newer first: deleted arrives before the update that preceded it.
    const r1 = await fetch(`${fake.url}/_fake/events/${deleted?.id}/redeliver`, { method: "POST" });
    expect(((await r1.json()) as { attempt: { ok: boolean } }).attempt.ok).toBe(true);
    await fetch(`${fake.url}/_fake/events/${updated?.id}/redeliver`, { method: "POST" });
    await fetch(`${fake.url}/_fake/deliveries/resume`, { method: "POST" });
    const waited = (await (await fetch(`${fake.url}/_fake/deliveries/wait?timeout_ms=5000`, { method: "POST" })).json()) as { idle: boolean };
    expect(waited.idle).toBe(true);
    const events = hook.verified(SECRET).slice(base);
    expect(events.map((e) => e.id)).toEqual([deleted?.id, updated?.id, updated?.id, deleted?.id]);
    expect(types(events)).toEqual(["customer.subscription.deleted", "customer.subscription.updated", "customer.subscription.updated", "customer.subscription.deleted"]);
    // The stale update still shows the subscription active: a receiver must not resurrect it.
    expect((events[1].data.object as Stripe.Subscription).status).toBe("active");
    expect((events[0].data.object as Stripe.Subscription).status).toBe("canceled");
  });

  it("delivers nothing and says so when no endpoint is configured, and can be configured later", async () => {
    const fake = await startStripeFake({ port: 0 });
    cleanups.push(() => fake.close());
    const stripe = sdkFor(fake);
    await stripe.customers.create({ email: "quiet@firm.example" });
    expect(fake.deliveries().map((d) => d.status)).toEqual(["no_endpoint"]);
    const hook = await startWebhookReceiver();
    cleanups.push(() => hook.close());
    const cfg = await fetch(`${fake.url}/_fake/config`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ webhook_url: hook.url, webhook_secret: SECRET }) });
    expect(cfg.status).toBe(200);
    await stripe.customers.create({ email: "loud@firm.example" });
    await fake.waitForDeliveries(5000);
    expect(types(hook.verified(SECRET))).toEqual(["customer.created"]);
  });
});

describe("state and CLI", () => {
  it("keeps its state in a file across a restart", async () => {
    const dir = mkdtempSync(join(tmpdir(), "stripe-fake-"));
    cleanups.push(async () => rmSync(dir, { recursive: true, force: true }));
    const file = join(dir, "state.json");
    const a = await startStripeFake({ port: 0, stateFile: file });
    const c = await sdkFor(a).customers.create({ email: "persist@firm.example" });
    await a.close();
    const b = await startStripeFake({ port: 0, stateFile: file });
    cleanups.push(() => b.close());
    const again = (await sdkFor(b).customers.retrieve(c.id)) as Stripe.Customer;
    expect(again.email).toBe("persist@firm.example");
    const list = await sdkFor(b).customers.create({ email: "second@firm.example" });
    expect((await sdkFor(b).customers.list()).data.map((x) => x.id)).toEqual([list.id, c.id]);
  });

  it("starts from the command line with flags and answers /_fake/health", async () => {
    const child = spawn(process.execPath, ["--import", "tsx", "fakes/stripe/server.ts", "--port", "0", "--webhook-url", "http://127.0.0.1:9/hook", "--webhook-secret", SECRET], {
      cwd: join(__dirname, "..", ".."),
      stdio: ["ignore", "pipe", "pipe"],
    });
    cleanups.push(async () => {
      if (child.exitCode === null) {
        const exited = new Promise((r) => child.once("exit", r));
        child.kill("SIGTERM");
        await exited;
      }
    });
    const url = await new Promise<string>((resolve, reject) => {
      let out = "";
      const timer = setTimeout(() => reject(new Error(`no start line; output: ${out}`)), 20_000);
      child.stdout.on("data", (d: Buffer) => {
        out += d.toString();
        const m = /listening on (http:\/\/[^\s]+)/.exec(out);
        if (m) {
          clearTimeout(timer);
          resolve(m[1]);
        }
      });
      child.stderr.on("data", (d: Buffer) => (out += d.toString()));
    });
    const health = (await (await fetch(`${url}/_fake/health`)).json()) as { ok: boolean; webhook_url: string; api_version: string };
    expect(health).toMatchObject({ ok: true, webhook_url: "http://127.0.0.1:9/hook", api_version: Stripe.API_VERSION });
  });
});
