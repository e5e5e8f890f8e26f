/** invoice.paid: a subscription invoice was paid (first payment, renewal, or a past-due one settled). */
import type Stripe from "stripe";
import { invoiceTarget } from "./invoice-target";
import type { SyncTarget } from "./target";

/** The subscription the paid invoice bills (null for invoices outside a subscription). */
export function invoicePaid(event: Stripe.InvoicePaidEvent): SyncTarget | null {
  return invoiceTarget(event.data.object);
}
