/**
 * The hosted billing portal (payment method, seats, cancellation, invoices) and the read side
 * of billing: invoices from Stripe, and the summary the billing page and GET route show.
 */
import type { WorkspaceContext } from "@/lib/auth/guard";
import type { Workspace } from "@/db/schema";
import type { PackId } from "@/lib/calc/core/types";
import { AppError } from "@/lib/errors";
import { accessState, unlockedPacks, type AccessMode } from "./access";
import { billingPageUrl } from "./checkout";
import { PACK_IDS, monthlyTotal, packTitle } from "./plans";
import { seatUsage, type SeatUsage } from "./seats";
import { callStripe } from "./stripe";
import { hasLiveSubscription, syncSubscription, type SyncResult } from "./subscription";

/** Opens a billing portal session for the workspace's customer and returns its URL. */
export async function openPortal(ctx: WorkspaceContext): Promise<{ url: string }> {
  const customer = ctx.workspace.stripeCustomerId;
  if (!customer) {
    throw new AppError("conflict", "There is no billing account yet: subscribe first, then Manage billing shows the payment method and invoices.");
  }
  const session = await callStripe("open the billing portal", (s) => s.billingPortal.sessions.create({ customer, return_url: billingPageUrl(ctx.workspace.slug, "?portal=return") }));
  return { url: session.url };
}

/** Re-fetch the workspace's subscription and apply it (after the owner returns from the portal). */
export async function syncCurrentSubscription(ctx: WorkspaceContext): Promise<SyncResult | null> {
  const sub = ctx.workspace.stripeSubscriptionId;
  if (!sub) return null;
  return syncSubscription({ workspaceId: ctx.workspace.id, subscriptionId: sub, actorId: ctx.user.id, reason: "portal_return" });
}

/** One invoice as the billing page lists it. Amounts in cents of `currency`; times in ms. */
export interface InvoiceRow {
  id: string;
  number: string | null;
  created: number;
  status: string;
  /** Paid amount for paid invoices, else the amount due. */
  amount: number;
  currency: string;
  /** Stripe's hosted page of the invoice, when it has one. */
  url: string | null;
  pdf: string | null;
}

/** The workspace's newest invoices (up to `limit`), straight from Stripe. */
export async function listInvoices(ws: Workspace, limit = 12): Promise<InvoiceRow[]> {
  const customer = ws.stripeCustomerId;
  if (!customer) return [];
  const list = await callStripe("list the invoices", (s) => s.invoices.list({ customer, limit }));
  return list.data.map((inv) => ({
    id: inv.id,
    number: inv.number,
    created: inv.created * 1000,
    status: inv.status ?? "draft",
    amount: inv.status === "paid" ? inv.amount_paid : inv.amount_due,
    currency: inv.currency,
    url: inv.hosted_invoice_url ?? null,
    pdf: inv.invoice_pdf ?? null,
  }));
}

/** Everything the billing page shows. Times in ms; money in cents. */
export interface BillingSummary {
  status: Workspace["subscriptionStatus"];
  /** A plain sentence: "Trial until 2026-05-14", "Active, renews on …", "Cancelled". */
  statusText: string;
  access: { mode: AccessMode; message: string | null; graceEndsAt: number | null };
  packs: Array<{ id: PackId; title: string; subscribed: boolean; unlocked: boolean }>;
  seats: SeatUsage & { paid: number };
  trialEndsAt: number | null;
  currentPeriodEnd: number | null;
  cancelAtPeriodEnd: boolean;
  pastDueSince: number | null;
  /** A Stripe subscription is running (seats can change; no new checkout). */
  hasSubscription: boolean;
  /** A Stripe customer exists (the portal can open). */
  hasBillingAccount: boolean;
  /** Monthly total of the current packs and paid seats at today's prices, cents. */
  monthlyTotal: number | null;
}

function day(ms: number | null): string {
  return ms == null ? "—" : new Date(ms).toISOString().slice(0, 10);
}

/** The status of a workspace as a sentence for people. */
export function statusText(ws: Workspace, now = Date.now()): string {
  switch (ws.subscriptionStatus) {
    case "trialing":
      if (!ws.stripeSubscriptionId) return ws.trialEndsAt != null && ws.trialEndsAt <= now ? `Trial ended on ${day(ws.trialEndsAt)}` : `Trial until ${day(ws.trialEndsAt)}`;
      return `Trial until ${day(ws.trialEndsAt)}, then paid`;
    case "active":
      return ws.cancelAtPeriodEnd ? `Active, cancels on ${day(ws.currentPeriodEnd)}` : `Active, renews on ${day(ws.currentPeriodEnd)}`;
    case "past_due":
      return `Past due since ${day(ws.pastDueSince)}`;
    case "canceled":
      return "Cancelled";
    case "incomplete":
      return "First payment incomplete";
    case "unpaid":
      return "Unpaid";
    default:
      return "No subscription";
  }
}

/** The billing summary of the context's workspace. */
export async function billingSummary(ctx: WorkspaceContext, now = Date.now()): Promise<BillingSummary> {
  const ws = ctx.workspace;
  const access = accessState(ws, now);
  const unlocked = new Set(unlockedPacks(ws, now));
  const subscribed = new Set(ws.packs ?? []);
  const seats = await seatUsage(ws);
  const live = hasLiveSubscription(ws);
  return {
    status: ws.subscriptionStatus,
    statusText: statusText(ws, now),
    access: { mode: access.mode, message: access.message ?? null, graceEndsAt: access.graceEndsAt ?? null },
    packs: PACK_IDS.map((id) => ({ id, title: packTitle(id), subscribed: subscribed.has(id), unlocked: unlocked.has(id) })),
    seats: { ...seats, paid: ws.seatsPaid },
    trialEndsAt: ws.trialEndsAt,
    currentPeriodEnd: ws.currentPeriodEnd,
    cancelAtPeriodEnd: ws.cancelAtPeriodEnd,
    pastDueSince: ws.pastDueSince,
    hasSubscription: live,
    hasBillingAccount: ws.stripeCustomerId != null,
    monthlyTotal: live ? monthlyTotal(PACK_IDS.filter((p) => subscribed.has(p)), ws.seatsPaid) : null,
  };
}
