/** What a Stripe event asks us to sync: one subscription, and how to find its workspace. */

/** The subscription an event is about, and the hints that name its workspace. */
export interface SyncTarget {
  subscriptionId: string;
  /** The Stripe customer (the workspace that holds it owns the subscription). */
  customerId: string | null;
  /** `workspaceId` from metadata or client_reference_id (trusted only if it fits the customer). */
  workspaceId: string | null;
}

/** The id of an expandable Stripe field (an id string or an expanded object). */
export function idOf(x: string | { id: string } | null | undefined): string | null {
  if (!x) return null;
  return typeof x === "string" ? x : x.id;
}
