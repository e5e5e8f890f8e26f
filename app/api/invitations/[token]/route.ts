import { publicRoute } from "@/lib/auth/guard";
import { invitationStatusMessage, lookupInvitation } from "@/lib/team/invitations";

type P = { token: string };

// GET /api/invitations/:token – what an invitation link stands for (public; nothing is consumed)
export const GET = publicRoute<P>(async ({ params }) => {
  const inv = await lookupInvitation(params.token);
  if (inv.status === "unknown") return Response.json({ error: { code: "not_found", message: invitationStatusMessage("unknown") } }, { status: 404 });
  return { invitation: { ...inv, message: inv.status === "valid" ? undefined : invitationStatusMessage(inv.status) } };
});
