import { workspaceRoute } from "@/lib/auth/guard";
import { listMembers } from "@/db/queries/workspaces";
import { seatUsage } from "@/lib/billing/seats";

// GET /api/w/:slug/members – members with their roles, and seat usage
export const GET = workspaceRoute("members.view", async ({ ctx }) => ({
  members: await listMembers(ctx.workspace.id),
  seats: await seatUsage(ctx.workspace),
}));
