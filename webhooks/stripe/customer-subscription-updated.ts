/** customer.subscription.updated: seats, items, status, period or a scheduled cancellation changed. */
import type Stripe from "stripe";
import { idOf, type SyncTarget } from "./target";

/** The subscription the event is about (its state is re-fetched, never taken from the payload). */
export function customerSubscriptionUpdated(event: Stripe.CustomerSubscriptionUpdatedEvent): SyncTarget | null {
  const sub = event.data.object;
  return { subscriptionId: sub.id, customerId: idOf(sub.customer), workspaceId: sub.metadata?.workspaceId ?? null };
}
