/**
 * Stripe webhook events: the types we handle, the dedupe, and the hand-off to the billing sync.
 *
 * Every handled event names one subscription (one file per event type finds it). We never
 * apply an event's payload: we re-fetch the subscription through the SDK and apply its current
 * state, which makes the order of delivery irrelevant; events older than the workspace's
 * watermark are acknowledged without a change. The event id is claimed in the same atomic
 * batch as the change (lib/billing/subscription.ts), so a repeat delivery changes nothing and
 * a crash leaves neither. Unhandled types are acknowledged and not stored.
 */
import type Stripe from "stripe";
import { isMissingResource } from "@/lib/billing/stripe";
import { commitSnapshot, findBillingWorkspace, isEventClaimed, syncSubscription, type EventRef, type SyncOutcome } from "@/lib/billing/subscription";
import { checkoutSessionCompleted } from "./checkout-session-completed";
import { customerSubscriptionCreated } from "./customer-subscription-created";
import { customerSubscriptionDeleted } from "./customer-subscription-deleted";
import { customerSubscriptionUpdated } from "./customer-subscription-updated";
import { invoicePaid } from "./invoice-paid";
import { invoicePaymentFailed } from "./invoice-payment-failed";
import type { SyncTarget } from "./target";

type EventOf<T extends Stripe.Event["type"]> = Extract<Stripe.Event, { type: T }>;

const TARGETS = {
  "checkout.session.completed": (e: EventOf<"checkout.session.completed">) => checkoutSessionCompleted(e),
  "customer.subscription.created": (e: EventOf<"customer.subscription.created">) => customerSubscriptionCreated(e),
  "customer.subscription.updated": (e: EventOf<"customer.subscription.updated">) => customerSubscriptionUpdated(e),
  "customer.subscription.deleted": (e: EventOf<"customer.subscription.deleted">) => customerSubscriptionDeleted(e),
  "invoice.paid": (e: EventOf<"invoice.paid">) => invoicePaid(e),
  "invoice.payment_failed": (e: EventOf<"invoice.payment_failed">) => invoicePaymentFailed(e),
} satisfies { [K in Stripe.Event["type"]]?: (e: EventOf<K>) => SyncTarget | null };

export type HandledType = keyof typeof TARGETS;

/** The event types we act on; every other type is acknowledged with 200 and ignored. */
export const HANDLED_TYPES: readonly HandledType[] = Object.keys(TARGETS) as HandledType[];

/** Whether we act on events of this type. */
export function isHandled(type: string): type is HandledType {
  return Object.prototype.hasOwnProperty.call(TARGETS, type);
}

function targetOf(event: EventOf<HandledType>): SyncTarget | null {
  // The map is keyed by the event's own type, so each handler gets the event it declares.
  const fn = TARGETS[event.type] as (e: EventOf<HandledType>) => SyncTarget | null;
  return fn(event);
}

/** A failure worth a retry: the route answers 503 and Stripe delivers the event again. */
export class TransientWebhookError extends Error {
  constructor(message: string, options?: { cause?: unknown }) {
    super(message, options);
    this.name = "TransientWebhookError";
  }
}

export interface WebhookResult {
  outcome: SyncOutcome | "unhandled";
  reason?: string;
}

/**
 * Applies one verified event. Resolves once the change (or the claim of an ignored event) is
 * committed; throws TransientWebhookError when Stripe or the database failed (nothing changed).
 */
export async function handleStripeEvent(event: Stripe.Event): Promise<WebhookResult> {
  if (!isHandled(event.type)) return { outcome: "unhandled" };
  const handled = event as EventOf<HandledType>;
  const ref: EventRef = { id: event.id, type: event.type, createdMs: event.created * 1000 };
  try {
    if (await isEventClaimed(event.id)) return { outcome: "duplicate" };
    const target = targetOf(handled);
    if (!target) return await commitSnapshot({ workspaceId: null, snapshot: null, event: ref, reason: "the event is not about a subscription" });
    const ws = await findBillingWorkspace(target);
    if (!ws) return await commitSnapshot({ workspaceId: null, snapshot: null, event: ref, reason: "no workspace has this customer" });
    try {
      return await syncSubscription({ workspaceId: ws.id, subscriptionId: target.subscriptionId, event: ref });
    } catch (err) {
      if (!isMissingResource(err)) throw err;
      return await commitSnapshot({ workspaceId: null, snapshot: null, event: ref, reason: "Stripe does not know this subscription" });
    }
  } catch (err) {
    throw new TransientWebhookError(`Stripe event ${event.id} (${event.type}) was not applied: ${err instanceof Error ? err.message : String(err)}`, { cause: err });
  }
}
