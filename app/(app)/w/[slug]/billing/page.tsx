import type { Metadata } from "next";
import { requirePageContext } from "@/lib/auth/page";
import type { WorkspaceContext } from "@/lib/auth/guard";
import { syncAfterCheckout } from "@/lib/billing/checkout";
import { billingSummary, listInvoices, syncCurrentSubscription, type InvoiceRow } from "@/lib/billing/portal";
import { PageHeader } from "@/app/_components/ui";
import { BillingView, type PageNotice } from "./_components/billing-view";

export const metadata: Metadata = { title: "Billing" };

type Query = Record<string, string | string[] | undefined>;
const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v);

/** Back from Stripe's hosted pages: apply what changed there now, and say what happened. */
async function handleReturn(ctx: WorkspaceContext, q: Query): Promise<PageNotice | null> {
  const checkout = one(q.checkout);
  if (checkout === "cancelled") return { tone: "info", text: "Checkout was cancelled. Nothing was charged and nothing changed." };
  try {
    if (checkout === "success") {
      const sessionId = one(q.session_id) ?? "";
      const r = await syncAfterCheckout(ctx, sessionId);
      return r
        ? { tone: "info", text: "Thank you: the subscription is in place and its packs are unlocked." }
        : { tone: "info", text: "Payment received. Stripe is still confirming it; this page shows the subscription as soon as it does." };
    }
    if (one(q.portal) === "return") {
      await syncCurrentSubscription(ctx);
      return { tone: "info", text: "Back from Manage billing: the status, seats and invoices below are up to date." };
    }
  } catch (err) {
    console.error("[loopwright] billing return sync", err instanceof Error ? err.message : err);
    return { tone: "info", text: "Stripe could not be reached just now. Your changes there are kept and will show here shortly." };
  }
  return null;
}

export default async function BillingPage({ params, searchParams }: { params: Promise<{ slug: string }>; searchParams: Promise<Query> }) {
  const { slug } = await params;
  const q = await searchParams;
  let ctx = await requirePageContext(slug, "billing.view", `/w/${slug}/billing`);
  const notice = await handleReturn(ctx, q);
  // The return may have changed the workspace's billing columns: read them again.
  if (notice) ctx = await requirePageContext(slug, "billing.view", `/w/${slug}/billing`);
  const summary = await billingSummary(ctx);
  let invoices: InvoiceRow[] = [];
  let invoicesError: string | null = null;
  try {
    invoices = await listInvoices(ctx.workspace);
  } catch (err) {
    invoicesError = err instanceof Error ? err.message : "The invoices could not be loaded.";
  }
  return (
    <>
      <PageHeader title="Billing" eyebrow={ctx.workspace.name}>
        Each pack is billed per seat per month. Owners, engineers and checkers use seats; clients are free.
      </PageHeader>
      <BillingView slug={slug} summary={summary} invoices={invoices} invoicesError={invoicesError} notice={notice} />
    </>
  );
}
