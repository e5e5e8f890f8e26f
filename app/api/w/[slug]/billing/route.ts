import { workspaceRoute } from "@/lib/auth/guard";
import { billingSummary } from "@/lib/billing/portal";

// GET /api/w/:slug/billing – status, packs, seats used / paid, trial end or renewal
export const GET = workspaceRoute("billing.view", async ({ ctx }) => ({ billing: await billingSummary(ctx) }));
