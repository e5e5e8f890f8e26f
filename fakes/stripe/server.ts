/**
 * A local Stripe-compatible fake for tests and the demo: the Stripe v1 endpoints Loopwright
 * uses (customers, products, prices, checkout sessions, subscriptions, subscription items,
 * billing portal sessions, invoices, events), hosted checkout / portal / invoice pages,
 * signed webhook delivery, and /_fake control endpoints. App code never imports this; it
 * talks to it through the official `stripe` SDK configured with
 * `{ host: "127.0.0.1", port, protocol: "http" }`.
 *
 * Start it from a test with `startStripeFake({ port: 0, … })`, or from the command line:
 *   node --import tsx fakes/stripe/server.ts --port 12111 \
 *     --webhook-url http://127.0.0.1:3000/api/webhooks/stripe --webhook-secret whsec_…
 */
import { createHash, randomUUID } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from "node:fs";
import { createServer, type IncomingMessage, type Server, type ServerResponse } from "node:http";
import type { AddressInfo } from "node:net";
import { dirname, resolve as resolvePath } from "node:path";
import { pathToFileURL } from "node:url";
import { NO_REQUEST, StripeEngine, type FakeState, type PortalCancelMode, type RequestContext } from "./engine";
import { StripeApiError, invalidParam } from "./errors";
import { decodeForm, FormDecodeError, type FormParams } from "./form";
import { checkoutPage, invoicePage, messagePage, portalPage } from "./pages";
import { Params } from "./params";
import { FAKE_API_VERSION } from "./types";
import { WebhookDeliverer, type DeliveryAttempt, type DeliveryRecord } from "./webhooks";

/** Options of startStripeFake. */
export interface StripeFakeOptions {
  /** TCP port; 0 (the default) picks a free one. */
  port?: number;
  /** Interface to listen on; default 127.0.0.1. */
  host?: string;
  /** Where events are POSTed (e.g. http://127.0.0.1:3000/api/webhooks/stripe). No URL: events are only stored. */
  webhookUrl?: string;
  /** Signing secret (whsec_…) for the Stripe-Signature header; required with webhookUrl. */
  webhookSecret?: string;
  /** Base URL the hosted pages are reached at (default http://host:port). */
  publicUrl?: string;
  /** JSON file to load the state from at start and save it to after changes (keeps a demo's data over restarts). */
  stateFile?: string;
  /** What the portal's "Cancel subscription" does; default at_period_end (Stripe's portal default). */
  portalCancel?: PortalCancelMode;
  /** Waits before each webhook retry, ms; default [250, 1000, 3000, 8000, 20000]. */
  retryDelaysMs?: number[];
  /** Per-attempt webhook timeout, ms; default 10000. */
  deliveryTimeoutMs?: number;
  /** Text of the portal's link back to return_url; default "Return to Loopwright". */
  returnLabel?: string;
  /** Receives one line per request and per delivery attempt; default: silent. */
  log?: (line: string) => void;
}

/** A running fake. */
export interface StripeFake {
  /** Base URL, e.g. http://127.0.0.1:54321. */
  url: string;
  port: number;
  host: string;
  /** Options for `new Stripe(key, …)` that point the SDK at this fake. */
  sdkConfig: { host: string; port: number; protocol: "http" };
  /** Stops the server and the delivery queue (saving the state file, if any). */
  close(): Promise<void>;
  /** Changes the webhook endpoint and/or secret. */
  setWebhook(url?: string, secret?: string): void;
  pauseDeliveries(): void;
  resumeDeliveries(): void;
  /** Resolves true when no webhook delivery is queued or in flight (false after the timeout, ms). */
  waitForDeliveries(timeoutMs?: number): Promise<boolean>;
  /** Delivers an event now, outside the queue (a deliberate duplicate). */
  redeliver(eventId: string): Promise<DeliveryAttempt>;
  /** The delivery log, in event creation order. */
  deliveries(): DeliveryRecord[];
  /** Clears all data (keepCatalog: products and prices stay). */
  reset(keepCatalog?: boolean): void;
  /** The billing engine (state and operations), for tests that need to look inside. */
  engine: StripeEngine;
}

const DEFAULT_RETRIES = [250, 1000, 3000, 8000, 20_000];
const MAX_BODY = 1024 * 1024;

class HttpError extends Error {
  constructor(
    readonly status: number,
    message: string,
  ) {
    super(message);
  }
}

function readBody(req: IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    req.on("data", (c: Buffer) => {
      size += c.length;
      if (size > MAX_BODY) {
        reject(new HttpError(413, "Request body too large"));
        req.destroy();
        return;
      }
      chunks.push(c);
    });
    req.on("end", () => resolve(Buffer.concat(chunks).toString("utf8")));
    req.on("error", reject);
  });
}

/** The API key from Bearer or Basic auth, or null when none was sent. */
function apiKeyOf(req: IncomingMessage): string | null {
  const h = req.headers.authorization;
  if (!h) return null;
  const [scheme, value] = h.split(" ", 2);
  if (!value) return null;
  if (scheme.toLowerCase() === "bearer") return value.trim();
  if (scheme.toLowerCase() === "basic") {
    const decoded = Buffer.from(value, "base64").toString("utf8");
    return decoded.split(":")[0] ?? null;
  }
  return null;
}

function masked(key: string): string {
  return key.length > 12 ? `${key.slice(0, 8)}${"*".repeat(Math.max(0, key.length - 12))}${key.slice(-4)}` : key;
}

interface Route {
  method: string;
  pattern: RegExp;
  handler: (m: RegExpMatchArray, p: Params, ctx: RequestContext) => unknown;
}

interface IdemEntry {
  fingerprint: string;
  status: number;
  body: string;
}

/** Starts the fake; resolves once it listens. */
export async function startStripeFake(opts: StripeFakeOptions = {}): Promise<StripeFake> {
  const host = opts.host ?? "127.0.0.1";
  if (opts.webhookUrl && !opts.webhookSecret) throw new Error("startStripeFake: webhookSecret is required when webhookUrl is set");
  const log = opts.log ?? (() => undefined);
  const returnLabel = opts.returnLabel ?? "Return to Loopwright";

  let initial: FakeState | undefined;
  if (opts.stateFile && existsSync(opts.stateFile)) {
    const parsed = JSON.parse(readFileSync(opts.stateFile, "utf8")) as FakeState;
    if (parsed.version !== 1) throw new Error(`startStripeFake: ${opts.stateFile} has unknown state version ${String(parsed.version)}`);
    initial = parsed;
  }

  // eslint-disable-next-line prefer-const -- assigned once the engine exists
  let deliverer: WebhookDeliverer;
  const engine = new StripeEngine(
    {
      publicUrl: opts.publicUrl ?? "",
      portalCancel: opts.portalCancel ?? "at_period_end",
      onEvent: (event) => {
        deliverer.enqueue(event);
        if (deliverer.log.get(event.id)?.status === "pending") event.pending_webhooks = 1;
        log(`event ${event.id} ${event.type}`);
      },
      deliverySuccess: (id) => {
        const rec = deliverer.log.get(id);
        if (!rec || rec.status === "no_endpoint") return null;
        return rec.status === "delivered";
      },
    },
    initial,
  );
  deliverer = new WebhookDeliverer({
    url: opts.webhookUrl,
    secret: opts.webhookSecret,
    retryDelaysMs: opts.retryDelaysMs ?? DEFAULT_RETRIES,
    timeoutMs: opts.deliveryTimeoutMs ?? 10_000,
    getEvent: (id) => engine.state.events[id],
    onDelivered: (id) => {
      const e = engine.state.events[id];
      if (e) e.pending_webhooks = 0;
    },
    onAttempt: (id, a) => log(`webhook ${id} ${engine.state.events[id]?.type ?? ""} → ${a.status ?? a.error ?? "error"}${a.manual ? " (redelivery)" : ""} in ${a.durationMs} ms`),
  });

  // ------------------------------------------------------------------ persistence
  let saveTimer: NodeJS.Timeout | null = null;
  const saveNow = () => {
    if (!opts.stateFile) return;
    if (saveTimer) clearTimeout(saveTimer);
    saveTimer = null;
    mkdirSync(dirname(resolvePath(opts.stateFile)), { recursive: true });
    const tmp = `${opts.stateFile}.tmp`;
    writeFileSync(tmp, JSON.stringify(engine.state));
    renameSync(tmp, opts.stateFile);
  };
  const scheduleSave = () => {
    if (!opts.stateFile || saveTimer) return;
    saveTimer = setTimeout(saveNow, 200);
  };

  // ------------------------------------------------------------------ expand
  const cannotExpand = (path: string) => invalidParam("expand", `This property cannot be expanded (${path}).`);
  const expandInto = (value: unknown, segs: string[], path: string): unknown => {
    if (segs.length === 0 || value === null || value === undefined) return value;
    if (Array.isArray(value)) return value.map((v) => expandInto(v, segs, path));
    if (typeof value !== "object") throw cannotExpand(path);
    const obj = value as Record<string, unknown>;
    const [head, ...rest] = segs;
    let field = obj[head];
    if (field === undefined) {
      if (head === "line_items" && obj.object === "checkout.session" && typeof obj.id === "string") field = engine.checkoutLineItems(obj.id);
      else throw cannotExpand(path);
    }
    if (typeof field === "string") {
      const resolved = engine.resolve(field);
      if (!resolved) throw cannotExpand(path);
      field = resolved;
    }
    obj[head] = rest.length > 0 ? expandInto(field, rest, path) : field;
    return obj;
  };
  const applyExpand = (result: unknown, p: Params): unknown => {
    const paths = p.strArray("expand") ?? [];
    for (const path of paths) {
      const segs = path.split(".");
      if (segs.length > 4) throw invalidParam("expand", `You cannot expand more than 4 levels of a property (${path}).`);
      expandInto(result, segs, path);
    }
    return result;
  };

  // ------------------------------------------------------------------ API routes
  const id = "([^/]+)";
  const r = (method: string, path: string, handler: Route["handler"]): Route => ({ method, pattern: new RegExp(`^${path}$`), handler });
  const routes: Route[] = [
    r("POST", "/v1/customers", (_m, p, c) => engine.createCustomer(p, c)),
    r("GET", "/v1/customers", (_m, p) => engine.listCustomers(p)),
    r("GET", `/v1/customers/${id}`, (m, p) => {
      checkOnlyExpand(p);
      return structuredClone(engine.getCustomer(m[1]));
    }),
    r("POST", `/v1/customers/${id}`, (m, p, c) => engine.updateCustomer(m[1], p, c)),
    r("DELETE", `/v1/customers/${id}`, (m, _p, c) => engine.deleteCustomer(m[1], c)),

    r("POST", "/v1/products", (_m, p, c) => engine.createProduct(p, c)),
    r("GET", "/v1/products", (_m, p) => engine.listProducts(p)),
    r("GET", `/v1/products/${id}`, (m, p) => {
      checkOnlyExpand(p);
      return structuredClone(engine.getProduct(m[1]));
    }),
    r("POST", `/v1/products/${id}`, (m, p, c) => engine.updateProduct(m[1], p, c)),

    r("POST", "/v1/prices", (_m, p, c) => engine.createPrice(p, c)),
    r("GET", "/v1/prices", (_m, p) => engine.listPrices(p)),
    r("GET", `/v1/prices/${id}`, (m, p) => {
      checkOnlyExpand(p);
      return structuredClone(engine.getPrice(m[1]));
    }),
    r("POST", `/v1/prices/${id}`, (m, p, c) => engine.updatePrice(m[1], p, c)),

    r("POST", "/v1/checkout/sessions", (_m, p, c) => engine.createCheckoutSession(p, c)),
    r("GET", "/v1/checkout/sessions", (_m, p) => engine.listCheckoutSessions(p)),
    r("GET", `/v1/checkout/sessions/${id}`, (m, p) => {
      checkOnlyExpand(p);
      return engine.retrieveCheckoutSession(m[1]);
    }),
    r("GET", `/v1/checkout/sessions/${id}/line_items`, (m, p) => {
      p.allowOnly(["limit", "starting_after", "ending_before", "expand"]);
      return engine.checkoutLineItems(m[1]);
    }),
    r("POST", `/v1/checkout/sessions/${id}/expire`, (m, p, c) => engine.expireCheckoutSession(m[1], p, c)),

    r("GET", "/v1/subscriptions", (_m, p) => engine.listSubscriptions(p)),
    r("GET", `/v1/subscriptions/${id}`, (m, p) => {
      checkOnlyExpand(p);
      return engine.renderSubscription(engine.getSubscription(m[1]));
    }),
    r("POST", `/v1/subscriptions/${id}`, (m, p, c) => engine.updateSubscription(m[1], p, c)),
    r("DELETE", `/v1/subscriptions/${id}`, (m, p, c) => engine.cancelSubscription(m[1], p, c)),

    r("GET", "/v1/subscription_items", (_m, p) => engine.listSubscriptionItems(p)),
    r("GET", `/v1/subscription_items/${id}`, (m, p) => {
      checkOnlyExpand(p);
      return engine.retrieveSubscriptionItem(m[1]);
    }),
    r("POST", `/v1/subscription_items/${id}`, (m, p, c) => engine.updateSubscriptionItem(m[1], p, c)),
    r("DELETE", `/v1/subscription_items/${id}`, (m, p, c) => engine.deleteSubscriptionItem(m[1], p, c)),

    r("POST", "/v1/billing_portal/sessions", (_m, p) => engine.createPortalSession(p)),

    r("GET", "/v1/invoices", (_m, p) => engine.listInvoices(p)),
    r("GET", `/v1/invoices/${id}`, (m, p) => {
      checkOnlyExpand(p);
      return structuredClone(engine.getInvoice(m[1]));
    }),
    r("GET", `/v1/invoices/${id}/lines`, (m, p) => engine.listInvoiceLines(m[1], p)),
    r("POST", `/v1/invoices/${id}/pay`, (m, p, c) => engine.payInvoice(m[1], c, p)),

    r("GET", "/v1/events", (_m, p) => engine.listEvents(p)),
    r("GET", `/v1/events/${id}`, (m, p) => {
      checkOnlyExpand(p);
      return structuredClone(engine.getEvent(m[1]));
    }),
  ];

  const idem = new Map<string, IdemEntry>();

  const send = (res: ServerResponse, status: number, body: string, headers: Record<string, string> = {}) => {
    res.writeHead(status, { "content-type": "application/json", "content-length": String(Buffer.byteLength(body)), ...headers });
    res.end(body);
  };
  const sendHtml = (res: ServerResponse, status: number, html: string) => {
    res.writeHead(status, { "content-type": "text/html; charset=utf-8", "content-length": String(Buffer.byteLength(html)), "cache-control": "no-store" });
    res.end(html);
  };
  const redirect = (res: ServerResponse, location: string) => {
    res.writeHead(303, { location, "content-length": "0" });
    res.end();
  };

  async function handleApi(req: IncomingMessage, res: ServerResponse, url: URL): Promise<void> {
    const method = (req.method ?? "GET").toUpperCase();
    const requestId = `req_${randomUUID().replace(/-/g, "").slice(0, 14)}`;
    const baseHeaders: Record<string, string> = { "request-id": requestId, "stripe-version": FAKE_API_VERSION };
    const fail = (err: StripeApiError) => send(res, err.status, JSON.stringify(err.toBody(requestId), null, 2), baseHeaders);

    const key = apiKeyOf(req);
    if (!key) {
      return fail(new StripeApiError(401, "invalid_request_error", "You did not provide an API key. You need to provide your API key in the Authorization header, using Bearer auth (e.g. 'Authorization: Bearer YOUR_SECRET_KEY')."));
    }
    if (!/^(sk|rk)_test_[A-Za-z0-9_]+$/.test(key)) {
      return fail(new StripeApiError(401, "invalid_request_error", `Invalid API Key provided: ${masked(key)}. The local Stripe fake accepts test-mode secret keys (sk_test_…) only.`, undefined, "api_key_invalid"));
    }
    const body = method === "POST" ? await readBody(req) : "";
    let raw: FormParams;
    try {
      const query = decodeForm(url.search.slice(1));
      raw = method === "POST" ? { ...query, ...decodeForm(body) } : query;
    } catch (err) {
      if (err instanceof FormDecodeError) return fail(invalidParam(err.param, err.message));
      throw err;
    }
    const route = routes.find((rt) => rt.method === method && rt.pattern.test(url.pathname));
    if (!route) {
      const known = routes.some((rt) => rt.pattern.test(url.pathname));
      return fail(
        new StripeApiError(
          404,
          "invalid_request_error",
          known
            ? `Unrecognized request URL (${method}: ${url.pathname}). This path exists for other methods (${routes.filter((rt) => rt.pattern.test(url.pathname)).map((rt) => rt.method).join(", ")}).`
            : `Unrecognized request URL (${method}: ${url.pathname}). The local Stripe fake implements only the endpoints listed in fakes/stripe/README.md.`,
        ),
      );
    }
    const idemKey = typeof req.headers["idempotency-key"] === "string" ? req.headers["idempotency-key"] : null;
    if (idemKey) baseHeaders["idempotency-key"] = idemKey;
    let idemSlot: string | null = null;
    let fingerprint = "";
    if (method === "POST" && idemKey) {
      if (idemKey.length > 255) return fail(invalidParam("Idempotency-Key", "Idempotency keys can be at most 255 characters long."));
      idemSlot = `${key}\u0000${idemKey}`;
      fingerprint = createHash("sha256").update(`${method} ${url.pathname}\n${JSON.stringify(raw)}`).digest("hex");
      const prior = idem.get(idemSlot);
      if (prior) {
        if (prior.fingerprint !== fingerprint) {
          return fail(
            new StripeApiError(
              400,
              "idempotency_error",
              `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${idemKey}' if you meant to execute a different request.`,
            ),
          );
        }
        log(`${method} ${url.pathname} ${prior.status} (idempotent replay)`);
        return send(res, prior.status, prior.body, { ...baseHeaders, "idempotent-replayed": "true" });
      }
    }
    const ctx: RequestContext = { requestId, idempotencyKey: idemKey };
    try {
      const p = new Params(raw);
      const result = engine.atomic(() => applyExpand(route.handler(url.pathname.match(route.pattern) as RegExpMatchArray, p, ctx), p));
      const json = JSON.stringify(result, null, 2);
      // Stripe saves idempotent results once an endpoint has started executing; the fake saves successes.
      if (idemSlot) {
        idem.set(idemSlot, { fingerprint, status: 200, body: json });
        // The SDK keys every POST; keep the newest 10 000 (Stripe keeps keys for 24 hours).
        if (idem.size > 10_000) idem.delete(idem.keys().next().value as string);
      }
      log(`${method} ${url.pathname} 200`);
      send(res, 200, json, baseHeaders);
    } catch (err) {
      if (err instanceof StripeApiError) {
        log(`${method} ${url.pathname} ${err.status} ${err.message}`);
        return fail(err);
      }
      throw err;
    }
  }

  function checkOnlyExpand(p: Params): void {
    p.allowOnly(["expand"]);
  }

  // ------------------------------------------------------------------ hosted pages
  const renderPortal = (portalId: string, notice?: string, error?: string): string => {
    const session = engine.getPortal(portalId);
    const customer = engine.getCustomer(session.customer, "customer");
    const invoices = Object.values(engine.state.invoices)
      .filter((i) => i.customer === customer.id)
      .sort((a, b) => (engine.state.order[b.id] ?? 0) - (engine.state.order[a.id] ?? 0));
    return portalPage({
      session,
      customer,
      subscriptions: engine.customerSubscriptions(customer.id),
      invoices,
      productName: (pr) => engine.productName(pr),
      returnLabel,
      cancelMode: engine.portalCancel,
      notice,
      error,
    });
  };
  const NOTICES: Record<string, string> = {
    seats: "Seats updated.",
    cancel: "Subscription cancelled.",
    cancel_scheduled: "The subscription will end at the end of the current period.",
    keep: "The subscription will continue.",
    paid: "Invoice paid.",
  };

  async function handlePage(req: IncomingMessage, res: ServerResponse, url: URL): Promise<boolean> {
    const method = (req.method ?? "GET").toUpperCase();
    const path = url.pathname;
    let m: RegExpMatchArray | null;
    const form = async () => new Params(decodeForm(method === "POST" ? await readBody(req) : ""));
    const pageError = (err: unknown, title: string): boolean => {
      if (err instanceof StripeApiError) {
        sendHtml(res, err.status === 404 ? 404 : 400, messagePage(title, err.message));
        return true;
      }
      throw err;
    };

    if ((m = path.match(/^\/checkout\/([^/]+)$/)) && method === "GET") {
      try {
        const sessionId = m[1];
        engine.atomic(() => engine.retrieveCheckoutSession(sessionId));
        const cs = engine.getCheckout(sessionId);
        const customer = typeof cs.session.customer === "string" ? (engine.state.customers[cs.session.customer] ?? null) : null;
        sendHtml(res, 200, checkoutPage(cs, (pr) => engine.productName(pr), customer));
      } catch (err) {
        return pageError(err, "Checkout not found");
      }
      return true;
    }
    if ((m = path.match(/^\/checkout\/([^/]+)\/pay$/)) && method === "POST") {
      const f = await form();
      try {
        const sessionId = m[1];
        const target = engine.atomic(() => engine.completeCheckout(sessionId, f.str("email")?.trim() || null, f.str("name")?.trim() || null));
        redirect(res, target);
      } catch (err) {
        if (err instanceof StripeApiError && err.param === "email") {
          const cs = engine.getCheckout(m[1]);
          sendHtml(res, 400, checkoutPage(cs, (pr) => engine.productName(pr), null, err.message));
          return true;
        }
        return pageError(err, "Payment not possible");
      }
      return true;
    }
    if ((m = path.match(/^\/portal\/([^/]+)$/)) && method === "GET") {
      try {
        const done = url.searchParams.get("done") ?? "";
        sendHtml(res, 200, renderPortal(m[1], NOTICES[done]));
      } catch (err) {
        return pageError(err, "Portal session not found");
      }
      return true;
    }
    if ((m = path.match(/^\/portal\/([^/]+)\/(seats|cancel|keep)$/)) && method === "POST") {
      const portalId = m[1];
      const action = m[2];
      const f = await form();
      try {
        engine.getPortal(portalId);
      } catch (err) {
        return pageError(err, "Portal session not found");
      }
      try {
        const subId = f.reqStr("subscription");
        if (action === "seats") {
          engine.atomic(() => engine.portalSetSeats(portalId, subId, f.str("quantity") ?? ""));
          redirect(res, `/portal/${portalId}?done=seats`);
        } else if (action === "cancel") {
          const sub = engine.atomic(() => engine.portalCancelSubscription(portalId, subId));
          redirect(res, `/portal/${portalId}?done=${sub.status === "canceled" ? "cancel" : "cancel_scheduled"}`);
        } else {
          engine.atomic(() => engine.portalKeepSubscription(portalId, subId));
          redirect(res, `/portal/${portalId}?done=keep`);
        }
      } catch (err) {
        if (err instanceof StripeApiError) {
          sendHtml(res, 400, renderPortal(portalId, undefined, err.message));
          return true;
        }
        throw err;
      }
      return true;
    }
    if ((m = path.match(/^\/invoice\/([^/]+)$/)) && method === "GET") {
      try {
        const done = url.searchParams.get("done") ?? "";
        sendHtml(res, 200, invoicePage(engine.getInvoice(m[1]), NOTICES[done]));
      } catch (err) {
        return pageError(err, "Invoice not found");
      }
      return true;
    }
    if ((m = path.match(/^\/invoice\/([^/]+)\/pay$/)) && method === "POST") {
      await form();
      try {
        const invoiceId = m[1];
        engine.atomic(() => engine.payInvoice(invoiceId, NO_REQUEST));
        redirect(res, `/invoice/${m[1]}?done=paid`);
      } catch (err) {
        if (err instanceof StripeApiError && err.status !== 404) {
          sendHtml(res, 400, invoicePage(engine.getInvoice(m[1]), undefined, err.message));
          return true;
        }
        return pageError(err, "Invoice not found");
      }
      return true;
    }
    return false;
  }

  // ------------------------------------------------------------------ control endpoints
  const deliveryView = (eventId: string) => {
    const e = engine.state.events[eventId];
    const rec = deliverer.log.get(eventId);
    return {
      id: eventId,
      type: e?.type ?? rec?.type,
      created: e?.created,
      object_id: (e?.data.object as { id?: string } | undefined)?.id ?? null,
      delivery: rec ? { status: rec.status, attempts: rec.attempts } : { status: "no_endpoint", attempts: [] },
    };
  };
  const eventsInOrder = () => Object.keys(engine.state.events).sort((a, b) => (engine.state.order[a] ?? 0) - (engine.state.order[b] ?? 0));

  async function handleControl(req: IncomingMessage, res: ServerResponse, url: URL): Promise<void> {
    const method = (req.method ?? "GET").toUpperCase();
    const path = url.pathname;
    const body = method === "POST" ? await readBody(req) : "";
    const ct = String(req.headers["content-type"] ?? "");
    let input: Record<string, unknown> = {};
    if (body) {
      try {
        input = ct.includes("json") ? (JSON.parse(body) as Record<string, unknown>) : decodeForm(body);
      } catch {
        return send(res, 400, JSON.stringify({ error: { type: "invalid_request_error", message: "Body must be JSON or form-encoded." } }));
      }
    }
    for (const [k, v] of url.searchParams) if (input[k] === undefined) input[k] = v;
    const ok = (value: unknown) => send(res, 200, JSON.stringify(value, null, 2));
    let m: RegExpMatchArray | null;
    try {
      if (path === "/_fake/health" && method === "GET") {
        return ok({
          ok: true,
          api_version: FAKE_API_VERSION,
          url: fake.url,
          webhook_url: deliverer.url ?? null,
          deliveries: { paused: deliverer.isPaused, pending: deliverer.pendingCount },
          counts: {
            customers: Object.keys(engine.state.customers).length,
            products: Object.keys(engine.state.products).length,
            prices: Object.keys(engine.state.prices).length,
            subscriptions: Object.keys(engine.state.subscriptions).length,
            invoices: Object.keys(engine.state.invoices).length,
            checkout_sessions: Object.keys(engine.state.checkouts).length,
            events: Object.keys(engine.state.events).length,
          },
        });
      }
      if (path === "/_fake/reset" && method === "POST") {
        const keep = input.keep === "catalog";
        reset(keep);
        return ok({ ok: true, kept: keep ? "catalog" : "nothing" });
      }
      if (path === "/_fake/config" && method === "POST") {
        const wu = typeof input.webhook_url === "string" ? input.webhook_url : undefined;
        const ws = typeof input.webhook_secret === "string" ? input.webhook_secret : undefined;
        if (wu && !ws && !deliverer.secret) return send(res, 400, JSON.stringify({ error: { type: "invalid_request_error", message: "webhook_secret is required with webhook_url." } }));
        deliverer.configure(wu, ws);
        return ok({ ok: true, webhook_url: deliverer.url ?? null });
      }
      if (path === "/_fake/state" && method === "GET") return ok(engine.state);
      if (path === "/_fake/events" && method === "GET") {
        const type = typeof input.type === "string" ? input.type : undefined;
        return ok({ paused: deliverer.isPaused, pending: deliverer.pendingCount, data: eventsInOrder().map(deliveryView).filter((e) => !type || e.type === type) });
      }
      if ((m = path.match(/^\/_fake\/events\/([^/]+)\/redeliver$/)) && method === "POST") {
        engine.getEvent(m[1]);
        const attempt = await deliverer.redeliver(m[1]);
        return ok({ ...deliveryView(m[1]), attempt });
      }
      if (path === "/_fake/deliveries/pause" && method === "POST") {
        deliverer.pause();
        return ok({ paused: true, pending: deliverer.pendingCount });
      }
      if (path === "/_fake/deliveries/resume" && method === "POST") {
        deliverer.resume();
        return ok({ paused: false, pending: deliverer.pendingCount });
      }
      if (path === "/_fake/deliveries/clear" && method === "POST") {
        deliverer.clear();
        return ok({ ok: true });
      }
      if (path === "/_fake/deliveries/wait" && (method === "POST" || method === "GET")) {
        const t = Number(input.timeout_ms ?? 10_000);
        const idle = await deliverer.idle(Number.isFinite(t) ? Math.min(Math.max(t, 0), 60_000) : 10_000);
        return ok({ idle, pending: deliverer.pendingCount, paused: deliverer.isPaused });
      }
      if ((m = path.match(/^\/_fake\/subscriptions\/([^/]+)\/(fail_payment|renew)$/)) && method === "POST") {
        const subId = m[1];
        const result = m[2] === "fail_payment" ? engine.atomic(() => engine.failPayment(subId)) : engine.atomic(() => engine.renew(subId));
        return ok(result);
      }
      if ((m = path.match(/^\/_fake\/checkout\/([^/]+)\/complete$/)) && method === "POST") {
        const email = typeof input.email === "string" ? input.email : null;
        const name = typeof input.name === "string" ? input.name : null;
        const sessionId = m[1];
        const redirectTo = engine.atomic(() => engine.completeCheckout(sessionId, email, name));
        return ok({ redirect_to: redirectTo, session: engine.retrieveCheckoutSession(sessionId) });
      }
      return send(res, 404, JSON.stringify({ error: { type: "invalid_request_error", message: `Unknown control endpoint ${method} ${path}. See fakes/stripe/README.md.` } }));
    } catch (err) {
      if (err instanceof StripeApiError) return send(res, err.status, JSON.stringify(err.toBody("req_control")));
      throw err;
    }
  }

  // ------------------------------------------------------------------ server
  const server: Server = createServer((req, res) => {
    const url = new URL(req.url ?? "/", "http://fake.local");
    const work = async () => {
      if (url.pathname.startsWith("/v1/")) return handleApi(req, res, url);
      if (url.pathname.startsWith("/_fake/")) return handleControl(req, res, url);
      if (await handlePage(req, res, url)) return;
      if (url.pathname === "/" && req.method === "GET") {
        return sendHtml(res, 200, messagePage("Local Stripe fake", "This server stands in for the Stripe API in tests and the demo. See fakes/stripe/README.md."));
      }
      send(res, 404, JSON.stringify({ error: { type: "invalid_request_error", message: `Unrecognized request URL (${req.method}: ${url.pathname}).` } }));
    };
    work()
      .then(() => {
        if (req.method !== "GET" || url.pathname.startsWith("/v1/checkout/sessions/")) scheduleSave();
      })
      .catch((err: unknown) => {
        const status = err instanceof HttpError ? err.status : 500;
        const message = err instanceof Error ? err.message : String(err);
        log(`${req.method} ${url.pathname} ${status} ${message}`);
        if (!res.headersSent) send(res, status, JSON.stringify({ error: { type: "api_error", message } }));
        else res.end();
      });
  });

  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(opts.port ?? 0, host, () => {
      server.off("error", reject);
      resolve();
    });
  });
  const port = (server.address() as AddressInfo).port;
  const urlHost = host === "0.0.0.0" || host === "::" ? "127.0.0.1" : host;
  const baseUrl = `http://${urlHost}:${port}`;
  engine.publicUrl = (opts.publicUrl ?? baseUrl).replace(/\/$/, "");

  const reset = (keepCatalog = false) => {
    engine.reset(keepCatalog);
    deliverer.reset();
    idem.clear();
    scheduleSave();
  };

  const fake: StripeFake = {
    url: baseUrl,
    port,
    host: urlHost,
    sdkConfig: { host: urlHost, port, protocol: "http" },
    engine,
    close: async () => {
      deliverer.close();
      if (opts.stateFile) saveNow();
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      });
    },
    setWebhook: (u, s) => deliverer.configure(u, s),
    pauseDeliveries: () => deliverer.pause(),
    resumeDeliveries: () => deliverer.resume(),
    waitForDeliveries: (t) => deliverer.idle(t),
    redeliver: (eventId) => deliverer.redeliver(eventId),
    deliveries: () => eventsInOrder().map((e) => deliverer.log.get(e)).filter((x): x is DeliveryRecord => x !== undefined),
    reset,
  };
  return fake;
}

// ------------------------------------------------------------------ CLI

interface CliOptions extends StripeFakeOptions {
  quiet: boolean;
}

function parseCli(argv: string[], env: NodeJS.ProcessEnv): CliOptions {
  const out: CliOptions = {
    port: env.STRIPE_FAKE_PORT ? Number(env.STRIPE_FAKE_PORT) : 12111,
    host: env.STRIPE_FAKE_HOST || "127.0.0.1",
    webhookUrl: env.STRIPE_WEBHOOK_URL || undefined,
    webhookSecret: env.STRIPE_WEBHOOK_SECRET || undefined,
    publicUrl: env.STRIPE_FAKE_PUBLIC_URL || undefined,
    stateFile: env.STRIPE_FAKE_STATE_FILE || undefined,
    portalCancel: env.STRIPE_FAKE_PORTAL_CANCEL === "immediately" ? "immediately" : "at_period_end",
    quiet: false,
  };
  for (let i = 0; i < argv.length; i++) {
    const flag = argv[i];
    const next = () => {
      const v = argv[++i];
      if (v === undefined) throw new Error(`${flag} needs a value`);
      return v;
    };
    switch (flag) {
      case "--port":
        out.port = Number(next());
        break;
      case "--host":
        out.host = next();
        break;
      case "--webhook-url":
        out.webhookUrl = next();
        break;
      case "--webhook-secret":
        out.webhookSecret = next();
        break;
      case "--public-url":
        out.publicUrl = next();
        break;
      case "--state-file":
        out.stateFile = next();
        break;
      case "--portal-cancel": {
        const v = next();
        if (v !== "at_period_end" && v !== "immediately") throw new Error("--portal-cancel must be at_period_end or immediately");
        out.portalCancel = v;
        break;
      }
      case "--retry-delays":
        out.retryDelaysMs = next()
          .split(",")
          .map((x) => Number(x.trim()));
        if (out.retryDelaysMs.some((x) => !Number.isFinite(x) || x < 0)) throw new Error("--retry-delays takes comma-separated milliseconds, e.g. 250,1000,3000");
        break;
      case "--quiet":
        out.quiet = true;
        break;
      case "--help":
        process.stdout.write(
          "Usage: node --import tsx fakes/stripe/server.ts [--port 12111] [--host 127.0.0.1] [--webhook-url URL --webhook-secret whsec_…]\n" +
            "       [--public-url URL] [--state-file data/stripe-fake.json] [--portal-cancel at_period_end|immediately] [--retry-delays 250,1000,3000] [--quiet]\n" +
            "Env: STRIPE_FAKE_PORT, STRIPE_FAKE_HOST, STRIPE_WEBHOOK_URL, STRIPE_WEBHOOK_SECRET, STRIPE_FAKE_PUBLIC_URL, STRIPE_FAKE_STATE_FILE, STRIPE_FAKE_PORTAL_CANCEL\n",
        );
        process.exit(0);
        break;
      default:
        throw new Error(`Unknown option ${flag} (try --help)`);
    }
  }
  if (!Number.isInteger(out.port) || (out.port ?? -1) < 0 || (out.port ?? 70000) > 65535) throw new Error(`Invalid port ${String(out.port)}`);
  return out;
}

async function main(): Promise<void> {
  let cli: CliOptions;
  try {
    cli = parseCli(process.argv.slice(2), process.env);
  } catch (err) {
    process.stderr.write(`stripe fake: ${err instanceof Error ? err.message : String(err)}\n`);
    process.exit(2);
  }
  const fake = await startStripeFake({ ...cli, log: cli.quiet ? undefined : (line) => process.stdout.write(`[stripe-fake] ${line}\n`) });
  process.stdout.write(`[stripe-fake] listening on ${fake.url} (API version ${FAKE_API_VERSION}); webhooks → ${cli.webhookUrl ?? "none (events stored only)"}\n`);
  let stopping = false;
  const stop = () => {
    if (stopping) return;
    stopping = true;
    void fake.close().then(() => process.exit(0));
  };
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
}

if (process.argv[1] && import.meta.url === pathToFileURL(resolvePath(process.argv[1])).href) {
  void main();
}
