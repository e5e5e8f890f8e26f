import type Stripe from "stripe";
import { env } from "@/lib/env";
import { stripe } from "@/lib/billing/stripe";
import { handleStripeEvent } from "@/webhooks/stripe";

const fail = (status: number, code: string, message: string) => Response.json({ error: { code, message } }, { status });

// POST /api/webhooks/stripe – a signed Stripe event: verify, apply once, answer 2xx only after commit
export async function POST(req: Request): Promise<Response> {
  const body = await req.text();
  const signature = req.headers.get("stripe-signature");
  if (!signature) return fail(400, "bad_request", "Missing Stripe-Signature header.");
  let event: Stripe.Event;
  try {
    event = stripe().webhooks.constructEvent(body, signature, env().STRIPE_WEBHOOK_SECRET);
  } catch {
    return fail(400, "bad_request", "The Stripe signature does not match this body, this secret or the current time.");
  }
  try {
    const result = await handleStripeEvent(event);
    return Response.json({ received: true, ...result });
  } catch (err) {
    console.error("[loopwright] webhook", err instanceof Error ? err.message : err);
    return fail(503, "unavailable", "The event could not be applied now; nothing was changed. Stripe will retry.");
  }
}
