/**
 * The fake's API through the official SDK (stripe 23.1.0): create / retrieve / update / list
 * with pagination for each resource, Stripe-shaped errors and the SDK's error classes,
 * lookup_keys search and idempotency keys.
 */
import Stripe from "stripe";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { startStripeFake, type StripeFake } from "./server";
import { sdkFor } from "./testing";

let fake: StripeFake;
let stripe: Stripe;

beforeAll(async () => {
  fake = await startStripeFake({ port: 0 });
  stripe = sdkFor(fake);
});
afterAll(async () => {
  await fake.close();
});
beforeEach(() => {
  fake.reset();
});

/** Rejects with the SDK error `call` throws (fails the test if it succeeds). */
async function sdkError(call: Promise<unknown>): Promise<Stripe.errors.StripeError> {
  try {
    await call;
  } catch (err) {
    if (err instanceof Stripe.errors.StripeError) return err;
    throw err;
  }
  throw new Error("expected the call to fail");
}

async function catalog(): Promise<{ product: Stripe.Product; price: Stripe.Price }> {
  const product = await stripe.products.create({ id: "amplifier_pack", name: "Amplifier pack" });
  const price = await stripe.prices.create({ product: product.id, currency: "usd", unit_amount: 4900, recurring: { interval: "month" }, lookup_key: "amplifier_monthly" });
  return { product, price };
}

/** A subscription made through checkout (completed via the control endpoint). */
async function subscribed(quantity = 3): Promise<{ sub: Stripe.Subscription; price: Stripe.Price; customer: string }> {
  const { price } = await catalog();
  const cs = await stripe.checkout.sessions.create({
    mode: "subscription",
    line_items: [{ price: price.id, quantity }],
    customer_email: "lead@firm.example",
    success_url: "http://127.0.0.1:1/ok?session={CHECKOUT_SESSION_ID}",
    subscription_data: { metadata: { workspace_id: "ws_1" } },
  });
  const res = await fetch(`${fake.url}/_fake/checkout/${cs.id}/complete`, { method: "POST" });
  expect(res.status).toBe(200);
  const done = await stripe.checkout.sessions.retrieve(cs.id, { expand: ["subscription"] });
  const sub = done.subscription as Stripe.Subscription;
  return { sub, price, customer: sub.customer as string };
}

describe("customers", () => {
  it("creates, retrieves, updates metadata (\"\" removes a key) and lists by email", async () => {
    const c = await stripe.customers.create({ email: "a@firm.example", name: "Ada Firm", metadata: { workspace_id: "ws_1", plan: "x" } });
    expect(c.id).toMatch(/^cus_/);
    expect(c).toMatchObject({ object: "customer", livemode: false, email: "a@firm.example", name: "Ada Firm" });
    expect(Math.abs(c.created - Date.now() / 1000)).toBeLessThan(5);
    await stripe.customers.create({ email: "b@firm.example" });
    const got = await stripe.customers.retrieve(c.id);
    expect(got.deleted).toBeUndefined();
    expect((got as Stripe.Customer).metadata).toEqual({ workspace_id: "ws_1", plan: "x" });
    const upd = await stripe.customers.update(c.id, { name: "Ada F.", metadata: { plan: "", extra: "1" } });
    expect(upd.name).toBe("Ada F.");
    expect(upd.metadata).toEqual({ workspace_id: "ws_1", extra: "1" });
    const byEmail = await stripe.customers.list({ email: "a@firm.example" });
    expect(byEmail.data.map((x) => x.id)).toEqual([c.id]);
    expect(byEmail).toMatchObject({ object: "list", has_more: false, url: "/v1/customers" });
  });

  it("paginates newest first with limit and starting_after, and the SDK's auto-pagination sees each once", async () => {
    const ids: string[] = [];
    for (let i = 0; i < 5; i++) ids.push((await stripe.customers.create({ email: `c${i}@firm.example` })).id);
    const newestFirst = [...ids].reverse();
    const page1 = await stripe.customers.list({ limit: 2 });
    expect(page1.data.map((c) => c.id)).toEqual(newestFirst.slice(0, 2));
    expect(page1.has_more).toBe(true);
    const page2 = await stripe.customers.list({ limit: 2, starting_after: page1.data[1].id });
    expect(page2.data.map((c) => c.id)).toEqual(newestFirst.slice(2, 4));
    const page3 = await stripe.customers.list({ limit: 2, starting_after: page2.data[1].id });
    expect(page3.data.map((c) => c.id)).toEqual(newestFirst.slice(4));
    expect(page3.has_more).toBe(false);
    const back = await stripe.customers.list({ limit: 2, ending_before: newestFirst[4] });
    expect(back.data.map((c) => c.id)).toEqual(newestFirst.slice(2, 4));
    const all = await stripe.customers.list({ limit: 2 }).autoPagingToArray({ limit: 100 });
    expect(all.map((c) => c.id)).toEqual(newestFirst);
  });

  it("deletes a customer", async () => {
    const c = await stripe.customers.create({ email: "gone@firm.example" });
    const del = await stripe.customers.del(c.id);
    expect(del).toMatchObject({ id: c.id, object: "customer", deleted: true });
    const err = await sdkError(stripe.customers.retrieve(c.id));
    expect(err.statusCode).toBe(404);
  });
});

describe("products and prices", () => {
  it("creates a product with its own id, refuses the id twice, updates and lists with active filter", async () => {
    const p = await stripe.products.create({ id: "filter_pack", name: "Active filter pack", metadata: { pack: "filter" } });
    expect(p).toMatchObject({ id: "filter_pack", object: "product", active: true, name: "Active filter pack", type: "service" });
    const dup = await sdkError(stripe.products.create({ id: "filter_pack", name: "again" }));
    expect(dup).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(dup.code).toBe("resource_already_exists");
    const q = await stripe.products.create({ name: "Reference pack" });
    expect(q.id).toMatch(/^prod_/);
    const upd = await stripe.products.update(q.id, { active: false, name: "Reference pack (old)" });
    expect(upd).toMatchObject({ active: false, name: "Reference pack (old)" });
    expect((await stripe.products.retrieve(q.id)).active).toBe(false);
    const active = await stripe.products.list({ active: true });
    expect(active.data.map((x) => x.id)).toEqual(["filter_pack"]);
    const all = await stripe.products.list({ limit: 1 });
    expect(all.data).toHaveLength(1);
    expect(all.has_more).toBe(true);
  });

  it("creates recurring prices in the SDK's shape and finds them by lookup_keys and active", async () => {
    const { product, price } = await catalog();
    expect(price.id).toMatch(/^price_/);
    expect(price).toMatchObject({ object: "price", product: product.id, currency: "usd", unit_amount: 4900, type: "recurring", lookup_key: "amplifier_monthly", active: true });
    expect(price.recurring).toMatchObject({ interval: "month", interval_count: 1, usage_type: "licensed" });
    // The SDK turns unit_amount_decimal (a decimal string on the wire) into its Decimal type.
    expect(price.unit_amount_decimal?.toString()).toBe("4900");
    const yearly = await stripe.prices.create({ product: product.id, currency: "usd", unit_amount: 49000, recurring: { interval: "year" }, lookup_key: "amplifier_yearly", metadata: { seats: "per_seat" } });
    const old = await stripe.prices.create({ product: product.id, currency: "usd", unit_amount: 3900, recurring: { interval: "month" }, active: false });
    const found = await stripe.prices.list({ lookup_keys: ["amplifier_monthly", "amplifier_yearly"], expand: ["data.product"] });
    expect(found.data.map((x) => x.id).sort()).toEqual([price.id, yearly.id].sort());
    expect((found.data[0].product as Stripe.Product).name).toBe("Amplifier pack");
    const inactive = await stripe.prices.list({ active: false });
    expect(inactive.data.map((x) => x.id)).toEqual([old.id]);
    const upd = await stripe.prices.update(old.id, { metadata: { retired: "yes" }, nickname: "2025 price" });
    expect(upd).toMatchObject({ nickname: "2025 price", metadata: { retired: "yes" } });
    expect((await stripe.prices.retrieve(old.id)).nickname).toBe("2025 price");
  });

  it("refuses a lookup key in use unless transfer_lookup_key moves it", async () => {
    const { product, price } = await catalog();
    const taken = await sdkError(stripe.prices.create({ product: product.id, currency: "usd", unit_amount: 5900, recurring: { interval: "month" }, lookup_key: "amplifier_monthly" }));
    expect(taken).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(taken.param).toBe("lookup_key");
    const moved = await stripe.prices.create({ product: product.id, currency: "usd", unit_amount: 5900, recurring: { interval: "month" }, lookup_key: "amplifier_monthly", transfer_lookup_key: true });
    const found = await stripe.prices.list({ lookup_keys: ["amplifier_monthly"] });
    expect(found.data.map((x) => x.id)).toEqual([moved.id]);
    expect((await stripe.prices.retrieve(price.id)).lookup_key).toBeNull();
  });
});

describe("errors", () => {
  it("answers 401 in Stripe's shape without a key, and the SDK raises StripeAuthenticationError for a non-test key", async () => {
    const res = await fetch(`${fake.url}/v1/customers`);
    expect(res.status).toBe(401);
    const body = (await res.json()) as { error: { type: string; message: string } };
    expect(body.error.type).toBe("invalid_request_error");
    expect(body.error.message).toMatch(/did not provide an API key/);
    const live = new Stripe("sk_live_not_allowed_here", { ...fake.sdkConfig, maxNetworkRetries: 0 });
    const err = await sdkError(live.customers.list());
    expect(err).toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
    expect(err.statusCode).toBe(401);
  });

  it("gives StripeInvalidRequestError with param and code for a missing param, an unknown id and an unknown param", async () => {
    const missing = await sdkError(stripe.products.create({} as Stripe.ProductCreateParams));
    expect(missing).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(missing).toMatchObject({ statusCode: 400, param: "name", code: "parameter_missing", type: "StripeInvalidRequestError" });
    const unknownId = await sdkError(stripe.subscriptions.retrieve("sub_does_not_exist"));
    expect(unknownId).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(unknownId).toMatchObject({ statusCode: 404, code: "resource_missing", param: "id" });
    expect(unknownId.message).toBe("No such subscription: 'sub_does_not_exist'");
    const unknownParam = await sdkError(stripe.customers.create({ emial: "typo@firm.example" } as Stripe.CustomerCreateParams));
    expect(unknownParam).toMatchObject({ statusCode: 400, param: "emial", code: "parameter_unknown" });
    expect(unknownParam.requestId).toMatch(/^req_/);
  });

  it("names the nested param for an unknown price and a quantity below 1 in checkout", async () => {
    const { price } = await catalog();
    const base = { mode: "subscription" as const, success_url: "http://127.0.0.1:1/ok" };
    const noPrice = await sdkError(stripe.checkout.sessions.create({ ...base, line_items: [{ price: "price_missing", quantity: 1 }] }));
    expect(noPrice).toMatchObject({ statusCode: 400, param: "line_items[0][price]", code: "resource_missing" });
    const zero = await sdkError(stripe.checkout.sessions.create({ ...base, line_items: [{ price: price.id, quantity: 0 }] }));
    expect(zero).toMatchObject({ statusCode: 400, param: "line_items[0][quantity]" });
    const noItems = await sdkError(stripe.checkout.sessions.create({ ...base }));
    expect(noItems).toMatchObject({ param: "line_items", code: "parameter_missing" });
    const both = await sdkError(stripe.checkout.sessions.create({ ...base, line_items: [{ price: price.id }], customer: "cus_x", customer_email: "a@firm.example" }));
    expect(both.statusCode).toBe(400);
  });

  it("refuses a param Stripe knows but the fake does not implement, saying so", async () => {
    await catalog();
    const err = await sdkError(
      stripe.checkout.sessions.create({ mode: "subscription", success_url: "http://127.0.0.1:1/ok", line_items: [{ price: (await stripe.prices.list()).data[0].id }], discounts: [{ coupon: "x" }] }),
    );
    expect(err).toMatchObject({ statusCode: 400, param: "discounts", code: "parameter_unsupported_by_fake" });
    expect(err.message).toMatch(/does not implement/);
  });
});

describe("idempotency keys", () => {
  it("returns the same response for the same key and creates the object once", async () => {
    const a = await stripe.customers.create({ email: "once@firm.example" }, { idempotencyKey: "signup-ws_1" });
    const b = await stripe.customers.create({ email: "once@firm.example" }, { idempotencyKey: "signup-ws_1" });
    expect(b.id).toBe(a.id);
    expect(b.lastResponse.headers["idempotent-replayed"]).toBe("true");
    expect(a.lastResponse.headers["idempotent-replayed"]).toBeUndefined();
    const all = await stripe.customers.list({ email: "once@firm.example" });
    expect(all.data).toHaveLength(1);
    const other = await stripe.customers.create({ email: "once@firm.example" }, { idempotencyKey: "signup-ws_2" });
    expect(other.id).not.toBe(a.id);
  });

  it("raises StripeIdempotencyError when a key is reused with other params", async () => {
    await stripe.customers.create({ email: "x@firm.example" }, { idempotencyKey: "k-1" });
    const err = await sdkError(stripe.customers.create({ email: "y@firm.example" }, { idempotencyKey: "k-1" }));
    expect(err).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
    expect(err.statusCode).toBe(400);
  });
});

describe("checkout sessions", () => {
  it("creates a session whose url is the fake's pay page and retrieves it with expand", async () => {
    const { price } = await catalog();
    const customer = await stripe.customers.create({ email: "owner@firm.example" });
    const cs = await stripe.checkout.sessions.create({
      mode: "subscription",
      customer: customer.id,
      client_reference_id: "ws_42",
      line_items: [{ price: price.id, quantity: 4 }],
      metadata: { workspace_id: "ws_42" },
      success_url: "http://127.0.0.1:1/billing/done?session_id={CHECKOUT_SESSION_ID}",
      cancel_url: "http://127.0.0.1:1/billing",
    });
    expect(cs.id).toMatch(/^cs_test_/);
    expect(cs.url).toBe(`${fake.url}/checkout/${cs.id}`);
    expect(cs).toMatchObject({ object: "checkout.session", mode: "subscription", status: "open", payment_status: "unpaid", amount_total: 4 * 4900, currency: "usd", client_reference_id: "ws_42", subscription: null });
    const got = await stripe.checkout.sessions.retrieve(cs.id, { expand: ["customer", "line_items"] });
    expect((got.customer as Stripe.Customer).email).toBe("owner@firm.example");
    expect(got.line_items?.data[0]).toMatchObject({ object: "item", quantity: 4, amount_total: 19600 });
    const items = await stripe.checkout.sessions.listLineItems(cs.id);
    expect(items.data[0].price?.id).toBe(price.id);
    const list = await stripe.checkout.sessions.list({ customer: customer.id });
    expect(list.data.map((s) => s.id)).toEqual([cs.id]);
    const expired = await stripe.checkout.sessions.expire(cs.id);
    expect(expired.status).toBe("expired");
    const bad = await sdkError(stripe.checkout.sessions.retrieve(cs.id, { expand: ["no_such_field"] }));
    expect(bad.param).toBe("expand");
  });
});

describe("subscriptions, items and invoices", () => {
  it("has current_period_end on subscription items (this API version) and lists by customer and status", async () => {
    const { sub, customer, price } = await subscribed(3);
    expect(sub.id).toMatch(/^sub_/);
    expect(sub).toMatchObject({ object: "subscription", status: "active", cancel_at_period_end: false, customer, metadata: { workspace_id: "ws_1" }, currency: "usd" });
    expect("current_period_end" in sub).toBe(false);
    const item = sub.items.data[0];
    expect(item.id).toMatch(/^si_/);
    expect(item).toMatchObject({ object: "subscription_item", quantity: 3, subscription: sub.id });
    expect(item.price.id).toBe(price.id);
    // One month after the start (calendar month, same day-of-month): between 28 and 31 days.
    const days = (item.current_period_end - item.current_period_start) / 86400;
    expect(days).toBeGreaterThanOrEqual(28);
    expect(days).toBeLessThanOrEqual(31);
    const mine = await stripe.subscriptions.list({ customer });
    expect(mine.data.map((s) => s.id)).toEqual([sub.id]);
    const none = await stripe.subscriptions.list({ customer, status: "past_due" });
    expect(none.data).toHaveLength(0);
  });

  it("updates quantity via items[0], adds and deletes an item, schedules cancellation and cancels", async () => {
    const { sub, price } = await subscribed(3);
    const filter = await stripe.products.create({ name: "Active filter pack" });
    const filterPrice = await stripe.prices.create({ product: filter.id, currency: "usd", unit_amount: 2900, recurring: { interval: "month" } });
    const more = await stripe.subscriptions.update(sub.id, { items: [{ id: sub.items.data[0].id, quantity: 5 }, { price: filterPrice.id, quantity: 5 }], proration_behavior: "create_prorations" });
    expect(more.items.data.map((i) => [i.price.id, i.quantity])).toEqual([
      [price.id, 5],
      [filterPrice.id, 5],
    ]);
    const zero = await sdkError(stripe.subscriptions.update(sub.id, { items: [{ id: sub.items.data[0].id, quantity: 0 }] }));
    expect(zero).toMatchObject({ statusCode: 400, param: "items[0][quantity]" });
    const dupe = await sdkError(stripe.subscriptions.update(sub.id, { items: [{ price: price.id }] }));
    expect(dupe.param).toBe("items[0][price]");
    const fewer = await stripe.subscriptions.update(sub.id, { items: [{ id: more.items.data[1].id, deleted: true }] });
    expect(fewer.items.data).toHaveLength(1);
    const updatesBefore = (await stripe.events.list({ type: "customer.subscription.updated", limit: 100 })).data.length;
    const last = await sdkError(stripe.subscriptions.update(sub.id, { items: [{ id: sub.items.data[0].id, deleted: true }], metadata: { half: "applied" } }));
    expect(last.param).toBe("items");
    // A refused request changes nothing and emits nothing.
    const unchanged = await stripe.subscriptions.retrieve(sub.id);
    expect(unchanged.items.data).toHaveLength(1);
    expect(unchanged.metadata.half).toBeUndefined();
    expect((await stripe.events.list({ type: "customer.subscription.updated", limit: 100 })).data.length).toBe(updatesBefore);
    const scheduled = await stripe.subscriptions.update(sub.id, { cancel_at_period_end: true, metadata: { reason: "closing" } });
    expect(scheduled).toMatchObject({ cancel_at_period_end: true, status: "active", cancel_at: sub.items.data[0].current_period_end, metadata: { workspace_id: "ws_1", reason: "closing" } });
    const canceled = await stripe.subscriptions.cancel(sub.id);
    expect(canceled.status).toBe("canceled");
    expect(canceled.ended_at).not.toBeNull();
    expect((await stripe.subscriptions.list()).data).toHaveLength(0);
    expect((await stripe.subscriptions.list({ status: "canceled" })).data.map((s) => s.id)).toEqual([sub.id]);
    const again = await sdkError(stripe.subscriptions.update(sub.id, { items: [{ id: sub.items.data[0].id, quantity: 2 }] }));
    expect(again.statusCode).toBe(400);
  });

  it("retrieves, lists and updates subscription items", async () => {
    const { sub } = await subscribed(2);
    const si = sub.items.data[0];
    const got = await stripe.subscriptionItems.retrieve(si.id);
    expect(got).toMatchObject({ id: si.id, quantity: 2 });
    const upd = await stripe.subscriptionItems.update(si.id, { quantity: 7, proration_behavior: "none" });
    expect(upd.quantity).toBe(7);
    expect((await stripe.subscriptions.retrieve(sub.id)).items.data[0].quantity).toBe(7);
    const list = await stripe.subscriptionItems.list({ subscription: sub.id });
    expect(list.data.map((x) => x.id)).toEqual([si.id]);
    const noSub = await sdkError(stripe.subscriptionItems.list({} as Stripe.SubscriptionItemListParams));
    expect(noSub).toMatchObject({ param: "subscription", code: "parameter_missing" });
    const bad = await sdkError(stripe.subscriptionItems.update(si.id, { quantity: -1 }));
    expect(bad.param).toBe("quantity");
  });

  it("ends a trial with trial_end=now (first paid invoice) and deletes a subscription item", async () => {
    const { price } = await catalog();
    const extra = await stripe.prices.create({ product_data: { name: "Reference pack" }, currency: "usd", unit_amount: 1900, recurring: { interval: "month" } });
    const cs = await stripe.checkout.sessions.create({
      mode: "subscription",
      line_items: [{ price: price.id, quantity: 2 }, { price: extra.id, quantity: 2 }],
      customer_email: "trial@firm.example",
      success_url: "http://127.0.0.1:1/ok",
      subscription_data: { trial_period_days: 30 },
    });
    await fetch(`${fake.url}/_fake/checkout/${cs.id}/complete`, { method: "POST" });
    const subId = (await stripe.checkout.sessions.retrieve(cs.id)).subscription as string;
    expect((await stripe.subscriptions.retrieve(subId)).status).toBe("trialing");
    const ended = await stripe.subscriptions.update(subId, { trial_end: "now", expand: ["latest_invoice"] });
    expect(ended.status).toBe("active");
    // 2 × 49.00 + 2 × 19.00 = 136.00 USD.
    expect((ended.latest_invoice as Stripe.Invoice)).toMatchObject({ status: "paid", amount_paid: 13600 });
    const del = await stripe.subscriptionItems.del(ended.items.data[1].id);
    expect(del).toMatchObject({ object: "subscription_item", deleted: true });
    expect((await stripe.subscriptions.retrieve(subId)).items.data.map((i) => i.price.id)).toEqual([price.id]);
  });

  it("lists and retrieves invoices by customer and subscription, with a hosted page", async () => {
    const { sub, customer } = await subscribed(3);
    const invoices = await stripe.invoices.list({ customer });
    expect(invoices.data).toHaveLength(1);
    const inv = invoices.data[0];
    expect(inv.id).toMatch(/^in_/);
    expect(inv).toMatchObject({ object: "invoice", status: "paid", amount_due: 14700, amount_paid: 14700, amount_remaining: 0, billing_reason: "subscription_create", customer, currency: "usd" });
    expect(inv.parent?.subscription_details?.subscription).toBe(sub.id);
    expect(inv.lines.data[0]).toMatchObject({ amount: 14700, quantity: 3 });
    expect(inv.lines.data[0].period.end).toBe(sub.items.data[0].current_period_end);
    expect((await stripe.invoices.list({ subscription: sub.id })).data.map((i) => i.id)).toEqual([inv.id]);
    expect((await stripe.invoices.list({ subscription: "sub_other" })).data).toHaveLength(0);
    const got = await stripe.invoices.retrieve(inv.id, { expand: ["customer"] });
    expect((got.customer as Stripe.Customer).id).toBe(customer);
    expect(sub.latest_invoice).toBe(inv.id);
    const page = await fetch(inv.hosted_invoice_url as string);
    expect(page.status).toBe(200);
    expect(await page.text()).toContain("147.00 USD");
  });

  it("retrieves and lists events, filtered by type", async () => {
    const { sub } = await subscribed(1);
    const events = await stripe.events.list({ type: "customer.subscription.created" });
    expect(events.data).toHaveLength(1);
    const ev = events.data[0];
    expect(ev.id).toMatch(/^evt_/);
    expect(ev).toMatchObject({ object: "event", api_version: Stripe.API_VERSION, livemode: false, type: "customer.subscription.created" });
    expect((ev.data.object as Stripe.Subscription).id).toBe(sub.id);
    const again = await stripe.events.retrieve(ev.id);
    expect(again.id).toBe(ev.id);
    const wildcard = await stripe.events.list({ type: "invoice.*", limit: 100 });
    expect(new Set(wildcard.data.map((e) => e.type))).toEqual(new Set(["invoice.created", "invoice.finalized", "invoice.paid", "invoice.payment_succeeded"]));
  });

  it("creates a billing portal session for a known customer only", async () => {
    const { customer } = await subscribed(1);
    const portal = await stripe.billingPortal.sessions.create({ customer, return_url: "http://127.0.0.1:1/billing" });
    expect(portal.id).toMatch(/^bps_/);
    expect(portal).toMatchObject({ object: "billing_portal.session", customer, return_url: "http://127.0.0.1:1/billing", url: `${fake.url}/portal/${portal.id}` });
    const err = await sdkError(stripe.billingPortal.sessions.create({ customer: "cus_unknown" }));
    expect(err).toMatchObject({ statusCode: 400, param: "customer", code: "resource_missing" });
  });
});
