/**
 * Subscribing: the owner picks packs and seats, we open a Stripe Checkout Session in
 * subscription mode (one line item per pack price, or the bundle; quantity = seats) for the
 * workspace's one Stripe customer, and Stripe's hosted page takes the payment. The webhook
 * applies the new subscription; the return to the billing page applies it too, so the owner
 * sees it at once even when the webhook is slower.
 */
import { createHash } from "node:crypto";
import { and, eq, isNull } from "drizzle-orm";
import { workspaces } from "@/db/schema";
import { write } from "@/db/write";
import { auditInsert } from "@/lib/audit";
import type { WorkspaceContext } from "@/lib/auth/guard";
import { appUrl } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { plansForPacks } from "./plans";
import { checkoutSchema, type CheckoutInput } from "./schemas";
import { assertSeatsCoverMembers } from "./seats";
import { callStripe } from "./stripe";
import { hasLiveSubscription, syncSubscription, type SyncResult } from "./subscription";

export { checkoutSchema, type CheckoutInput };

/** The billing page of a workspace, absolute, with an optional query string. */
export function billingPageUrl(slug: string, query = ""): string {
  return `${appUrl()}/w/${encodeURIComponent(slug)}/billing${query}`;
}

/**
 * The workspace's Stripe customer id, creating the customer once (metadata workspaceId). Two
 * concurrent first checkouts create one customer (same idempotency key) and store it once.
 */
export async function ensureCustomer(ctx: WorkspaceContext): Promise<string> {
  const ws = ctx.workspace;
  if (ws.stripeCustomerId) return ws.stripeCustomerId;
  const params = { name: ws.name, email: ctx.user.email, metadata: { workspaceId: ws.id, workspaceSlug: ws.slug } };
  const key = `loopwright-customer-${ws.id}-${createHash("sha256").update(JSON.stringify(params)).digest("hex").slice(0, 16)}`;
  const customer = await callStripe("create the billing account", (s) => s.customers.create(params, { idempotencyKey: key }));
  return write(async (db) => {
    await db.update(workspaces).set({ stripeCustomerId: customer.id }).where(and(eq(workspaces.id, ws.id), isNull(workspaces.stripeCustomerId)));
    const row = await db.query.workspaces.findFirst({ where: eq(workspaces.id, ws.id), columns: { stripeCustomerId: true } });
    return row?.stripeCustomerId ?? customer.id;
  });
}

/**
 * Opens a Checkout Session for `input` and returns its hosted page URL. Refuses (nothing
 * changed, no Stripe call) when a subscription is already running or the seats do not cover
 * the seat members.
 */
export async function startCheckout(ctx: WorkspaceContext, input: CheckoutInput): Promise<{ url: string; sessionId: string }> {
  const ws = ctx.workspace;
  if (hasLiveSubscription(ws)) {
    throw new AppError("conflict", "This workspace already has a subscription. Change seats with Add seats, or packs and payment under Manage billing.");
  }
  await assertSeatsCoverMembers(ws, input.seats);
  const plans = plansForPacks(input.packs);
  const customer = await ensureCustomer(ctx);
  const session = await callStripe("open the checkout page", async (s) => {
    const prices = await s.prices.list({ lookup_keys: plans.map((p) => p.lookupKey), active: true, limit: 10 });
    const byKey = new Map(prices.data.map((p) => [p.lookup_key, p.id]));
    const missing = plans.filter((p) => !byKey.has(p.lookupKey));
    if (missing.length > 0) {
      throw new AppError(
        "unavailable",
        `Billing is not set up: Stripe has no price for ${missing.map((p) => p.title).join(", ")}. An administrator must run \`npx tsx scripts/stripe-sync.ts\`.`,
      );
    }
    return s.checkout.sessions.create({
      mode: "subscription",
      customer,
      client_reference_id: ws.id,
      metadata: { workspaceId: ws.id },
      subscription_data: { metadata: { workspaceId: ws.id } },
      line_items: plans.map((p) => ({ price: byKey.get(p.lookupKey) as string, quantity: input.seats })),
      success_url: billingPageUrl(ws.slug, "?checkout=success&session_id={CHECKOUT_SESSION_ID}"),
      cancel_url: billingPageUrl(ws.slug, "?checkout=cancelled"),
    });
  });
  if (!session.url) throw new AppError("unavailable", "The payment service did not return a checkout page. Nothing was charged; please try again.");
  await write((db) =>
    db.batch([
      auditInsert(db, {
        workspaceId: ws.id,
        actorId: ctx.user.id,
        action: "billing.checkout_started",
        targetType: "workspace",
        targetId: ws.id,
        data: { sessionId: session.id, packs: input.packs, plans: plans.map((p) => p.id), seats: input.seats },
      }),
    ]),
  );
  return { url: session.url, sessionId: session.id };
}

const SESSION_ID = /^cs_[A-Za-z0-9_]{1,200}$/;

/**
 * After the hosted page sends the owner back: if the session is this workspace's and complete,
 * fetch its subscription and apply it now. Returns null when there was nothing to apply yet.
 */
export async function syncAfterCheckout(ctx: WorkspaceContext, sessionId: string): Promise<SyncResult | null> {
  if (!SESSION_ID.test(sessionId)) return null;
  const session = await callStripe("confirm the checkout", (s) => s.checkout.sessions.retrieve(sessionId));
  if (session.client_reference_id !== ctx.workspace.id || session.status !== "complete" || !session.subscription) return null;
  const subscriptionId = typeof session.subscription === "string" ? session.subscription : session.subscription.id;
  return syncSubscription({ workspaceId: ctx.workspace.id, subscriptionId, actorId: ctx.user.id, reason: "checkout_return" });
}
