/** Small helpers shared by the fake: ids, clock, periods, money text, HTML escaping. */
import { randomBytes } from "node:crypto";

const ALPHABET = "0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz";

/** A Stripe-looking id: `prefix_` followed by `length` random base-62 characters. */
export function newId(prefix: string, length = 24): string {
  const bytes = randomBytes(length);
  let out = "";
  for (let i = 0; i < length; i++) out += ALPHABET[bytes[i] % 62];
  return `${prefix}_${out}`;
}

/** Unix time now, in seconds. */
export function nowSeconds(): number {
  return Math.floor(Date.now() / 1000);
}

/** Billing intervals Stripe knows for recurring prices. */
export type Interval = "day" | "week" | "month" | "year";

/**
 * `start` (Unix s) moved forward by `count` intervals. Months and years keep the day of the
 * month and clamp to the month's last day (Jan 31 + 1 month = Feb 28/29), as Stripe's
 * billing anchors do.
 */
export function addInterval(start: number, interval: Interval, count = 1): number {
  if (interval === "day") return start + count * 86_400;
  if (interval === "week") return start + count * 7 * 86_400;
  const months = interval === "year" ? 12 * count : count;
  const d = new Date(start * 1000);
  const y = d.getUTCFullYear();
  const m = d.getUTCMonth() + months;
  const lastDay = new Date(Date.UTC(y, m + 1, 0)).getUTCDate();
  const day = Math.min(d.getUTCDate(), lastDay);
  return Math.floor(Date.UTC(y, m, day, d.getUTCHours(), d.getUTCMinutes(), d.getUTCSeconds()) / 1000);
}

/** Currencies without minor units (amounts are whole units), per Stripe's currency list. */
const ZERO_DECIMAL = new Set(["bif", "clp", "djf", "gnf", "jpy", "kmf", "krw", "mga", "pyg", "rwf", "ugx", "vnd", "vuv", "xaf", "xof", "xpf"]);

/** An amount in the currency's smallest unit as text, e.g. 4900 usd → "49.00 USD". */
export function formatMoney(amount: number, currency: string): string {
  const c = currency.toLowerCase();
  const major = ZERO_DECIMAL.has(c) ? String(amount) : (amount / 100).toFixed(2);
  return `${major} ${c.toUpperCase()}`;
}

/** A Unix time (s) as an ISO date, e.g. "2026-05-01". */
export function formatDate(seconds: number): string {
  return new Date(seconds * 1000).toISOString().slice(0, 10);
}

/** Escapes text for HTML element content and attribute values. */
export function esc(text: string | number | null | undefined): string {
  return String(text ?? "")
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/"/g, "&quot;")
    .replace(/'/g, "&#39;");
}

/** A deep copy of JSON-shaped data. */
export function clone<T>(value: T): T {
  return structuredClone(value);
}
