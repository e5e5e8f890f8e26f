import { workspaceRoute } from "@/lib/auth/guard";
import { changeSeats, changeSeatsSchema } from "@/lib/billing/seats";
import { parseJson } from "@/lib/http";

// POST /api/w/:slug/billing/seats – set the number of paid seats of the subscription
export const POST = workspaceRoute("billing.manage", async ({ req, ctx }) => changeSeats(ctx, await parseJson(req, changeSeatsSchema)));
