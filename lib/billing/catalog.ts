/**
 * Makes Stripe's products and prices match lib/billing/plans.ts, idempotently: products are
 * found by the id we give them, prices by lookup key. A second run changes nothing. A changed
 * amount creates a new price, moves the lookup key to it and archives the old price (Stripe
 * prices are immutable; running subscriptions keep their old price until changed).
 */
import type Stripe from "stripe";
import { CURRENCY, PLANS, type Plan } from "./plans";
import { isMissingResource } from "./stripe";

export interface CatalogChange {
  plan: Plan["id"];
  object: "product" | "price";
  action: "created" | "updated" | "replaced" | "unchanged";
  id: string;
}

function priceMatches(price: Stripe.Price, plan: Plan): boolean {
  const product = typeof price.product === "string" ? price.product : price.product.id;
  return (
    price.unit_amount === plan.unitAmount &&
    price.currency === CURRENCY &&
    price.recurring?.interval === "month" &&
    price.recurring.interval_count === 1 &&
    (price.recurring.usage_type ?? "licensed") === "licensed" &&
    product === plan.productId
  );
}

async function syncProduct(s: Stripe, plan: Plan): Promise<CatalogChange> {
  const wanted = { name: plan.title, description: plan.summary, metadata: { plan: plan.id, packs: plan.packs.join(",") } };
  let product: Stripe.Product | null = null;
  try {
    product = await s.products.retrieve(plan.productId);
  } catch (err) {
    if (!isMissingResource(err)) throw err;
  }
  if (!product) {
    await s.products.create({ id: plan.productId, ...wanted });
    return { plan: plan.id, object: "product", action: "created", id: plan.productId };
  }
  const same = product.active && product.name === wanted.name && product.description === wanted.description && product.metadata.plan === plan.id && product.metadata.packs === wanted.metadata.packs;
  if (same) return { plan: plan.id, object: "product", action: "unchanged", id: product.id };
  await s.products.update(product.id, { ...wanted, active: true });
  return { plan: plan.id, object: "product", action: "updated", id: product.id };
}

async function syncPrice(s: Stripe, plan: Plan): Promise<CatalogChange> {
  const found = await s.prices.list({ lookup_keys: [plan.lookupKey], limit: 1 });
  const current = found.data[0];
  if (current && priceMatches(current, plan)) {
    if (current.active) return { plan: plan.id, object: "price", action: "unchanged", id: current.id };
    await s.prices.update(current.id, { active: true });
    return { plan: plan.id, object: "price", action: "updated", id: current.id };
  }
  const created = await s.prices.create({
    product: plan.productId,
    currency: CURRENCY,
    unit_amount: plan.unitAmount,
    recurring: { interval: "month", interval_count: 1 },
    lookup_key: plan.lookupKey,
    transfer_lookup_key: current !== undefined,
    nickname: `${plan.title}, per seat per month`,
    metadata: { plan: plan.id, packs: plan.packs.join(",") },
  });
  if (current) {
    if (current.active) await s.prices.update(current.id, { active: false });
    return { plan: plan.id, object: "price", action: "replaced", id: created.id };
  }
  return { plan: plan.id, object: "price", action: "created", id: created.id };
}

/** Brings every plan's product and price in line; returns what it did, one entry per object. */
export async function syncCatalog(s: Stripe, plans: readonly Plan[] = PLANS): Promise<CatalogChange[]> {
  const out: CatalogChange[] = [];
  for (const plan of plans) {
    out.push(await syncProduct(s, plan));
    out.push(await syncPrice(s, plan));
  }
  return out;
}
