import { workspaceRoute } from "@/lib/auth/guard";
import { checkoutSchema, startCheckout } from "@/lib/billing/checkout";
import { parseJson } from "@/lib/http";

// POST /api/w/:slug/billing/checkout – open a Stripe Checkout page for packs × seats; answers its URL
export const POST = workspaceRoute("billing.manage", async ({ req, ctx }) => startCheckout(ctx, await parseJson(req, checkoutSchema)));
