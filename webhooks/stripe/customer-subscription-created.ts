/** customer.subscription.created: a subscription started (after a checkout, or made in Stripe's dashboard). */
import type Stripe from "stripe";
import { idOf, type SyncTarget } from "./target";

/** The subscription the event is about (its state is re-fetched, never taken from the payload). */
export function customerSubscriptionCreated(event: Stripe.CustomerSubscriptionCreatedEvent): SyncTarget | null {
  const sub = event.data.object;
  return { subscriptionId: sub.id, customerId: idOf(sub.customer), workspaceId: sub.metadata?.workspaceId ?? null };
}
