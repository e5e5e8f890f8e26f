/** The subscription an invoice bills, for the invoice.* handlers. */
import type Stripe from "stripe";
import { idOf, type SyncTarget } from "./target";

/** In this API version an invoice names its subscription under parent.subscription_details. */
export function invoiceTarget(invoice: Stripe.Invoice): SyncTarget | null {
  const details = invoice.parent?.subscription_details;
  const subscriptionId = idOf(details?.subscription);
  if (!subscriptionId) return null;
  return { subscriptionId, customerId: idOf(invoice.customer), workspaceId: details?.metadata?.workspaceId ?? null };
}
