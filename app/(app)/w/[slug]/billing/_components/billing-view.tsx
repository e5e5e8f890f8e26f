"use client";

import { useState } from "react";
import { Button, Notice, Panel, Tag } from "@/app/_components/ui";
import { api, ApiError } from "@/lib/api-client";
import type { BillingSummary, InvoiceRow } from "@/lib/billing/portal";
import { formatMoney, plansForPacks } from "@/lib/billing/plans";
import { CheckoutForm } from "./checkout-form";
import { SeatsForm } from "./seats-form";
import { InvoicesTable } from "./invoices-table";

export interface PageNotice {
  tone: "info" | "error";
  text: string;
}

const STATUS_LABEL: Record<BillingSummary["status"], string> = {
  none: "No subscription",
  trialing: "Trial",
  active: "Active",
  past_due: "Past due",
  canceled: "Cancelled",
  incomplete: "Incomplete",
  unpaid: "Unpaid",
};

const day = (ms: number | null) => (ms == null ? "—" : new Date(ms).toISOString().slice(0, 10));

/** What follows the status word: the trial end, the next renewal, the grace end. */
function statusDetail(b: BillingSummary): string {
  switch (b.status) {
    case "trialing":
      return b.access.mode === "read_only" ? `ended on ${day(b.trialEndsAt)}` : `until ${day(b.trialEndsAt)}, every pack, no card needed`;
    case "active":
      return b.cancelAtPeriodEnd ? `cancels on ${day(b.currentPeriodEnd)}` : `renews on ${day(b.currentPeriodEnd)}`;
    case "past_due":
      return b.access.mode === "grace" ? `since ${day(b.pastDueSince)}; editing stays open until ${day(b.access.graceEndsAt)}` : `since ${day(b.pastDueSince)}; read-only until paid`;
    case "canceled":
      return "read-only; everything stays readable and downloadable";
    default:
      return b.statusText;
  }
}

/** The owner's billing page: status, packs, seats, the subscribe or add-seats form, invoices. */
export function BillingView({ slug, summary, invoices, invoicesError, notice }: { slug: string; summary: BillingSummary; invoices: InvoiceRow[]; invoicesError: string | null; notice: PageNotice | null }) {
  const [portalError, setPortalError] = useState<string>();
  const [opening, setOpening] = useState(false);
  const subscribedPacks = summary.packs.filter((p) => p.subscribed).map((p) => p.id);
  const paidPlan = plansForPacks(subscribedPacks).map((p) => p.title).join(" + ") || "No packs";
  const planName = summary.hasSubscription ? paidPlan : summary.status === "trialing" ? "Trial: all packs" : summary.status === "canceled" ? `${paidPlan} (ended)` : "None";

  async function openPortal() {
    setOpening(true);
    setPortalError(undefined);
    try {
      const r = await api<{ url: string }>(`/api/w/${slug}/billing/portal`, { method: "POST" });
      window.location.assign(r.url);
    } catch (err) {
      setPortalError(err instanceof ApiError ? err.message : "The billing portal could not be opened.");
      setOpening(false);
    }
  }

  return (
    <div className="space-y-6">
      {notice ? <Notice tone={notice.tone}>{notice.text}</Notice> : null}
      {/* Read-only and past-due states show in the workspace banner (layout.tsx), not twice here. */}

      <div className="grid gap-6 lg:grid-cols-[1fr_380px]">
        <Panel
          title="Subscription"
          actions={
            summary.hasBillingAccount ? (
              <Button size="sm" onClick={openPortal} disabled={opening}>
                Manage billing
              </Button>
            ) : null
          }
        >
          {portalError ? (
            <div className="mb-3">
              <Notice tone="error">{portalError}</Notice>
            </div>
          ) : null}
          <dl className="grid grid-cols-[max-content_1fr] gap-x-6 gap-y-1.5 text-[13.5px]">
            <dt className="text-ink-2">Status</dt>
            <dd data-testid="billing-status">
              <Tag tone={summary.status === "active" || summary.status === "trialing" ? "neutral" : "muted"}>{STATUS_LABEL[summary.status]}</Tag>
              <span className="ml-2 text-ink-2" data-testid="billing-status-text">
                {statusDetail(summary)}
              </span>
            </dd>
            <dt className="text-ink-2">Plan</dt>
            <dd data-testid="billing-plan">{planName}</dd>
            <dt className="text-ink-2">Seats</dt>
            <dd>
              <span className="mono" data-testid="seats-used">
                {summary.seats.used}
              </span>{" "}
              used
              {summary.seats.pending ? (
                <>
                  , <span className="mono">{summary.seats.pending}</span> invited
                </>
              ) : null}
              {summary.hasSubscription ? (
                <>
                  {" "}
                  of{" "}
                  <span className="mono" data-testid="seats-paid">
                    {summary.seats.paid}
                  </span>{" "}
                  paid
                </>
              ) : summary.status === "trialing" ? (
                <>
                  {" "}
                  of <span className="mono">{summary.seats.limit}</span> in the trial
                </>
              ) : null}
            </dd>
            {summary.monthlyTotal != null ? (
              <>
                <dt className="text-ink-2">Per month</dt>
                <dd className="mono">{formatMoney(summary.monthlyTotal)}</dd>
              </>
            ) : null}
          </dl>
          {summary.cancelAtPeriodEnd && summary.hasSubscription ? (
            <p className="mt-3 text-[13px] text-ink-2">
              The subscription is set to end on {day(summary.currentPeriodEnd)}. After that the workspace is read-only; everything stays readable and
              downloadable. Manage billing can undo the cancellation.
            </p>
          ) : null}

          <table className="table-dense mt-4" aria-label="Packs">
            <thead>
              <tr>
                <th>Pack</th>
                <th>In the plan</th>
                <th>Now</th>
              </tr>
            </thead>
            <tbody>
              {summary.packs.map((p) => (
                <tr key={p.id} data-testid={`pack-${p.id}`}>
                  <td className="font-medium">{p.title}</td>
                  <td className="text-ink-2">{p.subscribed ? "Yes" : "No"}</td>
                  <td>{p.unlocked ? <Tag>Unlocked</Tag> : <Tag tone="muted">Locked</Tag>}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </Panel>

        {summary.hasSubscription ? (
          <SeatsForm slug={slug} paid={summary.seats.paid} used={summary.seats.used} />
        ) : (
          <CheckoutForm slug={slug} minSeats={Math.max(1, summary.seats.used)} resubscribe={summary.status === "canceled"} />
        )}
      </div>

      <Panel title="Invoices">
        <InvoicesTable invoices={invoices} error={invoicesError} />
      </Panel>
    </div>
  );
}
