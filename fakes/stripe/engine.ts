/**
 * The fake's billing state and every operation on it, independent of HTTP: the API routes,
 * the hosted pages and the /_fake control endpoints all call these methods, so a change made
 * on a hosted page follows the same rules and emits the same events as one made through the
 * API.
 */
import { invalidParam, missingParam, noSuch, StripeApiError } from "./errors";
import {
  buildCheckoutLineItem,
  buildCheckoutSession,
  buildCustomer,
  buildInvoice,
  buildInvoiceLine,
  buildPortalSession,
  buildPrice,
  buildProduct,
  buildSubscription,
  buildSubscriptionItem,
  planOf,
} from "./objects";
import type { FormParams } from "./form";
import { applyMetadata, Params } from "./params";
import { FAKE_API_VERSION, type EventType, type WCheckoutSession, type WCustomer, type WEventBase, type WInvoice, type WLineItem, type WList, type WPortalSession, type WPrice, type WProduct, type WSubscription, type WSubscriptionItem } from "./types";
import { addInterval, clone, formatMoney, newId, nowSeconds, type Interval } from "./util";

/** Who caused a change: the API request (id and idempotency key) or nobody (hosted pages, control endpoints). */
export interface RequestContext {
  requestId: string | null;
  idempotencyKey: string | null;
}

/** A context for changes not made through the API. */
export const NO_REQUEST: RequestContext = { requestId: null, idempotencyKey: null };

/** A checkout session with what the fake needs to complete it. */
export interface StoredCheckout {
  session: WCheckoutSession;
  lineItems: WLineItem[];
  subscriptionData: { metadata: Record<string, string>; trialPeriodDays: number | null; description: string | null };
}

/** Everything the fake keeps (JSON-serialisable, so it can be saved to a file). */
export interface FakeState {
  version: 1;
  seq: number;
  /** Creation order of every object id (lists are newest first). */
  order: Record<string, number>;
  customers: Record<string, WCustomer>;
  products: Record<string, WProduct>;
  prices: Record<string, WPrice>;
  subscriptions: Record<string, WSubscription>;
  invoices: Record<string, WInvoice>;
  checkouts: Record<string, StoredCheckout>;
  portals: Record<string, WPortalSession>;
  events: Record<string, WEventBase>;
}

/** An empty state. */
export function emptyState(): FakeState {
  return { version: 1, seq: 0, order: {}, customers: {}, products: {}, prices: {}, subscriptions: {}, invoices: {}, checkouts: {}, portals: {}, events: {} };
}

/** How the hosted portal's "Cancel subscription" acts (Stripe's portal default is at period end). */
export type PortalCancelMode = "at_period_end" | "immediately";

export interface EngineOptions {
  /** Base URL of the fake's hosted pages (checkout, portal, invoices), e.g. http://127.0.0.1:12111. */
  publicUrl: string;
  portalCancel: PortalCancelMode;
  /** Called for each new event, in creation order. */
  onEvent: (event: WEventBase) => void;
  /** Whether an event has been delivered (for `delivery_success`); null when unknown. */
  deliverySuccess: (eventId: string) => boolean | null;
}

/** A deleted-object stub, as Stripe answers DELETE requests. */
export interface Deleted {
  id: string;
  object: string;
  deleted: true;
}

// Params Stripe defines per endpoint (from the SDK's *Params types). A param Stripe knows but
// the fake does not implement is refused with a clear message instead of silently ignored;
// `accepted` lists what the fake handles or can safely ignore.
const PAGE = ["limit", "starting_after", "ending_before", "expand"];
const SPEC = {
  customerCreate: {
    known: ["address", "balance", "business_name", "cash_balance", "description", "email", "expand", "individual_name", "invoice_prefix", "invoice_settings", "metadata", "name", "next_invoice_sequence", "payment_method", "phone", "preferred_locales", "shipping", "source", "tax", "tax_exempt", "tax_id_data", "test_clock", "validate"],
    accepted: ["description", "email", "expand", "metadata", "name", "phone", "preferred_locales", "validate"],
  },
  customerUpdate: {
    known: ["address", "balance", "business_name", "cash_balance", "default_source", "description", "email", "expand", "individual_name", "invoice_prefix", "invoice_settings", "metadata", "name", "next_invoice_sequence", "phone", "preferred_locales", "shipping", "source", "tax", "tax_exempt", "validate"],
    accepted: ["description", "email", "expand", "metadata", "name", "phone", "preferred_locales", "validate"],
  },
  customerList: { known: [...PAGE, "created", "email", "test_clock"], accepted: [...PAGE, "email"] },
  productCreate: {
    known: ["name", "active", "default_price_data", "description", "expand", "id", "images", "marketing_features", "metadata", "package_dimensions", "shippable", "statement_descriptor", "tax_code", "tax_details", "type", "unit_label", "url"],
    accepted: ["name", "active", "description", "expand", "id", "metadata", "unit_label", "type", "statement_descriptor"],
  },
  productUpdate: {
    known: ["active", "default_price", "description", "expand", "images", "marketing_features", "metadata", "name", "package_dimensions", "shippable", "statement_descriptor", "tax_code", "tax_details", "unit_label", "url"],
    accepted: ["active", "default_price", "description", "expand", "metadata", "name", "unit_label", "statement_descriptor"],
  },
  productList: { known: [...PAGE, "active", "created", "ids", "shippable", "type", "url"], accepted: [...PAGE, "active", "ids"] },
  priceCreate: {
    known: ["currency", "active", "billing_scheme", "currency_options", "custom_unit_amount", "expand", "lookup_key", "metadata", "nickname", "product", "product_data", "recurring", "tax_behavior", "tiers", "tiers_mode", "transfer_lookup_key", "transform_quantity", "unit_amount", "unit_amount_decimal"],
    accepted: ["currency", "active", "billing_scheme", "expand", "lookup_key", "metadata", "nickname", "product", "product_data", "recurring", "tax_behavior", "transfer_lookup_key", "unit_amount"],
  },
  priceUpdate: {
    known: ["active", "currency_options", "expand", "lookup_key", "metadata", "nickname", "tax_behavior", "transfer_lookup_key"],
    accepted: ["active", "expand", "lookup_key", "metadata", "nickname", "transfer_lookup_key"],
  },
  priceList: { known: [...PAGE, "active", "created", "currency", "lookup_keys", "product", "recurring", "type"], accepted: [...PAGE, "active", "currency", "lookup_keys", "product", "recurring", "type"] },
  checkoutCreate: {
    known: ["adaptive_pricing", "after_expiration", "allow_promotion_codes", "allowed_payment_method_types", "automatic_tax", "billing_address_collection", "branding_settings", "cancel_url", "client_reference_id", "consent_collection", "currency", "custom_fields", "custom_text", "customer", "customer_account", "customer_creation", "customer_email", "customer_update", "discounts", "excluded_payment_method_types", "expand", "expires_at", "integration_identifier", "invoice_creation", "line_items", "locale", "managed_payments", "metadata", "mode", "name_collection", "optional_items", "origin_context", "payment_intent_data", "payment_method_collection", "payment_method_configuration", "payment_method_data", "payment_method_options", "permissions", "phone_number_collection", "redirect_on_completion", "return_url", "saved_payment_method_options", "setup_intent_data", "shipping_address_collection", "shipping_options", "submit_type", "subscription_data", "success_url", "tax_id_collection", "ui_mode", "wallet_options"],
    accepted: ["allow_promotion_codes", "automatic_tax", "billing_address_collection", "cancel_url", "client_reference_id", "consent_collection", "currency", "custom_text", "customer", "customer_creation", "customer_email", "customer_update", "expand", "expires_at", "line_items", "locale", "metadata", "mode", "payment_method_collection", "payment_method_types", "phone_number_collection", "subscription_data", "success_url", "tax_id_collection", "ui_mode"],
  },
  checkoutLineItem: { known: ["adjustable_quantity", "dynamic_tax_rates", "metadata", "price", "price_data", "quantity", "tax_rates"], accepted: ["price", "quantity", "metadata"] },
  checkoutSubscriptionData: {
    known: ["application_fee_percent", "billing_cycle_anchor", "billing_cycle_anchor_config", "billing_mode", "default_tax_rates", "description", "invoice_settings", "metadata", "on_behalf_of", "pending_invoice_item_interval", "proration_behavior", "transfer_data", "trial_end", "trial_period_days", "trial_settings"],
    accepted: ["description", "metadata", "proration_behavior", "trial_period_days", "trial_settings"],
  },
  checkoutList: { known: [...PAGE, "created", "customer", "customer_account", "customer_details", "payment_intent", "payment_link", "status", "subscription"], accepted: [...PAGE, "customer", "status", "subscription"] },
  subscriptionUpdate: {
    known: ["add_invoice_items", "application_fee_percent", "automatic_tax", "billing_cycle_anchor", "billing_schedules", "billing_thresholds", "cancel_at", "cancel_at_period_end", "cancellation_details", "collection_method", "days_until_due", "default_payment_method", "default_source", "default_tax_rates", "description", "discounts", "expand", "invoice_settings", "items", "metadata", "off_session", "on_behalf_of", "pause_collection", "payment_behavior", "payment_settings", "pending_invoice_item_interval", "proration_behavior", "proration_date", "transfer_data", "trial_end", "trial_from_plan", "trial_settings"],
    accepted: ["cancel_at_period_end", "cancellation_details", "description", "expand", "items", "metadata", "off_session", "payment_behavior", "proration_behavior", "proration_date", "trial_end"],
  },
  subscriptionItemChange: {
    known: ["billing_thresholds", "clear_usage", "current_trial", "deleted", "discounts", "id", "metadata", "plan", "price", "price_data", "quantity", "tax_rates"],
    accepted: ["clear_usage", "deleted", "id", "metadata", "plan", "price", "quantity"],
  },
  subscriptionList: {
    known: [...PAGE, "automatic_tax", "collection_method", "created", "current_period_end", "current_period_start", "customer", "customer_account", "plan", "price", "status", "test_clock"],
    accepted: [...PAGE, "customer", "price", "plan", "status"],
  },
  subscriptionCancel: { known: ["cancellation_details", "expand", "invoice_now", "prorate"], accepted: ["cancellation_details", "expand", "invoice_now", "prorate"] },
  subscriptionItemUpdate: {
    known: ["billing_thresholds", "current_trial", "discounts", "expand", "metadata", "off_session", "payment_behavior", "plan", "price", "price_data", "proration_behavior", "proration_date", "quantity", "tax_rates"],
    accepted: ["expand", "metadata", "off_session", "payment_behavior", "plan", "price", "proration_behavior", "proration_date", "quantity"],
  },
  subscriptionItemDelete: { known: ["clear_usage", "payment_behavior", "proration_behavior", "proration_date"], accepted: ["clear_usage", "payment_behavior", "proration_behavior", "proration_date"] },
  subscriptionItemList: { known: [...PAGE, "subscription"], accepted: [...PAGE, "subscription"] },
  portalCreate: { known: ["after_expiration", "configuration", "customer", "customer_account", "expand", "flow_data", "locale", "on_behalf_of", "return_url"], accepted: ["configuration", "customer", "expand", "locale", "return_url"] },
  invoiceList: { known: [...PAGE, "collection_method", "created", "customer", "customer_account", "due_date", "status", "subscription"], accepted: [...PAGE, "customer", "status", "subscription"] },
  invoicePay: { known: ["expand", "forgive", "mandate", "off_session", "paid_out_of_band", "payment_method", "source"], accepted: ["expand", "off_session", "paid_out_of_band", "payment_method"] },
  eventList: { known: [...PAGE, "created", "delivery_success", "type", "types"], accepted: [...PAGE, "delivery_success", "type", "types"] },
  retrieve: { known: ["expand"], accepted: ["expand"] },
  empty: { known: ["expand"], accepted: ["expand"] },
} satisfies Record<string, { known: string[]; accepted: string[] }>;

/** Refuses unknown params (as Stripe does) and params the fake does not implement. */
export function checkParams(p: Params, spec: { known: readonly string[]; accepted: readonly string[] }): void {
  for (const key of Object.keys(p.raw)) {
    const name = p.name(key);
    if (!spec.accepted.includes(key)) {
      if (spec.known.includes(key)) {
        throw new StripeApiError(400, "invalid_request_error", `The local Stripe fake does not implement the parameter ${name} (real Stripe accepts it). Leave it out, or extend fakes/stripe.`, name, "parameter_unsupported_by_fake");
      }
      throw new StripeApiError(400, "invalid_request_error", `Received unknown parameter: ${name}`, name, "parameter_unknown");
    }
  }
}

const INTERVALS: readonly Interval[] = ["day", "week", "month", "year"];
const ACTIVE_LIKE = new Set(["active", "trialing", "past_due", "unpaid", "incomplete", "paused"]);

/** The in-memory billing world of the fake. */
export class StripeEngine {
  state: FakeState;

  constructor(
    private readonly opts: EngineOptions,
    initial?: FakeState,
  ) {
    this.state = initial ?? emptyState();
  }

  /** Public URL base (used for hosted page links). */
  get publicUrl(): string {
    return this.opts.publicUrl;
  }

  set publicUrl(url: string) {
    (this.opts as { publicUrl: string }).publicUrl = url;
  }

  /** Portal cancel behaviour. */
  get portalCancel(): PortalCancelMode {
    return this.opts.portalCancel;
  }

  // ---------------------------------------------------------------- bookkeeping

  private track(id: string): void {
    this.state.seq += 1;
    this.state.order[id] = this.state.seq;
  }

  private outbox: WEventBase[] | null = null;

  /**
   * Runs `fn` as one unit: if it throws, the state is restored and none of its events are
   * sent (a refused request changes nothing, as with Stripe). Events are handed to onEvent
   * only after `fn` succeeds, in creation order.
   */
  atomic<T>(fn: () => T): T {
    if (this.outbox) return fn();
    const snapshot = clone(this.state);
    this.outbox = [];
    try {
      const result = fn();
      const events = this.outbox;
      this.outbox = null;
      for (const e of events) this.opts.onEvent(e);
      return result;
    } catch (err) {
      this.state = snapshot;
      this.outbox = null;
      throw err;
    }
  }

  private emit(type: EventType, object: object, ctx: RequestContext, previous?: Record<string, unknown>): WEventBase {
    const event: WEventBase = {
      id: newId("evt"),
      object: "event",
      api_version: FAKE_API_VERSION,
      created: nowSeconds(),
      data: previous && Object.keys(previous).length > 0 ? { object: clone(object), previous_attributes: clone(previous) } : { object: clone(object) },
      livemode: false,
      pending_webhooks: 0,
      request: { id: ctx.requestId, idempotency_key: ctx.idempotencyKey },
      type,
    };
    this.state.events[event.id] = event;
    this.track(event.id);
    if (this.outbox) this.outbox.push(event);
    else this.opts.onEvent(event);
    return event;
  }

  /** Paginates `items` newest first with Stripe's `limit`, `starting_after`, `ending_before`. */
  private page<T extends { id: string }>(items: T[], p: Params, url: string): WList<T> {
    const limit = p.int("limit", 1, 100) ?? 10;
    const order = this.state.order;
    const sorted = [...items].sort((a, b) => (order[b.id] ?? 0) - (order[a.id] ?? 0));
    const after = p.optStr("starting_after");
    const before = p.optStr("ending_before");
    if (after && before) throw invalidParam("ending_before", "You may only specify one of these parameters: ending_before, starting_after.", "parameters_exclusive");
    let data: T[];
    let hasMore: boolean;
    if (after) {
      const pos = order[after];
      if (pos === undefined) throw noSuch("object", after, "starting_after", 400);
      const rest = sorted.filter((x) => (order[x.id] ?? 0) < pos);
      data = rest.slice(0, limit);
      hasMore = rest.length > limit;
    } else if (before) {
      const pos = order[before];
      if (pos === undefined) throw noSuch("object", before, "ending_before", 400);
      const rest = sorted.filter((x) => (order[x.id] ?? 0) > pos);
      data = rest.slice(Math.max(0, rest.length - limit));
      hasMore = rest.length > limit;
    } else {
      data = sorted.slice(0, limit);
      hasMore = sorted.length > limit;
    }
    return { object: "list", data: data.map((x) => clone(x)), has_more: hasMore, url };
  }

  /** Any stored object by id (for `expand`), as the API would render it. */
  resolve(id: string): object | undefined {
    const s = this.state;
    if (s.customers[id]) return clone(s.customers[id]);
    if (s.products[id]) return clone(s.products[id]);
    if (s.prices[id]) return clone(s.prices[id]);
    if (s.subscriptions[id]) return this.renderSubscription(s.subscriptions[id]);
    if (s.invoices[id]) return clone(s.invoices[id]);
    if (s.checkouts[id]) return clone(s.checkouts[id].session);
    if (s.portals[id]) return clone(s.portals[id]);
    if (s.events[id]) return clone(s.events[id]);
    return undefined;
  }

  /** Line items of a checkout session (the includable `line_items` property). */
  checkoutLineItems(id: string): WList<WLineItem> {
    const cs = this.getCheckout(id);
    return { object: "list", data: clone(cs.lineItems), has_more: false, url: `/v1/checkout/sessions/${id}/line_items` };
  }

  // ---------------------------------------------------------------- lookups

  getCustomer(id: string, param = "id"): WCustomer {
    const c = this.state.customers[id];
    if (!c) throw noSuch("customer", id, param);
    return c;
  }

  getProduct(id: string, param = "id"): WProduct {
    const p = this.state.products[id];
    if (!p) throw noSuch("product", id, param);
    return p;
  }

  getPrice(id: string, param = "id"): WPrice {
    const p = this.state.prices[id];
    if (!p) throw noSuch("price", id, param);
    return p;
  }

  getSubscription(id: string, param = "id"): WSubscription {
    const s = this.state.subscriptions[id];
    if (!s) throw noSuch("subscription", id, param);
    return s;
  }

  getInvoice(id: string, param = "id"): WInvoice {
    const i = this.state.invoices[id];
    if (!i) throw noSuch("invoice", id, param);
    return i;
  }

  getCheckout(id: string, param = "id"): StoredCheckout {
    const c = this.state.checkouts[id];
    if (!c) throw noSuch("checkout.session", id, param);
    return c;
  }

  getPortal(id: string, param = "id"): WPortalSession {
    const p = this.state.portals[id];
    if (!p) throw noSuch("billing_portal.session", id, param);
    return p;
  }

  getEvent(id: string, param = "id"): WEventBase {
    const e = this.state.events[id];
    if (!e) throw noSuch("event", id, param);
    return e;
  }

  /** The subscription owning item `id`, and the item. */
  findItem(id: string, param = "id"): { sub: WSubscription; item: WSubscriptionItem } {
    for (const sub of Object.values(this.state.subscriptions)) {
      const item = sub.items.data.find((x) => x.id === id);
      if (item) return { sub, item };
    }
    throw noSuch("subscription_item", id, param);
  }

  productName(price: WPrice): string {
    const pid = typeof price.product === "string" ? price.product : price.product.id;
    return this.state.products[pid]?.name ?? pid;
  }

  /** A subscription as the API returns it (items carry the current price and plan objects). */
  renderSubscription(sub: WSubscription): WSubscription {
    const out = clone(sub);
    for (const item of out.items.data) {
      const price = this.state.prices[item.price.id];
      if (price) {
        item.price = clone(price);
        item.plan = planOf(price);
      }
    }
    return out;
  }

  // ---------------------------------------------------------------- customers

  createCustomer(p: Params, ctx: RequestContext): WCustomer {
    checkParams(p, SPEC.customerCreate);
    const c = buildCustomer({
      created: nowSeconds(),
      email: p.nullableStr("email") ?? null,
      name: p.nullableStr("name") ?? null,
      description: p.nullableStr("description") ?? null,
      phone: p.nullableStr("phone") ?? null,
      metadata: applyMetadata({}, p.metadata()),
    });
    const locales = p.strArray("preferred_locales");
    if (locales) c.preferred_locales = locales;
    this.state.customers[c.id] = c;
    this.track(c.id);
    this.emit("customer.created", c, ctx);
    return clone(c);
  }

  updateCustomer(id: string, p: Params, ctx: RequestContext): WCustomer {
    const c = this.getCustomer(id);
    checkParams(p, SPEC.customerUpdate);
    const before = clone(c);
    const email = p.nullableStr("email");
    if (email !== undefined) c.email = email;
    const name = p.nullableStr("name");
    if (name !== undefined) c.name = name;
    const description = p.nullableStr("description");
    if (description !== undefined) c.description = description;
    const phone = p.nullableStr("phone");
    if (phone !== undefined) c.phone = phone;
    const locales = p.strArray("preferred_locales");
    if (locales) c.preferred_locales = locales;
    c.metadata = applyMetadata(c.metadata, p.metadata());
    this.emitIfChanged("customer.updated", before, c, ctx);
    return clone(c);
  }

  deleteCustomer(id: string, ctx: RequestContext): Deleted {
    const c = this.getCustomer(id);
    for (const sub of Object.values(this.state.subscriptions)) {
      if (sub.customer === id && sub.status !== "canceled") this.endSubscription(sub, ctx, "cancellation_requested");
    }
    delete this.state.customers[id];
    this.emit("customer.deleted", c, ctx);
    return { id, object: "customer", deleted: true };
  }

  listCustomers(p: Params): WList<WCustomer> {
    checkParams(p, SPEC.customerList);
    const email = p.optStr("email");
    const items = Object.values(this.state.customers).filter((c) => email === undefined || c.email === email);
    return this.page(items, p, "/v1/customers");
  }

  // ---------------------------------------------------------------- products

  createProduct(p: Params, ctx: RequestContext): WProduct {
    checkParams(p, SPEC.productCreate);
    const id = p.optStr("id");
    if (id !== undefined && this.state.products[id]) {
      throw new StripeApiError(400, "invalid_request_error", "Product already exists.", "id", "resource_already_exists");
    }
    const type = p.oneOf("type", ["service", "good"]);
    if (type === "good") throw invalidParam("type", "The local Stripe fake only models products of type service.", "parameter_unsupported_by_fake");
    const prod = buildProduct({
      id,
      created: nowSeconds(),
      name: p.reqStr("name"),
      description: p.nullableStr("description") ?? null,
      active: p.bool("active") ?? true,
      metadata: applyMetadata({}, p.metadata()),
      unitLabel: p.nullableStr("unit_label") ?? null,
    });
    prod.statement_descriptor = p.nullableStr("statement_descriptor") ?? null;
    this.state.products[prod.id] = prod;
    this.track(prod.id);
    this.emit("product.created", prod, ctx);
    return clone(prod);
  }

  updateProduct(id: string, p: Params, ctx: RequestContext): WProduct {
    const prod = this.getProduct(id);
    checkParams(p, SPEC.productUpdate);
    const before = clone(prod);
    const name = p.optStr("name");
    if (name !== undefined) prod.name = name;
    const description = p.nullableStr("description");
    if (description !== undefined) prod.description = description;
    const active = p.bool("active");
    if (active !== undefined) prod.active = active;
    const unitLabel = p.nullableStr("unit_label");
    if (unitLabel !== undefined) prod.unit_label = unitLabel;
    const sd = p.nullableStr("statement_descriptor");
    if (sd !== undefined) prod.statement_descriptor = sd;
    const dp = p.nullableStr("default_price");
    if (dp !== undefined) {
      if (dp !== null) {
        const price = this.getPrice(dp, "default_price");
        if (price.product !== prod.id) throw invalidParam("default_price", `The price ${dp} does not belong to product ${prod.id}.`);
      }
      prod.default_price = dp;
    }
    prod.metadata = applyMetadata(prod.metadata, p.metadata());
    if (this.emitIfChanged("product.updated", before, prod, ctx)) prod.updated = nowSeconds();
    return clone(prod);
  }

  listProducts(p: Params): WList<WProduct> {
    checkParams(p, SPEC.productList);
    const active = p.bool("active");
    const ids = p.strArray("ids");
    const items = Object.values(this.state.products).filter((x) => (active === undefined || x.active === active) && (!ids || ids.includes(x.id)));
    return this.page(items, p, "/v1/products");
  }

  // ---------------------------------------------------------------- prices

  createPrice(p: Params, ctx: RequestContext): WPrice {
    checkParams(p, SPEC.priceCreate);
    const currency = p.reqStr("currency").toLowerCase();
    if (!/^[a-z]{3}$/.test(currency)) throw invalidParam("currency", `Invalid currency: ${currency}. Stripe currencies are three-letter ISO codes.`);
    const scheme = p.oneOf("billing_scheme", ["per_unit", "tiered"]);
    if (scheme === "tiered") throw invalidParam("billing_scheme", "The local Stripe fake only models per_unit prices.", "parameter_unsupported_by_fake");
    p.oneOf("tax_behavior", ["exclusive", "inclusive", "unspecified"]);
    const unitAmount = p.int("unit_amount", 0, 99_999_999);
    if (unitAmount === undefined) throw missingParam("unit_amount");
    let productId = p.optStr("product");
    const productData = p.obj("product_data");
    if (productId && productData) throw invalidParam("product_data", "You may only specify one of these parameters: product, product_data.", "parameters_exclusive");
    if (productId) {
      this.getProduct(productId, "product");
    } else if (productData) {
      productData.allowOnly(["name", "active", "id", "metadata", "statement_descriptor", "tax_code", "tax_details", "unit_label"]);
      const prod = buildProduct({
        id: productData.optStr("id"),
        created: nowSeconds(),
        name: productData.reqStr("name"),
        description: null,
        active: productData.bool("active") ?? true,
        metadata: applyMetadata({}, productData.metadata()),
        unitLabel: productData.nullableStr("unit_label") ?? null,
      });
      if (this.state.products[prod.id]) throw new StripeApiError(400, "invalid_request_error", "Product already exists.", "product_data[id]", "resource_already_exists");
      this.state.products[prod.id] = prod;
      this.track(prod.id);
      this.emit("product.created", prod, ctx);
      productId = prod.id;
    } else {
      throw missingParam("product");
    }
    const rec = p.obj("recurring");
    let recurring: { interval: Interval; intervalCount: number; trialPeriodDays: number | null } | null = null;
    if (rec) {
      rec.allowOnly(["interval", "interval_count", "meter", "trial_period_days", "usage_type"]);
      const interval = rec.oneOf("interval", INTERVALS);
      if (!interval) throw missingParam("recurring[interval]");
      const usage = rec.oneOf("usage_type", ["licensed", "metered"]);
      if (usage === "metered") throw invalidParam("recurring[usage_type]", "The local Stripe fake only models licensed (per-seat) prices.", "parameter_unsupported_by_fake");
      const maxCount = interval === "year" ? 3 : interval === "month" ? 36 : interval === "week" ? 156 : 1095;
      recurring = { interval, intervalCount: rec.int("interval_count", 1, maxCount) ?? 1, trialPeriodDays: rec.int("trial_period_days", 0, 730) ?? null };
    }
    const lookupKey = p.optStr("lookup_key") ?? null;
    const transfer = p.bool("transfer_lookup_key") ?? false;
    if (lookupKey !== null) this.claimLookupKey(lookupKey, transfer, null, ctx);
    const price = buildPrice({
      created: nowSeconds(),
      currency,
      unitAmount,
      product: productId,
      active: p.bool("active") ?? true,
      lookupKey,
      nickname: p.nullableStr("nickname") ?? null,
      metadata: applyMetadata({}, p.metadata()),
      recurring,
    });
    this.state.prices[price.id] = price;
    this.track(price.id);
    this.emit("price.created", price, ctx);
    return clone(price);
  }

  /** Frees `key` for `forPrice`: refuses if another price holds it, unless `transfer`. */
  private claimLookupKey(key: string, transfer: boolean, forPrice: string | null, ctx: RequestContext): void {
    if (key.length > 200) throw invalidParam("lookup_key", "lookup_key can be at most 200 characters long.");
    const holder = Object.values(this.state.prices).find((x) => x.lookup_key === key && x.id !== forPrice);
    if (!holder) return;
    if (!transfer) {
      throw invalidParam("lookup_key", `A price (\`${holder.id}\`) already uses that lookup key. Pass transfer_lookup_key=true to move it to this price.`, "lookup_key_already_used");
    }
    const before = clone(holder);
    holder.lookup_key = null;
    this.emitIfChanged("price.updated", before, holder, ctx);
  }

  updatePrice(id: string, p: Params, ctx: RequestContext): WPrice {
    const price = this.getPrice(id);
    checkParams(p, SPEC.priceUpdate);
    const before = clone(price);
    const active = p.bool("active");
    if (active !== undefined) price.active = active;
    const nickname = p.nullableStr("nickname");
    if (nickname !== undefined) price.nickname = nickname;
    const lookupKey = p.nullableStr("lookup_key");
    if (lookupKey !== undefined) {
      if (lookupKey !== null) this.claimLookupKey(lookupKey, p.bool("transfer_lookup_key") ?? false, price.id, ctx);
      price.lookup_key = lookupKey;
    }
    price.metadata = applyMetadata(price.metadata, p.metadata());
    this.emitIfChanged("price.updated", before, price, ctx);
    return clone(price);
  }

  listPrices(p: Params): WList<WPrice> {
    checkParams(p, SPEC.priceList);
    const active = p.bool("active");
    const lookupKeys = p.strArray("lookup_keys");
    if (lookupKeys && lookupKeys.length > 10) throw invalidParam("lookup_keys", "You can pass at most 10 lookup_keys.");
    const product = p.optStr("product");
    const currency = p.optStr("currency")?.toLowerCase();
    const type = p.oneOf("type", ["one_time", "recurring"]);
    const rec = p.obj("recurring");
    rec?.allowOnly(["interval", "meter", "usage_type"]);
    const interval = rec?.oneOf("interval", INTERVALS);
    const items = Object.values(this.state.prices).filter(
      (x) =>
        (active === undefined || x.active === active) &&
        (!lookupKeys || (x.lookup_key !== null && lookupKeys.includes(x.lookup_key))) &&
        (product === undefined || x.product === product) &&
        (currency === undefined || x.currency === currency) &&
        (type === undefined || x.type === type) &&
        (interval === undefined || x.recurring?.interval === interval),
    );
    return this.page(items, p, "/v1/prices");
  }

  // ---------------------------------------------------------------- checkout

  createCheckoutSession(p: Params, _ctx: RequestContext): WCheckoutSession {
    checkParams(p, SPEC.checkoutCreate);
    const mode = p.reqStr("mode");
    if (mode !== "subscription") {
      throw invalidParam("mode", `The local Stripe fake implements mode=subscription only (got ${mode}).`, "parameter_unsupported_by_fake");
    }
    const uiMode = p.optStr("ui_mode");
    if (uiMode !== undefined && uiMode !== "hosted") throw invalidParam("ui_mode", "The local Stripe fake implements ui_mode=hosted only.", "parameter_unsupported_by_fake");
    const successUrl = p.reqStr("success_url");
    checkUrl(successUrl, "success_url");
    const cancelUrl = p.optStr("cancel_url") ?? null;
    if (cancelUrl) checkUrl(cancelUrl, "cancel_url");
    const rawItems = p.objArray("line_items");
    if (!rawItems || rawItems.length === 0) throw missingParam("line_items");
    if (rawItems.length > 20) throw invalidParam("line_items", "A subscription Checkout Session can have at most 20 line items.");
    const lineItems: WLineItem[] = [];
    const seen = new Set<string>();
    let first: WPrice | null = null;
    for (const li of rawItems) {
      checkParams(li, SPEC.checkoutLineItem);
      const price = this.getPrice(li.reqStr("price"), li.name("price"));
      if (!price.active) throw invalidParam(li.name("price"), `The price specified (${price.id}) is inactive. This field only accepts active prices.`);
      if (!price.recurring) throw invalidParam(li.name("price"), `The price ${price.id} is not recurring; the local Stripe fake needs recurring prices in subscription mode.`, "parameter_unsupported_by_fake");
      if (seen.has(price.id)) throw invalidParam(li.name("price"), `The price ${price.id} appears in more than one line item; use one line item with a quantity instead.`);
      seen.add(price.id);
      const quantity = li.int("quantity", 1, 999_999) ?? 1;
      if (first && (price.currency !== first.currency || price.recurring.interval !== first.recurring?.interval || price.recurring.interval_count !== first.recurring?.interval_count)) {
        throw invalidParam(li.name("price"), "All prices on a subscription must have the same currency and billing interval.");
      }
      first = first ?? price;
      lineItems.push(buildCheckoutLineItem(price, this.productName(price), quantity));
    }
    const customer = p.optStr("customer") ?? null;
    const customerEmail = p.optStr("customer_email") ?? null;
    if (customer && customerEmail) throw invalidParam("customer_email", "You may only specify one of these parameters: customer, customer_email.", "parameters_exclusive");
    if (customer) this.getCustomer(customer, "customer");
    if (customerEmail && !/^[^@\s]+@[^@\s]+\.[^@\s]+$/.test(customerEmail)) throw invalidParam("customer_email", `Invalid email address: ${customerEmail}`, "email_invalid");
    const clientRef = p.optStr("client_reference_id") ?? null;
    if (clientRef && clientRef.length > 200) throw invalidParam("client_reference_id", "client_reference_id can be at most 200 characters long.");
    const sd = p.obj("subscription_data");
    let subscriptionData: StoredCheckout["subscriptionData"] = { metadata: {}, trialPeriodDays: null, description: null };
    if (sd) {
      checkParams(sd, SPEC.checkoutSubscriptionData);
      sd.oneOf("proration_behavior", ["create_prorations", "none"]);
      subscriptionData = {
        metadata: applyMetadata({}, sd.metadata(), sd.name("metadata")),
        trialPeriodDays: sd.int("trial_period_days", 1, 730) ?? null,
        description: sd.optStr("description") ?? null,
      };
    }
    const created = nowSeconds();
    const expiresAt = p.int("expires_at") ?? created + 24 * 3600;
    if (expiresAt < created + 30 * 60 || expiresAt > created + 24 * 3600) {
      throw invalidParam("expires_at", "The expires_at timestamp must be between 30 minutes and 24 hours from now.");
    }
    const id = newId("cs_test", 58);
    const total = lineItems.reduce((s, li) => s + li.amount_total, 0);
    const session = buildCheckoutSession({
      id,
      created,
      url: `${this.opts.publicUrl}/checkout/${id}`,
      customer,
      customerEmail,
      clientReferenceId: clientRef,
      metadata: applyMetadata({}, p.metadata()),
      successUrl,
      cancelUrl,
      currency: lineItems[0].currency,
      amountTotal: total,
      expiresAt,
      locale: (p.optStr("locale") ?? null) as WCheckoutSession["locale"],
    });
    this.state.checkouts[id] = { session, lineItems, subscriptionData };
    this.track(id);
    return clone(session);
  }

  /** The checkout session (expiring it first if its time has passed). */
  retrieveCheckoutSession(id: string): WCheckoutSession {
    const cs = this.getCheckout(id);
    this.expireIfDue(cs);
    return clone(cs.session);
  }

  private expireIfDue(cs: StoredCheckout): void {
    if (cs.session.status === "open" && cs.session.expires_at <= nowSeconds()) {
      cs.session.status = "expired";
      cs.session.url = null;
      this.emit("checkout.session.expired", cs.session, NO_REQUEST);
    }
  }

  expireCheckoutSession(id: string, p: Params, ctx: RequestContext): WCheckoutSession {
    checkParams(p, SPEC.empty);
    const cs = this.getCheckout(id);
    this.expireIfDue(cs);
    if (cs.session.status !== "open") {
      throw invalidParam("session", `Only Checkout Sessions with a status in ["open"] can be expired. This session has status ${cs.session.status}.`);
    }
    cs.session.status = "expired";
    cs.session.url = null;
    this.emit("checkout.session.expired", cs.session, ctx);
    return clone(cs.session);
  }

  listCheckoutSessions(p: Params): WList<WCheckoutSession> {
    checkParams(p, SPEC.checkoutList);
    const customer = p.optStr("customer");
    const subscription = p.optStr("subscription");
    const status = p.oneOf("status", ["open", "complete", "expired"]);
    const items = Object.values(this.state.checkouts)
      .map((c) => c.session)
      .filter((s) => (customer === undefined || s.customer === customer) && (subscription === undefined || s.subscription === subscription) && (status === undefined || s.status === status));
    return this.page(items, p, "/v1/checkout/sessions");
  }

  /**
   * Pays a checkout session from the hosted page: creates the customer if needed, the
   * subscription (one item per line item; trialing with a trial), a paid first invoice,
   * completes the session and emits the events Stripe sends for it. Returns the URL to
   * redirect to. `email` is required when the session has neither customer nor customer_email.
   */
  completeCheckout(id: string, email: string | null, name: string | null): string {
    const cs = this.getCheckout(id);
    this.expireIfDue(cs);
    const s = cs.session;
    if (s.status !== "open") throw new StripeApiError(409, "invalid_request_error", `This checkout session is ${s.status}; it can no longer be paid.`, "session");
    const ctx = NO_REQUEST;
    const now = nowSeconds();
    let customer: WCustomer;
    if (typeof s.customer === "string") {
      customer = this.getCustomer(s.customer, "customer");
    } else {
      const addr = s.customer_email ?? email;
      if (!addr || !/^[^@\s]+@[^@\s]+\.[^@\s]+$/.test(addr)) throw invalidParam("email", "Enter a valid email address.", "email_invalid");
      customer = buildCustomer({ created: now, email: addr, name, description: null, phone: null, metadata: {} });
      this.state.customers[customer.id] = customer;
      this.track(customer.id);
      this.emit("customer.created", customer, ctx);
    }
    const trialDays = cs.subscriptionData.trialPeriodDays;
    const firstPrice = this.getPrice((cs.lineItems[0].price as WPrice).id);
    const rec = firstPrice.recurring;
    if (!rec) throw new StripeApiError(500, "api_error", "Checkout price lost its recurring interval.");
    const trialEnd = trialDays ? now + trialDays * 86_400 : null;
    const periodEnd = trialEnd ?? addInterval(now, rec.interval as Interval, rec.interval_count);
    const subId = newId("sub");
    const sub = buildSubscription({
      id: subId,
      created: now,
      customer: customer.id,
      currency: firstPrice.currency,
      status: trialEnd ? "trialing" : "active",
      metadata: { ...cs.subscriptionData.metadata },
      description: cs.subscriptionData.description,
      billingCycleAnchor: trialEnd ?? now,
      trialStart: trialEnd ? now : null,
      trialEnd,
    });
    for (const li of cs.lineItems) {
      const price = this.getPrice((li.price as WPrice).id);
      sub.items.data.push(buildSubscriptionItem({ subscription: subId, price: clone(price), quantity: li.quantity ?? 1, created: now, periodStart: now, periodEnd, metadata: {} }));
    }
    for (const item of sub.items.data) this.track(item.id);
    this.state.subscriptions[subId] = sub;
    this.track(subId);
    this.emit("customer.subscription.created", this.renderSubscription(sub), ctx);
    const invoice = this.billPeriod(sub, customer, "subscription_create", now, periodEnd, { trial: trialEnd !== null, invoicePeriod: [now, now] });
    this.payInvoiceNow(invoice, ctx);
    s.status = "complete";
    s.payment_status = invoice.amount_due === 0 ? "no_payment_required" : "paid";
    s.customer = customer.id;
    s.subscription = subId;
    s.invoice = invoice.id;
    s.url = null;
    s.customer_details = { address: null, business_name: null, email: customer.email, individual_name: null, name: customer.name ?? null, phone: null, tax_exempt: "none", tax_ids: [] };
    this.emit("checkout.session.completed", s, ctx);
    return s.success_url ? s.success_url.replace(/\{CHECKOUT_SESSION_ID\}/g, s.id) : `${this.opts.publicUrl}/checkout/${s.id}`;
  }

  // ---------------------------------------------------------------- invoices

  /**
   * Creates an open invoice for one period of `sub` (one line per item) and emits
   * invoice.created (as a draft) and invoice.finalized. `trial` bills zero for a trial period.
   */
  private billPeriod(
    sub: WSubscription,
    customer: WCustomer,
    reason: NonNullable<WInvoice["billing_reason"]>,
    start: number,
    end: number,
    opts: { trial: boolean; invoicePeriod: [number, number] },
  ): WInvoice {
    const id = newId("in");
    const now = nowSeconds();
    const lines = sub.items.data.map((item) => {
      const price = this.state.prices[item.price.id] ?? item.price;
      const qty = item.quantity ?? 1;
      const name = this.productName(price);
      const amount = opts.trial ? 0 : (price.unit_amount ?? 0) * qty;
      const every = price.recurring ? `${price.recurring.interval_count > 1 ? `${price.recurring.interval_count} ` : ""}${price.recurring.interval}${price.recurring.interval_count > 1 ? "s" : ""}` : "once";
      const description = opts.trial ? `Trial period for ${name}` : `${qty} × ${name} (at ${formatMoney(price.unit_amount ?? 0, price.currency)} / ${every})`;
      return buildInvoiceLine({ invoice: id, subscription: sub.id, item, amount, description, periodStart: start, periodEnd: end });
    });
    const number = `${customer.invoice_prefix}-${String(customer.next_invoice_sequence ?? 1).padStart(4, "0")}`;
    customer.next_invoice_sequence = (customer.next_invoice_sequence ?? 1) + 1;
    const inv = buildInvoice({
      id,
      created: now,
      customer,
      subscription: sub,
      billingReason: reason,
      number,
      lines,
      periodStart: opts.invoicePeriod[0],
      periodEnd: opts.invoicePeriod[1],
      hostedUrl: `${this.opts.publicUrl}/invoice/${id}`,
    });
    this.state.invoices[id] = inv;
    this.track(id);
    sub.latest_invoice = id;
    const draft = clone(inv);
    draft.status = "draft";
    draft.number = null;
    draft.status_transitions.finalized_at = null;
    draft.effective_at = null;
    this.emit("invoice.created", draft, NO_REQUEST);
    this.emit("invoice.finalized", inv, NO_REQUEST);
    return inv;
  }

  /** Marks an open invoice paid and emits invoice.paid and invoice.payment_succeeded. */
  private payInvoiceNow(inv: WInvoice, ctx: RequestContext): void {
    const now = nowSeconds();
    inv.status = "paid";
    inv.amount_paid = inv.amount_due;
    inv.amount_remaining = 0;
    inv.attempted = true;
    if (inv.amount_due > 0) inv.attempt_count += 1;
    inv.auto_advance = false;
    inv.next_payment_attempt = null;
    inv.status_transitions.paid_at = now;
    this.emit("invoice.paid", inv, ctx);
    this.emit("invoice.payment_succeeded", inv, ctx);
  }

  /** A failed payment attempt on an open invoice: emits invoice.payment_failed. */
  private failInvoiceNow(inv: WInvoice, ctx: RequestContext): void {
    const now = nowSeconds();
    inv.attempted = true;
    inv.attempt_count += 1;
    // Stripe's default retry schedule tries up to 4 times over about 3 weeks.
    inv.next_payment_attempt = inv.attempt_count < 4 ? now + 3 * 86_400 : null;
    this.emit("invoice.payment_failed", inv, ctx);
  }

  /** The open invoice of a subscription, if any (newest first). */
  openInvoice(subId: string): WInvoice | undefined {
    return Object.values(this.state.invoices)
      .filter((i) => i.status === "open" && i.parent?.subscription_details?.subscription === subId)
      .sort((a, b) => (this.state.order[b.id] ?? 0) - (this.state.order[a.id] ?? 0))[0];
  }

  /**
   * Pays an open invoice (hosted invoice page, POST /v1/invoices/:id/pay, or the renew
   * control). A past-due subscription with nothing else open returns to active.
   */
  payInvoice(id: string, ctx: RequestContext, p?: Params): WInvoice {
    const inv = this.getInvoice(id);
    if (p) checkParams(p, SPEC.invoicePay);
    if (inv.status !== "open") throw invalidParam("invoice", `Invoice ${id} is ${inv.status}; only open invoices can be paid.`, "invoice_not_open");
    this.payInvoiceNow(inv, ctx);
    const subId = inv.parent?.subscription_details?.subscription;
    const sub = typeof subId === "string" ? this.state.subscriptions[subId] : undefined;
    if (sub && sub.status === "past_due" && !this.openInvoice(sub.id)) {
      const before = this.renderSubscription(sub);
      sub.status = "active";
      this.setDelinquent(sub.customer as string, false);
      this.commitSubscription(sub, before, ctx);
    }
    return clone(inv);
  }

  private setDelinquent(customerId: string, value: boolean): void {
    const c = this.state.customers[customerId];
    if (c && c.delinquent !== value) {
      const before = clone(c);
      c.delinquent = value;
      this.emitIfChanged("customer.updated", before, c, NO_REQUEST);
    }
  }

  listInvoices(p: Params): WList<WInvoice> {
    checkParams(p, SPEC.invoiceList);
    const customer = p.optStr("customer");
    const subscription = p.optStr("subscription");
    const status = p.oneOf("status", ["draft", "open", "paid", "uncollectible", "void"]);
    const items = Object.values(this.state.invoices).filter(
      (i) =>
        (customer === undefined || i.customer === customer) &&
        (subscription === undefined || i.parent?.subscription_details?.subscription === subscription) &&
        (status === undefined || i.status === status),
    );
    return this.page(items, p, "/v1/invoices");
  }

  listInvoiceLines(id: string, p: Params): WList<WInvoice["lines"]["data"][number]> {
    checkParams(p, { known: PAGE, accepted: PAGE });
    const inv = this.getInvoice(id);
    const limit = p.int("limit", 1, 100) ?? 10;
    const after = p.optStr("starting_after");
    let data = inv.lines.data;
    if (after) {
      const i = data.findIndex((l) => l.id === after);
      if (i < 0) throw noSuch("line item", after, "starting_after", 400);
      data = data.slice(i + 1);
    }
    return { object: "list", data: clone(data.slice(0, limit)), has_more: data.length > limit, url: `/v1/invoices/${id}/lines` };
  }

  // ---------------------------------------------------------------- subscriptions

  listSubscriptions(p: Params): WList<WSubscription> {
    checkParams(p, SPEC.subscriptionList);
    const customer = p.optStr("customer");
    const price = p.optStr("price") ?? p.optStr("plan");
    const status = p.oneOf("status", ["active", "all", "canceled", "ended", "incomplete", "incomplete_expired", "past_due", "paused", "trialing", "unpaid"]);
    const items = Object.values(this.state.subscriptions).filter((s) => {
      if (customer !== undefined && s.customer !== customer) return false;
      if (price !== undefined && !s.items.data.some((i) => i.price.id === price)) return false;
      if (status === undefined) return s.status !== "canceled" && s.status !== "incomplete_expired";
      if (status === "all") return true;
      if (status === "ended") return s.status === "canceled" || s.status === "incomplete_expired";
      return s.status === status;
    });
    const list = this.page(items, p, "/v1/subscriptions");
    list.data = list.data.map((s) => this.renderSubscription(s));
    return list;
  }

  /**
   * Applies item changes (`items[i]` of a subscription update, or one subscription item's own
   * params). Each entry: id (existing item) with quantity / price / metadata / deleted, or a
   * new item with price and quantity.
   */
  private applyItemChanges(sub: WSubscription, entries: Params[], itemSpec: { known: readonly string[]; accepted: readonly string[] }): void {
    const now = nowSeconds();
    const template = sub.items.data[0];
    for (const e of entries) {
      checkParams(e, itemSpec);
      const id = e.optStr("id");
      const priceId = e.optStr("price") ?? e.optStr("plan");
      const quantity = e.int("quantity", 1, 999_999);
      const deleted = e.bool("deleted") ?? false;
      e.bool("clear_usage");
      const metadata = e.metadata();
      if (id) {
        const item = sub.items.data.find((x) => x.id === id);
        if (!item) {
          const other = Object.values(this.state.subscriptions).some((s) => s.items.data.some((x) => x.id === id));
          if (other) throw invalidParam(e.name("id"), `The subscription item ${id} belongs to a different subscription than ${sub.id}.`);
          throw noSuch("subscription_item", id, e.name("id"), 400);
        }
        if (deleted) {
          sub.items.data = sub.items.data.filter((x) => x.id !== id);
          continue;
        }
        if (priceId !== undefined) {
          const price = this.getPrice(priceId, e.name("price"));
          this.checkSubscriptionPrice(price, e.name("price"));
          if (sub.items.data.some((x) => x.id !== id && x.price.id === price.id)) {
            throw invalidParam(e.name("price"), `Cannot add multiple subscription items with the same price (${price.id}).`);
          }
          item.price = clone(price);
          item.plan = planOf(price);
        }
        if (quantity !== undefined) item.quantity = quantity;
        item.metadata = applyMetadata(item.metadata, metadata, e.name("metadata"));
      } else {
        if (deleted) throw missingParam(e.name("id"));
        if (priceId === undefined) throw missingParam(e.name("price"));
        const price = this.getPrice(priceId, e.name("price"));
        this.checkSubscriptionPrice(price, e.name("price"));
        if (sub.items.data.some((x) => x.price.id === price.id)) {
          throw invalidParam(e.name("price"), `Cannot add multiple subscription items with the same price (${price.id}).`);
        }
        const item = buildSubscriptionItem({
          subscription: sub.id,
          price: clone(price),
          quantity: quantity ?? 1,
          created: now,
          periodStart: template?.current_period_start ?? now,
          periodEnd: template?.current_period_end ?? now,
          metadata: applyMetadata({}, metadata, e.name("metadata")),
        });
        this.track(item.id);
        sub.items.data.push(item);
      }
    }
    if (sub.items.data.length === 0) {
      throw invalidParam("items", "A subscription must have at least one active price. To cancel a subscription, use DELETE /v1/subscriptions/:id.");
    }
    if (sub.items.data.length > 20) throw invalidParam("items", "A subscription can have at most 20 items.");
  }

  private checkSubscriptionPrice(price: WPrice, param: string): void {
    if (!price.active) throw invalidParam(param, `The price specified (${price.id}) is inactive. This field only accepts active prices.`);
    if (!price.recurring) throw invalidParam(param, `The price ${price.id} is not a recurring price.`);
  }

  /**
   * Checks a changed subscription (same currency and interval on every item; a changed
   * interval starts a new period with an immediate invoice) and emits
   * customer.subscription.updated with previous_attributes when anything changed.
   */
  private commitSubscription(sub: WSubscription, before: WSubscription, ctx: RequestContext): void {
    const firstPrice = sub.items.data[0].price;
    const key = (pr: WPrice) => `${pr.currency}/${pr.recurring?.interval}/${pr.recurring?.interval_count}`;
    if (sub.items.data.some((i) => key(i.price) !== key(firstPrice))) {
      throw invalidParam("items", "Currency and interval fields must match across all prices on this subscription.");
    }
    if (firstPrice.currency !== sub.currency) throw invalidParam("items", `The subscription is billed in ${sub.currency}; all prices must use it.`);
    const oldPrice = before.items.data[0]?.price;
    if (oldPrice && key(oldPrice) !== key(firstPrice) && sub.status !== "trialing" && firstPrice.recurring) {
      const now = nowSeconds();
      const end = addInterval(now, firstPrice.recurring.interval as Interval, firstPrice.recurring.interval_count);
      for (const item of sub.items.data) {
        item.current_period_start = now;
        item.current_period_end = end;
      }
      sub.billing_cycle_anchor = now;
      const inv = this.billPeriod(sub, this.getCustomer(sub.customer as string, "customer"), "subscription_update", now, end, { trial: false, invoicePeriod: [now, now] });
      this.payInvoiceNow(inv, ctx);
    }
    if (sub.cancel_at_period_end) sub.cancel_at = sub.items.data[0].current_period_end;
    this.emitIfChanged("customer.subscription.updated", before, this.renderSubscription(sub), ctx);
  }

  /** Emits `type` with previous_attributes (top-level fields that changed); returns whether anything changed. */
  private emitIfChanged(type: EventType, before: object, after: object, ctx: RequestContext): boolean {
    const prev: Record<string, unknown> = {};
    const b = before as Record<string, unknown>;
    const a = after as Record<string, unknown>;
    for (const k of new Set([...Object.keys(b), ...Object.keys(a)])) {
      if (JSON.stringify(b[k]) !== JSON.stringify(a[k])) prev[k] = b[k] ?? null;
    }
    if (Object.keys(prev).length === 0) return false;
    this.emit(type, after, ctx, prev);
    return true;
  }

  updateSubscription(id: string, p: Params, ctx: RequestContext): WSubscription {
    const sub = this.getSubscription(id);
    checkParams(p, SPEC.subscriptionUpdate);
    if (sub.status === "canceled") {
      const extra = Object.keys(p.raw).filter((k) => !["metadata", "cancellation_details", "expand"].includes(k));
      if (extra.length > 0) throw invalidParam(extra[0], "A canceled subscription can only update its cancellation_details and metadata.");
    }
    const before = this.renderSubscription(sub);
    p.oneOf("proration_behavior", ["always_invoice", "create_prorations", "none"]);
    p.oneOf("payment_behavior", ["allow_incomplete", "default_incomplete", "error_if_incomplete", "pending_if_incomplete"]);
    p.int("proration_date");
    p.bool("off_session");
    sub.metadata = applyMetadata(sub.metadata, p.metadata());
    const description = p.nullableStr("description");
    if (description !== undefined) sub.description = description;
    const details = p.obj("cancellation_details");
    if (details) {
      details.allowOnly(["comment", "feedback"]);
      const comment = details.nullableStr("comment");
      if (comment !== undefined) sub.cancellation_details = { ...(sub.cancellation_details ?? { comment: null, feedback: null, feedback_option: null, reason: null }), comment };
      const feedback = details.oneOf("feedback", ["customer_service", "low_quality", "missing_features", "other", "switched_service", "too_complex", "too_expensive", "unused"]);
      if (feedback !== undefined) sub.cancellation_details = { ...(sub.cancellation_details ?? { comment: null, feedback: null, feedback_option: null, reason: null }), feedback };
    }
    const items = p.objArray("items");
    if (items) this.applyItemChanges(sub, items, SPEC.subscriptionItemChange);
    const trialEnd = p.str("trial_end");
    if (trialEnd !== undefined) this.changeTrialEnd(sub, trialEnd, ctx);
    const cape = p.bool("cancel_at_period_end");
    if (cape !== undefined) this.setCancelAtPeriodEnd(sub, cape);
    this.commitSubscription(sub, before, ctx);
    return this.renderSubscription(sub);
  }

  private setCancelAtPeriodEnd(sub: WSubscription, value: boolean): void {
    if (value === sub.cancel_at_period_end) return;
    const details = sub.cancellation_details ?? { comment: null, feedback: null, feedback_option: null, reason: null };
    sub.cancel_at_period_end = value;
    if (value) {
      sub.cancel_at = sub.items.data[0].current_period_end;
      sub.canceled_at = nowSeconds();
      sub.cancellation_details = { ...details, reason: "cancellation_requested" };
    } else {
      sub.cancel_at = null;
      sub.canceled_at = null;
      sub.cancellation_details = { comment: null, feedback: null, feedback_option: null, reason: null };
    }
  }

  /** `trial_end=now` ends a trial at once (paid invoice, status active); a later time moves the trial end. */
  private changeTrialEnd(sub: WSubscription, value: string, ctx: RequestContext): void {
    if (sub.status !== "trialing") throw invalidParam("trial_end", "The local Stripe fake only changes trial_end on a trialing subscription.", "parameter_unsupported_by_fake");
    const now = nowSeconds();
    if (value === "now") {
      this.startPaidPeriod(sub, now, "subscription_update", ctx);
      sub.trial_end = now;
      return;
    }
    if (!/^\d+$/.test(value)) throw invalidParam("trial_end", `Invalid trial_end: must be "now" or a Unix timestamp (got ${value}).`);
    const t = Number(value);
    if (t <= now + 60) throw invalidParam("trial_end", "Invalid timestamp: must be at least one minute in the future (or \"now\").");
    if (t > now + 730 * 86_400) throw invalidParam("trial_end", "Invalid timestamp: can be no more than two years in the future.");
    sub.trial_end = t;
    sub.billing_cycle_anchor = t;
    for (const item of sub.items.data) item.current_period_end = t;
  }

  /** Starts a new paid period at `start` (trial end or renewal) with a paid invoice. */
  private startPaidPeriod(sub: WSubscription, start: number, reason: NonNullable<WInvoice["billing_reason"]>, ctx: RequestContext): void {
    const prev = sub.items.data[0];
    const price = this.state.prices[prev.price.id] ?? prev.price;
    const rec = price.recurring;
    if (!rec) throw new StripeApiError(500, "api_error", "Subscription price lost its recurring interval.");
    const end = addInterval(start, rec.interval as Interval, rec.interval_count);
    const oldStart = prev.current_period_start;
    const oldEnd = prev.current_period_end;
    for (const item of sub.items.data) {
      item.current_period_start = start;
      item.current_period_end = end;
    }
    if (sub.status === "trialing") sub.billing_cycle_anchor = start;
    sub.status = "active";
    // Stripe's invoice-level period is the period *before* the invoice (for cycle invoices).
    const inv = this.billPeriod(sub, this.getCustomer(sub.customer as string, "customer"), reason, start, end, { trial: false, invoicePeriod: reason === "subscription_cycle" ? [oldStart, oldEnd] : [start, start] });
    this.payInvoiceNow(inv, ctx);
  }

  cancelSubscription(id: string, p: Params, ctx: RequestContext): WSubscription {
    const sub = this.getSubscription(id);
    checkParams(p, SPEC.subscriptionCancel);
    p.bool("invoice_now");
    p.bool("prorate");
    if (sub.status === "canceled") throw invalidParam("subscription", `The subscription ${id} is already canceled.`, "subscription_canceled");
    const details = p.obj("cancellation_details");
    if (details) {
      details.allowOnly(["comment", "feedback"]);
      const comment = details.nullableStr("comment");
      const feedback = details.oneOf("feedback", ["customer_service", "low_quality", "missing_features", "other", "switched_service", "too_complex", "too_expensive", "unused"]);
      const cur = sub.cancellation_details ?? { comment: null, feedback: null, feedback_option: null, reason: null };
      sub.cancellation_details = { ...cur, comment: comment ?? cur.comment, feedback: feedback ?? cur.feedback };
    }
    this.endSubscription(sub, ctx, "cancellation_requested");
    return this.renderSubscription(sub);
  }

  /** Ends a subscription now and emits customer.subscription.deleted. */
  private endSubscription(sub: WSubscription, ctx: RequestContext, reason: "cancellation_requested" | "payment_failed"): void {
    const now = nowSeconds();
    sub.status = "canceled";
    sub.ended_at = now;
    sub.canceled_at = sub.canceled_at ?? now;
    sub.cancel_at = sub.cancel_at ?? now;
    sub.cancellation_details = { ...(sub.cancellation_details ?? { comment: null, feedback: null, feedback_option: null, reason: null }), reason };
    this.emit("customer.subscription.deleted", this.renderSubscription(sub), ctx);
  }

  // ---------------------------------------------------------------- subscription items

  updateSubscriptionItem(id: string, p: Params, ctx: RequestContext): WSubscriptionItem {
    const { sub } = this.findItem(id);
    checkParams(p, SPEC.subscriptionItemUpdate);
    if (sub.status === "canceled") throw invalidParam("subscription", `The subscription ${sub.id} is canceled; its items cannot change.`);
    p.oneOf("proration_behavior", ["always_invoice", "create_prorations", "none"]);
    p.oneOf("payment_behavior", ["allow_incomplete", "default_incomplete", "error_if_incomplete", "pending_if_incomplete"]);
    p.int("proration_date");
    p.bool("off_session");
    const before = this.renderSubscription(sub);
    const raw: FormParams = { ...p.raw, id };
    for (const k of ["expand", "proration_behavior", "payment_behavior", "proration_date", "off_session"]) delete raw[k];
    this.applyItemChanges(sub, [new Params(raw)], { known: SPEC.subscriptionItemChange.known, accepted: ["id", "metadata", "plan", "price", "quantity"] });
    this.commitSubscription(sub, before, ctx);
    return clone(this.renderSubscription(sub).items.data.find((x) => x.id === id) as WSubscriptionItem);
  }

  deleteSubscriptionItem(id: string, p: Params, ctx: RequestContext): Deleted {
    const { sub } = this.findItem(id);
    checkParams(p, SPEC.subscriptionItemDelete);
    const before = this.renderSubscription(sub);
    this.applyItemChanges(sub, [new Params({ id, deleted: "true" })], SPEC.subscriptionItemChange);
    this.commitSubscription(sub, before, ctx);
    return { id, object: "subscription_item", deleted: true };
  }

  retrieveSubscriptionItem(id: string): WSubscriptionItem {
    const { sub } = this.findItem(id);
    return this.renderSubscription(sub).items.data.find((x) => x.id === id) as WSubscriptionItem;
  }

  listSubscriptionItems(p: Params): WList<WSubscriptionItem> {
    checkParams(p, SPEC.subscriptionItemList);
    const sub = this.getSubscription(p.reqStr("subscription"), "subscription");
    const items = this.renderSubscription(sub).items.data;
    return this.page(items, p, `/v1/subscription_items?subscription=${sub.id}`);
  }

  // ---------------------------------------------------------------- billing portal

  createPortalSession(p: Params): WPortalSession {
    checkParams(p, SPEC.portalCreate);
    const customer = this.getCustomer(p.reqStr("customer"), "customer");
    const config = p.optStr("configuration");
    if (config !== undefined && config !== "bpc_fake_default") throw noSuch("billing portal configuration", config, "configuration", 400);
    const returnUrl = p.optStr("return_url") ?? null;
    if (returnUrl) checkUrl(returnUrl, "return_url");
    const id = newId("bps");
    const session = buildPortalSession({ id, created: nowSeconds(), customer: customer.id, returnUrl, url: `${this.opts.publicUrl}/portal/${id}` });
    const locale = p.optStr("locale");
    if (locale) session.locale = locale as WPortalSession["locale"];
    this.state.portals[id] = session;
    this.track(id);
    return clone(session);
  }

  /** The subscription a portal session may act on (it must belong to the session's customer). */
  private portalSubscription(portalId: string, subId: string): WSubscription {
    const portal = this.getPortal(portalId);
    const sub = this.getSubscription(subId, "subscription");
    if (sub.customer !== portal.customer) throw invalidParam("subscription", "This subscription does not belong to the portal session's customer.");
    if (sub.status === "canceled") throw invalidParam("subscription", "This subscription is canceled.");
    return sub;
  }

  /** Portal "Update seats": sets the quantity of every item of the subscription. */
  portalSetSeats(portalId: string, subId: string, quantityText: string): WSubscription {
    const sub = this.portalSubscription(portalId, subId);
    if (!/^\d+$/.test(quantityText.trim())) throw invalidParam("quantity", "Enter a whole number of seats.");
    const q = Number(quantityText.trim());
    if (q < 1) throw invalidParam("quantity", "A subscription needs at least 1 seat.");
    if (q > 999_999) throw invalidParam("quantity", "That is more seats than the fake allows (999999).");
    const before = this.renderSubscription(sub);
    this.applyItemChanges(
      sub,
      sub.items.data.map((i) => new Params({ id: i.id, quantity: String(q) })),
      SPEC.subscriptionItemChange,
    );
    this.commitSubscription(sub, before, NO_REQUEST);
    return this.renderSubscription(sub);
  }

  /** Portal "Cancel subscription": at period end or immediately, per the fake's setting. */
  portalCancelSubscription(portalId: string, subId: string): WSubscription {
    const sub = this.portalSubscription(portalId, subId);
    if (this.opts.portalCancel === "immediately") {
      this.endSubscription(sub, NO_REQUEST, "cancellation_requested");
    } else {
      const before = this.renderSubscription(sub);
      this.setCancelAtPeriodEnd(sub, true);
      this.commitSubscription(sub, before, NO_REQUEST);
    }
    return this.renderSubscription(sub);
  }

  /** Portal "Keep subscription": undoes a scheduled cancellation. */
  portalKeepSubscription(portalId: string, subId: string): WSubscription {
    const sub = this.portalSubscription(portalId, subId);
    const before = this.renderSubscription(sub);
    this.setCancelAtPeriodEnd(sub, false);
    this.commitSubscription(sub, before, NO_REQUEST);
    return this.renderSubscription(sub);
  }

  /** Subscriptions of a customer, newest first (for the portal page). */
  customerSubscriptions(customerId: string): WSubscription[] {
    return Object.values(this.state.subscriptions)
      .filter((s) => s.customer === customerId)
      .sort((a, b) => (this.state.order[b.id] ?? 0) - (this.state.order[a.id] ?? 0))
      .map((s) => this.renderSubscription(s));
  }

  // ---------------------------------------------------------------- events

  listEvents(p: Params): WList<WEventBase> {
    checkParams(p, SPEC.eventList);
    const type = p.optStr("type");
    const types = p.strArray("types");
    if (type && types) throw invalidParam("types", "You may only specify one of these parameters: type, types.", "parameters_exclusive");
    if (types && types.length > 20) throw invalidParam("types", "You can pass at most 20 types.");
    const delivered = p.bool("delivery_success");
    const matches = (t: string, pattern: string) => (pattern.endsWith(".*") ? t.startsWith(pattern.slice(0, -1)) : t === pattern);
    const items = Object.values(this.state.events).filter(
      (e) =>
        (type === undefined || matches(e.type, type)) &&
        (!types || types.some((t) => matches(e.type, t))) &&
        (delivered === undefined || this.opts.deliverySuccess(e.id) === delivered),
    );
    return this.page(items, p, "/v1/events");
  }

  // ---------------------------------------------------------------- test controls

  /**
   * A renewal whose payment fails: the next period starts now with an open invoice, the
   * subscription becomes past_due; emits invoice.created, invoice.finalized,
   * invoice.payment_failed and customer.subscription.updated. When an invoice is already
   * open, this is one more failed retry of it (invoice.payment_failed only).
   */
  failPayment(subId: string): { subscription: WSubscription; invoice: WInvoice } {
    const sub = this.getSubscription(subId);
    if (sub.status === "canceled") throw invalidParam("subscription", `The subscription ${subId} is canceled.`);
    const open = this.openInvoice(subId);
    if (open) {
      this.failInvoiceNow(open, NO_REQUEST);
      return { subscription: this.renderSubscription(sub), invoice: clone(open) };
    }
    const before = this.renderSubscription(sub);
    const now = nowSeconds();
    const first = sub.items.data[0];
    const price = this.state.prices[first.price.id] ?? first.price;
    const rec = price.recurring;
    if (!rec) throw new StripeApiError(500, "api_error", "Subscription price lost its recurring interval.");
    const end = addInterval(now, rec.interval as Interval, rec.interval_count);
    const oldStart = first.current_period_start;
    const oldEnd = first.current_period_end;
    for (const item of sub.items.data) {
      item.current_period_start = now;
      item.current_period_end = end;
    }
    if (sub.status === "trialing") sub.billing_cycle_anchor = now;
    const inv = this.billPeriod(sub, this.getCustomer(sub.customer as string, "customer"), "subscription_cycle", now, end, { trial: false, invoicePeriod: [oldStart, oldEnd] });
    this.failInvoiceNow(inv, NO_REQUEST);
    sub.status = "past_due";
    if (sub.cancel_at_period_end) sub.cancel_at = end;
    this.setDelinquent(sub.customer as string, true);
    this.emitIfChanged("customer.subscription.updated", before, this.renderSubscription(sub), NO_REQUEST);
    return { subscription: this.renderSubscription(sub), invoice: clone(inv) };
  }

  /**
   * The payment due succeeds. With an open invoice (after fail_payment) that invoice is paid
   * and the subscription returns to active. Otherwise the current period ends now: a
   * subscription set to cancel at period end is canceled (customer.subscription.deleted); any
   * other starts the next period with a paid invoice (a trial converts to active).
   */
  renew(subId: string): { subscription: WSubscription; invoice: WInvoice | null } {
    const sub = this.getSubscription(subId);
    if (sub.status === "canceled") throw invalidParam("subscription", `The subscription ${subId} is canceled.`);
    const open = this.openInvoice(subId);
    if (open) {
      const inv = this.payInvoice(open.id, NO_REQUEST);
      return { subscription: this.renderSubscription(sub), invoice: inv };
    }
    if (sub.cancel_at_period_end) {
      this.endSubscription(sub, NO_REQUEST, "cancellation_requested");
      return { subscription: this.renderSubscription(sub), invoice: null };
    }
    const before = this.renderSubscription(sub);
    this.startPaidPeriod(sub, nowSeconds(), "subscription_cycle", NO_REQUEST);
    this.emitIfChanged("customer.subscription.updated", before, this.renderSubscription(sub), NO_REQUEST);
    const inv = sub.latest_invoice ? clone(this.getInvoice(sub.latest_invoice as string)) : null;
    return { subscription: this.renderSubscription(sub), invoice: inv };
  }

  /** Clears all objects and events; with `keepCatalog`, products and prices stay. */
  reset(keepCatalog: boolean): void {
    const fresh = emptyState();
    if (keepCatalog) {
      fresh.products = this.state.products;
      fresh.prices = this.state.prices;
      for (const id of [...Object.keys(fresh.products), ...Object.keys(fresh.prices)]) fresh.order[id] = this.state.order[id] ?? 0;
      fresh.seq = this.state.seq;
    }
    this.state = fresh;
  }

  /** Whether a status counts as a live subscription (not ended). */
  static isLive(status: string): boolean {
    return ACTIVE_LIKE.has(status);
  }
}

function checkUrl(url: string, param: string): void {
  let ok = false;
  try {
    const u = new URL(url.replace(/\{CHECKOUT_SESSION_ID\}/g, "x"));
    ok = u.protocol === "http:" || u.protocol === "https:";
  } catch {
    ok = false;
  }
  if (!ok) throw invalidParam(param, `Not a valid URL: ${url}`, "url_invalid");
}
