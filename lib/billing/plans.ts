/**
 * Prices, in one place. Every pack is sold per seat per month; the bundle of all three is one
 * price per seat. Stripe knows each price by its lookup key (scripts/stripe-sync.ts creates the
 * products and prices from this file); the app never hard-codes a Stripe price id.
 *
 * Safe to import from client components: no server imports here.
 */
import type { PackId } from "@/lib/calc/core/types";

/** ISO currency code of every price (Stripe's lower-case form). */
export const CURRENCY = "usd";

/** The most seats one subscription may have (a guard against typos such as 1000 for 10). */
export const MAX_SEATS = 500;

export type PlanId = PackId | "bundle";

export interface Plan {
  id: PlanId;
  /** Name shown on the billing page and used as the Stripe product name. */
  title: string;
  summary: string;
  /** Packs this plan unlocks. */
  packs: readonly PackId[];
  /** Price per seat per month, in cents of CURRENCY. */
  unitAmount: number;
  /** Stripe price lookup key (stable; changing the amount moves the key to a new price). */
  lookupKey: string;
  /** Stripe product id (we choose it, so the sync finds the product again). */
  productId: string;
}

/** Every plan, packs first then the bundle. Our own numbers. */
export const PLANS: readonly Plan[] = [
  {
    id: "amplifier",
    title: "Amplifier pack",
    summary: "Gain stages, difference amplifiers, output and power stages.",
    packs: ["amplifier"],
    unitAmount: 2900,
    lookupKey: "loopwright_amplifier_seat_monthly",
    productId: "loopwright_pack_amplifier",
  },
  {
    id: "filter",
    title: "Active filter pack",
    summary: "Low-pass, high-pass and band-pass active filters with tolerance analysis.",
    packs: ["filter"],
    unitAmount: 3400,
    lookupKey: "loopwright_filter_seat_monthly",
    productId: "loopwright_pack_filter",
  },
  {
    id: "reference",
    title: "Reference pack",
    summary: "Shunt references, reference dividers and ADC reference error budgets.",
    packs: ["reference"],
    unitAmount: 1900,
    lookupKey: "loopwright_reference_seat_monthly",
    productId: "loopwright_pack_reference",
  },
  {
    id: "bundle",
    title: "All three packs",
    summary: "Amplifier, Active filter and Reference packs together, for less than the three apart.",
    packs: ["amplifier", "filter", "reference"],
    unitAmount: 6500,
    lookupKey: "loopwright_bundle_seat_monthly",
    productId: "loopwright_bundle_all_packs",
  },
];

export const PACK_IDS = ["amplifier", "filter", "reference"] as const satisfies readonly PackId[];

/** The plan with this id. */
export function planById(id: PlanId): Plan {
  const p = PLANS.find((x) => x.id === id);
  if (!p) throw new Error(`Unknown plan ${id}`);
  return p;
}

/** The plan sold under a Stripe lookup key, or undefined for a price that is not ours. */
export function planByLookupKey(key: string | null | undefined): Plan | undefined {
  return key ? PLANS.find((p) => p.lookupKey === key) : undefined;
}

/** The display name of a pack, e.g. "Active filter pack". */
export function packTitle(pack: PackId): string {
  return planById(pack).title;
}

/**
 * The plans a selection of packs is billed as: the bundle when all three are chosen (it costs
 * less than the three apart), else one plan per chosen pack, in catalogue order.
 */
export function plansForPacks(packs: readonly PackId[]): Plan[] {
  const chosen = new Set(packs);
  if (PACK_IDS.every((p) => chosen.has(p))) return [planById("bundle")];
  return PLANS.filter((p) => p.id !== "bundle" && chosen.has(p.id as PackId));
}

/** Monthly total in cents for `seats` seats of the chosen packs. */
export function monthlyTotal(packs: readonly PackId[], seats: number): number {
  return plansForPacks(packs).reduce((sum, p) => sum + p.unitAmount * seats, 0);
}

/** "$29.00" style money for cents of CURRENCY. */
export function formatMoney(cents: number, currency = CURRENCY): string {
  const symbol = currency.toLowerCase() === "usd" ? "$" : "";
  const text = (cents / 100).toFixed(2);
  return symbol ? `${symbol}${text}` : `${text} ${currency.toUpperCase()}`;
}
