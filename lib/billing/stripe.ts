/**
 * The one way the app talks to Stripe: the official SDK, configured from the environment
 * (STRIPE_SECRET_KEY, and STRIPE_API_HOST / PORT / PROTOCOL for a local Stripe-compatible
 * server). Also the mapping of SDK failures to our error shape.
 */
import Stripe from "stripe";
import { env } from "@/lib/env";
import { AppError } from "@/lib/errors";

export interface StripeSettings {
  secretKey: string;
  /** All three set: a local Stripe-compatible server; unset: real Stripe. */
  host?: string;
  port?: number;
  protocol?: "http" | "https";
}

const clients = new Map<string, Stripe>();

/** A new SDK client for `s` (one network retry, 10 s per request). */
export function createStripeClient(s: StripeSettings): Stripe {
  const local = s.host ? { host: s.host, port: s.port, protocol: s.protocol ?? "https" } : {};
  return new Stripe(s.secretKey, { ...local, maxNetworkRetries: 1, timeout: 10_000, appInfo: { name: "Loopwright" } });
}

/** The Stripe settings of the validated environment. */
export function stripeSettings(): StripeSettings {
  const e = env();
  return { secretKey: e.STRIPE_SECRET_KEY, host: e.STRIPE_API_HOST, port: e.STRIPE_API_PORT, protocol: e.STRIPE_API_PROTOCOL };
}

/** The SDK client for the current environment (one per distinct configuration). */
export function stripe(): Stripe {
  const s = stripeSettings();
  const key = `${s.secretKey}|${s.host ?? ""}|${s.port ?? ""}|${s.protocol ?? ""}`;
  let client = clients.get(key);
  if (!client) {
    client = createStripeClient(s);
    clients.set(key, client);
  }
  return client;
}

/** Whether `err` came from the Stripe SDK. */
export function isStripeError(err: unknown): err is Stripe.errors.StripeError {
  return err instanceof Stripe.errors.StripeError;
}

/** Whether Stripe says the object does not exist (retrying will not help). */
export function isMissingResource(err: unknown): boolean {
  return err instanceof Stripe.errors.StripeInvalidRequestError && err.code === "resource_missing";
}

/**
 * A Stripe failure as 503 `unavailable` with a sentence the owner can act on (the details go to
 * the server log); anything else is returned unchanged.
 */
export function stripeFailure(what: string, err: unknown): unknown {
  if (!isStripeError(err)) return err;
  console.error(`[loopwright] Stripe call failed (${what}): ${err.type} ${err.code ?? ""} ${err.message}`);
  return new AppError("unavailable", `The payment service could not ${what} just now. Nothing was changed; please try again in a minute.`);
}

/** Runs SDK calls; a Stripe failure becomes 503 `unavailable` (see stripeFailure). */
export async function callStripe<T>(what: string, fn: (s: Stripe) => Promise<T>): Promise<T> {
  try {
    return await fn(stripe());
  } catch (err) {
    throw stripeFailure(what, err);
  }
}
