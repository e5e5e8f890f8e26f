import { workspaceRoute } from "@/lib/auth/guard";
import { createInvitation, inviteSchema, listPendingInvitations } from "@/lib/team/invitations";
import { created, parseJson } from "@/lib/http";

// GET /api/w/:slug/invitations – pending invitations
export const GET = workspaceRoute("members.view", async ({ ctx }) => ({ invitations: await listPendingInvitations(ctx.workspace.id) }));

// POST /api/w/:slug/invitations – invite someone by e-mail with a role (clients: with projects)
export const POST = workspaceRoute("members.manage", async ({ req, ctx }) => {
  const input = await parseJson(req, inviteSchema);
  return created(await createInvitation(ctx, input));
});
