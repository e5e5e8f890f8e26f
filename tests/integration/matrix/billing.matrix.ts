/**
 * Billing routes in the permission matrix (see ../permission-matrix.test.ts). Billing is the
 * owner's alone (product design: owner = "everything, billing, members").
 *
 * The world is in its trial with no Stripe customer, so the owner's answers are the ones that
 * need no Stripe call: the summary (200), a checkout whose seats do not cover the world's 3
 * seat members (422: past the guard, refused before Stripe), the portal and the seat change
 * without a subscription (409). Successful checkouts, seat changes and portal sessions against
 * the Stripe fake are in ../billing/checkout.test.ts.
 */
import type { RouteCase } from "../permission-matrix.test";
import * as billingRoute from "@/app/api/w/[slug]/billing/route";
import * as checkoutRoute from "@/app/api/w/[slug]/billing/checkout/route";
import * as portalRoute from "@/app/api/w/[slug]/billing/portal/route";
import * as seatsRoute from "@/app/api/w/[slug]/billing/seats/route";

const OWNER_ONLY = (ok: number) => ({ owner: ok, engineer: 403, checker: 403, client: 403 });
const ws = (w: { slug: string }) => ({ slug: w.slug });

export const ROUTES: RouteCase[] = [
  { file: "app/api/w/[slug]/billing/route.ts", method: "GET", handler: billingRoute.GET, params: ws, expect: OWNER_ONLY(200) },
  { file: "app/api/w/[slug]/billing/checkout/route.ts", method: "POST", handler: checkoutRoute.POST, params: ws, body: () => ({ packs: ["amplifier"], seats: 1 }), expect: OWNER_ONLY(422) },
  { file: "app/api/w/[slug]/billing/portal/route.ts", method: "POST", handler: portalRoute.POST, params: ws, expect: OWNER_ONLY(409) },
  { file: "app/api/w/[slug]/billing/seats/route.ts", method: "POST", handler: seatsRoute.POST, params: ws, body: () => ({ seats: 5 }), expect: OWNER_ONLY(409) },
];

export const EXEMPT: Record<string, string> = {
  "app/api/webhooks/stripe/route.ts POST": "Stripe's signed events, no session; tests/integration/billing/webhook.test.ts",
};
