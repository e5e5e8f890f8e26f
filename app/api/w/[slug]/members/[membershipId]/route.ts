import { workspaceRoute } from "@/lib/auth/guard";
import { changeRole, changeRoleSchema, removeMember } from "@/lib/team/members";
import { parseJson } from "@/lib/http";

type P = { slug: string; membershipId: string };

// PATCH /api/w/:slug/members/:membershipId – change a member's role
export const PATCH = workspaceRoute<P>("members.manage", async ({ req, params, ctx }) => {
  const { role } = await parseJson(req, changeRoleSchema);
  await changeRole(ctx, params.membershipId, role);
  return { ok: true };
});

// DELETE /api/w/:slug/members/:membershipId – remove a member from the workspace
export const DELETE = workspaceRoute<P>("members.manage", async ({ params, ctx }) => {
  await removeMember(ctx, params.membershipId);
  return { ok: true };
});
