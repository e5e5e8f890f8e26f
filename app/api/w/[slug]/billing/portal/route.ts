import { workspaceRoute } from "@/lib/auth/guard";
import { openPortal } from "@/lib/billing/portal";

// POST /api/w/:slug/billing/portal – open Stripe's billing portal for the workspace; answers its URL
export const POST = workspaceRoute("billing.manage", async ({ ctx }) => openPortal(ctx));
