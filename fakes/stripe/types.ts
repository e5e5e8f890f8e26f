/**
 * Wire shapes of the objects the fake returns, derived from the official SDK's own types
 * (stripe 23.1.0, API version 2026-10-28.endive) so that every field the fake emits has the
 * type the SDK declares. The only change: on the wire a `Decimal` is a decimal string (the
 * SDK turns it into a Decimal object after parsing the response).
 */
import type Stripe from "stripe";

/** The API version the fake's object shapes follow (the SDK's pinned version). */
export const FAKE_API_VERSION = "2026-10-28.endive";

/** `T` as sent over the wire: Decimal fields are decimal strings. */
export type Wire<T> = T extends string | number | boolean | bigint | symbol | null | undefined
  ? T
  : T extends Stripe.Decimal
    ? string
    : T extends (infer U)[]
      ? Wire<U>[]
      : T extends object
        ? { [K in keyof T]: Wire<T[K]> }
        : T;

export type WCustomer = Wire<Stripe.Customer>;
export type WProduct = Wire<Stripe.Product>;
export type WPrice = Wire<Stripe.Price>;
export type WPlan = Wire<Stripe.Plan>;
export type WSubscription = Wire<Stripe.Subscription>;
export type WSubscriptionItem = Wire<Stripe.SubscriptionItem>;
export type WInvoice = Wire<Stripe.Invoice>;
export type WInvoiceLineItem = Wire<Stripe.InvoiceLineItem>;
export type WCheckoutSession = Wire<Stripe.Checkout.Session>;
export type WLineItem = Wire<Stripe.LineItem>;
export type WPortalSession = Wire<Stripe.BillingPortal.Session>;
export type WEvent = Wire<Stripe.Event>;
export type EventType = Stripe.Event.Type;
/** A Stripe list envelope. */
export interface WList<T> {
  object: "list";
  data: T[];
  has_more: boolean;
  url: string;
}
/** An event as the fake stores and sends it (the common shape of every event type). */
export type WEventBase = Wire<Stripe.EventBase>;
