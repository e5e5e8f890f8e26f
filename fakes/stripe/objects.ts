/**
 * Builders of Stripe-shaped objects with every field the SDK's types require (filled with
 * Stripe's defaults or null where the fake does not model the feature). The type checker
 * holds each builder to the SDK's declared shape.
 */
import type { WCustomer, WInvoice, WInvoiceLineItem, WLineItem, WPlan, WPrice, WProduct, WSubscription, WSubscriptionItem, WCheckoutSession, WPortalSession } from "./types";
import { newId, type Interval } from "./util";

/** Fields a caller must decide when creating a customer. */
export interface CustomerInit {
  created: number;
  email: string | null;
  name: string | null;
  description: string | null;
  phone: string | null;
  metadata: Record<string, string>;
}

/** A new customer object. */
export function buildCustomer(init: CustomerInit): WCustomer {
  return {
    id: newId("cus", 14),
    object: "customer",
    address: null,
    balance: 0,
    created: init.created,
    currency: null,
    default_source: null,
    delinquent: false,
    description: init.description,
    discount: null,
    email: init.email,
    invoice_prefix: newId("x", 8).slice(2).toUpperCase(),
    invoice_settings: { custom_fields: null, default_payment_method: null, footer: null, rendering_options: null },
    livemode: false,
    metadata: init.metadata,
    name: init.name,
    next_invoice_sequence: 1,
    phone: init.phone,
    preferred_locales: [],
    shipping: null,
    tax_exempt: "none",
    test_clock: null,
  };
}

/** A new product object. */
export function buildProduct(init: { id?: string; created: number; name: string; description: string | null; active: boolean; metadata: Record<string, string>; unitLabel: string | null }): WProduct {
  return {
    id: init.id ?? newId("prod", 14),
    object: "product",
    active: init.active,
    created: init.created,
    default_price: null,
    description: init.description,
    images: [],
    livemode: false,
    marketing_features: [],
    metadata: init.metadata,
    name: init.name,
    package_dimensions: null,
    shippable: null,
    statement_descriptor: null,
    tax_code: null,
    tax_details: null,
    type: "service",
    unit_label: init.unitLabel,
    updated: init.created,
    url: null,
  };
}

/** Fields a caller decides when creating a price. */
export interface PriceInit {
  created: number;
  currency: string;
  unitAmount: number;
  product: string;
  active: boolean;
  lookupKey: string | null;
  nickname: string | null;
  metadata: Record<string, string>;
  recurring: { interval: Interval; intervalCount: number; trialPeriodDays: number | null } | null;
}

/** A new price object (per-unit billing). */
export function buildPrice(init: PriceInit): WPrice {
  return {
    id: newId("price"),
    object: "price",
    active: init.active,
    billing_scheme: "per_unit",
    created: init.created,
    currency: init.currency,
    custom_unit_amount: null,
    livemode: false,
    lookup_key: init.lookupKey,
    metadata: init.metadata,
    nickname: init.nickname,
    product: init.product,
    recurring: init.recurring
      ? { interval: init.recurring.interval, interval_count: init.recurring.intervalCount, meter: null, trial_period_days: init.recurring.trialPeriodDays, usage_type: "licensed" }
      : null,
    tax_behavior: "unspecified",
    tiers_mode: null,
    transform_quantity: null,
    type: init.recurring ? "recurring" : "one_time",
    unit_amount: init.unitAmount,
    unit_amount_decimal: String(init.unitAmount),
  };
}

/** The legacy `plan` view of a recurring price, as subscription items still carry it. */
export function planOf(price: WPrice): WPlan {
  const r = price.recurring;
  return {
    id: price.id,
    object: "plan",
    active: price.active,
    amount: price.unit_amount,
    amount_decimal: price.unit_amount_decimal,
    billing_scheme: price.billing_scheme,
    created: price.created,
    currency: price.currency,
    interval: r?.interval ?? "month",
    interval_count: r?.interval_count ?? 1,
    livemode: false,
    metadata: price.metadata,
    meter: null,
    nickname: price.nickname,
    product: typeof price.product === "string" ? price.product : price.product.id,
    tiers_mode: null,
    transform_usage: null,
    trial_period_days: r?.trial_period_days ?? null,
    usage_type: "licensed",
  };
}

/** A subscription item on `subscription` for `price` × `quantity` over a period. */
export function buildSubscriptionItem(init: { subscription: string; price: WPrice; quantity: number; created: number; periodStart: number; periodEnd: number; metadata: Record<string, string> }): WSubscriptionItem {
  return {
    id: newId("si", 14),
    object: "subscription_item",
    billing_thresholds: null,
    created: init.created,
    current_period_end: init.periodEnd,
    current_period_start: init.periodStart,
    current_trial: null,
    discounts: [],
    metadata: init.metadata,
    plan: planOf(init.price),
    price: init.price,
    quantity: init.quantity,
    subscription: init.subscription,
    tax_rates: [],
  };
}

/** Fields a caller decides when creating a subscription (items are added after). */
export interface SubscriptionInit {
  id: string;
  created: number;
  customer: string;
  currency: string;
  status: WSubscription["status"];
  metadata: Record<string, string>;
  description: string | null;
  billingCycleAnchor: number;
  trialStart: number | null;
  trialEnd: number | null;
}

/** A new subscription object with an empty item list. */
export function buildSubscription(init: SubscriptionInit): WSubscription {
  return {
    id: init.id,
    object: "subscription",
    application: null,
    application_fee_percent: null,
    automatic_tax: { disabled_reason: null, enabled: false, liability: null },
    billing_cycle_anchor: init.billingCycleAnchor,
    billing_cycle_anchor_config: null,
    billing_mode: { flexible: null, type: "classic" },
    billing_schedules: [],
    billing_thresholds: null,
    cancel_at: null,
    cancel_at_period_end: false,
    canceled_at: null,
    cancellation_details: { comment: null, feedback: null, feedback_option: null, reason: null },
    collection_method: "charge_automatically",
    created: init.created,
    currency: init.currency,
    customer: init.customer,
    customer_account: null,
    days_until_due: null,
    default_payment_method: null,
    default_source: null,
    default_tax_rates: [],
    description: init.description,
    discounts: [],
    ended_at: null,
    invoice_settings: { account_tax_ids: null, custom_fields: null, description: null, footer: null, issuer: { type: "self" } },
    items: { object: "list", data: [], has_more: false, url: `/v1/subscription_items?subscription=${init.id}` },
    latest_invoice: null,
    livemode: false,
    managed_payments: null,
    metadata: init.metadata,
    next_pending_invoice_item_invoice: null,
    on_behalf_of: null,
    pause_collection: null,
    payment_settings: { payment_method_options: null, payment_method_types: null, save_default_payment_method: "off" },
    pending_invoice_item_interval: null,
    pending_setup_intent: null,
    pending_update: null,
    schedule: null,
    start_date: init.created,
    status: init.status,
    test_clock: null,
    transfer_data: null,
    trial_end: init.trialEnd,
    trial_settings: { end_behavior: { billing_cycle_anchor: null, missing_payment_method: "create_invoice" } },
    trial_start: init.trialStart,
  };
}

/** One invoice line for a subscription item over a period. */
export function buildInvoiceLine(init: { invoice: string; subscription: string; item: WSubscriptionItem; amount: number; description: string; periodStart: number; periodEnd: number }): WInvoiceLineItem {
  const price = init.item.price;
  return {
    id: newId("il"),
    object: "line_item",
    amount: init.amount,
    currency: price.currency,
    description: init.description,
    discount_amounts: [],
    discountable: true,
    discounts: [],
    invoice: init.invoice,
    livemode: false,
    metadata: {},
    parent: {
      invoice_item_details: null,
      subscription_item_details: { invoice_item: null, proration: false, proration_details: { credited_items: null }, subscription: init.subscription, subscription_item: init.item.id },
      type: "subscription_item_details",
    },
    period: { start: init.periodStart, end: init.periodEnd },
    pretax_credit_amounts: [],
    pricing: {
      price_details: { price: price.id, product: typeof price.product === "string" ? price.product : price.product.id },
      type: "price_details",
      unit_amount_decimal: price.unit_amount_decimal,
    },
    quantity: init.item.quantity ?? 1,
    quantity_decimal: String(init.item.quantity ?? 1),
    subscription: init.subscription,
    subtotal: init.amount,
    taxes: [],
  };
}

/** Fields a caller decides when creating an invoice. */
export interface InvoiceInit {
  id: string;
  created: number;
  customer: WCustomer;
  subscription: WSubscription;
  billingReason: NonNullable<WInvoice["billing_reason"]>;
  number: string;
  lines: WInvoiceLineItem[];
  periodStart: number;
  periodEnd: number;
  hostedUrl: string;
}

/** A new finalized, open invoice (callers mark it paid). */
export function buildInvoice(init: InvoiceInit): WInvoice {
  const total = init.lines.reduce((s, l) => s + l.amount, 0);
  return {
    id: init.id,
    object: "invoice",
    account_country: "US",
    account_name: "Test account (Stripe fake)",
    account_tax_ids: null,
    amount_due: total,
    amount_overpaid: 0,
    amount_paid: 0,
    amount_remaining: total,
    amount_shipping: 0,
    application: null,
    attempt_count: 0,
    attempted: false,
    auto_advance: true,
    automatic_tax: { disabled_reason: null, enabled: false, liability: null, provider: null, status: null },
    automatically_finalizes_at: null,
    billing_reason: init.billingReason,
    collection_method: "charge_automatically",
    created: init.created,
    currency: init.subscription.currency,
    custom_fields: null,
    customer: init.customer.id,
    customer_account: null,
    customer_address: null,
    customer_email: init.customer.email,
    customer_name: init.customer.name ?? null,
    customer_phone: init.customer.phone ?? null,
    customer_shipping: null,
    customer_tax_exempt: "none",
    customer_tax_ids: [],
    default_payment_method: null,
    default_source: null,
    default_tax_rates: [],
    description: null,
    discounts: [],
    due_date: null,
    effective_at: init.created,
    ending_balance: 0,
    footer: null,
    from_invoice: null,
    hosted_invoice_url: init.hostedUrl,
    invoice_pdf: null,
    issuer: { type: "self" },
    last_finalization_error: null,
    latest_revision: null,
    lines: { object: "list", data: init.lines, has_more: false, url: `/v1/invoices/${init.id}/lines` },
    livemode: false,
    metadata: {},
    next_payment_attempt: null,
    number: init.number,
    on_behalf_of: null,
    parent: {
      quote_details: null,
      subscription_details: { metadata: { ...init.subscription.metadata }, subscription: init.subscription.id },
      type: "subscription_details",
    },
    payment_settings: { default_mandate: null, payment_method_options: null, payment_method_types: null },
    period_end: init.periodEnd,
    period_start: init.periodStart,
    post_payment_credit_notes_amount: 0,
    pre_payment_credit_notes_amount: 0,
    receipt_number: null,
    rendering: null,
    shipping_cost: null,
    shipping_details: null,
    starting_balance: 0,
    statement_descriptor: null,
    status: "open",
    status_transitions: { finalized_at: init.created, marked_uncollectible_at: null, paid_at: null, voided_at: null },
    subtotal: total,
    subtotal_excluding_tax: total,
    test_clock: null,
    total,
    total_discount_amounts: [],
    total_excluding_tax: total,
    total_pretax_credit_amounts: [],
    total_taxes: [],
    webhooks_delivered_at: init.created,
  };
}

/** A checkout line item (as listed by GET /v1/checkout/sessions/:id/line_items). */
export function buildCheckoutLineItem(price: WPrice, productName: string, quantity: number): WLineItem {
  const amount = (price.unit_amount ?? 0) * quantity;
  return {
    id: newId("li"),
    object: "item",
    adjustable_quantity: null,
    amount_discount: 0,
    amount_subtotal: amount,
    amount_tax: 0,
    amount_total: amount,
    currency: price.currency,
    description: productName,
    metadata: {},
    price,
    quantity,
  };
}

/** Fields a caller decides when creating a checkout session. */
export interface CheckoutInit {
  id: string;
  created: number;
  url: string;
  customer: string | null;
  customerEmail: string | null;
  clientReferenceId: string | null;
  metadata: Record<string, string>;
  successUrl: string;
  cancelUrl: string | null;
  currency: string;
  amountTotal: number;
  expiresAt: number;
  locale: WCheckoutSession["locale"];
}

/** A new open checkout session in subscription mode. */
export function buildCheckoutSession(init: CheckoutInit): WCheckoutSession {
  return {
    id: init.id,
    object: "checkout.session",
    adaptive_pricing: null,
    after_expiration: null,
    allow_promotion_codes: null,
    allowed_payment_method_types: null,
    amount_subtotal: init.amountTotal,
    amount_total: init.amountTotal,
    automatic_tax: { enabled: false, liability: null, provider: null, status: null },
    billing_address_collection: null,
    cancel_url: init.cancelUrl,
    client_reference_id: init.clientReferenceId,
    client_secret: null,
    collected_information: null,
    consent: null,
    consent_collection: null,
    created: init.created,
    currency: init.currency,
    currency_conversion: null,
    custom_fields: [],
    custom_text: { after_submit: null, shipping_address: null, submit: null, terms_of_service_acceptance: null },
    customer: init.customer,
    customer_account: null,
    customer_creation: init.customer ? null : "always",
    customer_details: null,
    customer_email: init.customerEmail,
    discounts: [],
    expires_at: init.expiresAt,
    integration_identifier: null,
    invoice: null,
    invoice_creation: null,
    livemode: false,
    locale: init.locale,
    managed_payments: null,
    metadata: init.metadata,
    mode: "subscription",
    origin_context: null,
    payment_intent: null,
    payment_link: null,
    payment_method_collection: "always",
    payment_method_configuration_details: null,
    payment_method_options: null,
    payment_method_types: ["card"],
    payment_status: "unpaid",
    permissions: null,
    recovered_from: null,
    saved_payment_method_options: null,
    setup_intent: null,
    shipping_address_collection: null,
    shipping_cost: null,
    shipping_options: [],
    status: "open",
    submit_type: null,
    subscription: null,
    success_url: init.successUrl,
    total_details: { amount_discount: 0, amount_shipping: 0, amount_tax: 0 },
    ui_mode: "hosted",
    url: init.url,
    wallet_options: null,
  };
}

/** A new billing portal session. */
export function buildPortalSession(init: { id: string; created: number; customer: string; returnUrl: string | null; url: string }): WPortalSession {
  return {
    id: init.id,
    object: "billing_portal.session",
    configuration: "bpc_fake_default",
    created: init.created,
    customer: init.customer,
    customer_account: null,
    flow: null,
    livemode: false,
    locale: null,
    on_behalf_of: null,
    return_url: init.returnUrl,
    url: init.url,
  };
}
