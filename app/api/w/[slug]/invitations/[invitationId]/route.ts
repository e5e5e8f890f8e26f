import { workspaceRoute } from "@/lib/auth/guard";
import { revokeInvitation } from "@/lib/team/invitations";

type P = { slug: string; invitationId: string };

// DELETE /api/w/:slug/invitations/:invitationId – revoke a pending invitation
export const DELETE = workspaceRoute<P>("members.manage", async ({ params, ctx }) => {
  await revokeInvitation(ctx, params.invitationId);
  return { ok: true };
});
