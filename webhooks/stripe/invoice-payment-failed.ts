/** invoice.payment_failed: a payment attempt failed; the subscription is usually past due now. */
import type Stripe from "stripe";
import { invoiceTarget } from "./invoice-target";
import type { SyncTarget } from "./target";

/** The subscription the unpaid invoice bills (null for invoices outside a subscription). */
export function invoicePaymentFailed(event: Stripe.InvoicePaymentFailedEvent): SyncTarget | null {
  return invoiceTarget(event.data.object);
}
