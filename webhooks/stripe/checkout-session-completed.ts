/** checkout.session.completed: the owner paid on the hosted page; its subscription now exists. */
import type Stripe from "stripe";
import { idOf, type SyncTarget } from "./target";

/** The subscription a completed subscription-mode checkout created (null for other modes). */
export function checkoutSessionCompleted(event: Stripe.CheckoutSessionCompletedEvent): SyncTarget | null {
  const session = event.data.object;
  const subscriptionId = idOf(session.subscription);
  if (session.mode !== "subscription" || !subscriptionId) return null;
  return { subscriptionId, customerId: idOf(session.customer), workspaceId: session.client_reference_id ?? session.metadata?.workspaceId ?? null };
}
