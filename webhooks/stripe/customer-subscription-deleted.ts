/** customer.subscription.deleted: the subscription ended (cancelled now, or at the end of its period). */
import type Stripe from "stripe";
import { idOf, type SyncTarget } from "./target";

/** The subscription the event is about (its state is re-fetched, never taken from the payload). */
export function customerSubscriptionDeleted(event: Stripe.CustomerSubscriptionDeletedEvent): SyncTarget | null {
  const sub = event.data.object;
  return { subscriptionId: sub.id, customerId: idOf(sub.customer), workspaceId: sub.metadata?.workspaceId ?? null };
}
