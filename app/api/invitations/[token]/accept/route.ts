import { z } from "zod";
import { publicRoute } from "@/lib/auth/guard";
import { acceptInvitation, invitationStatusMessage, lookupInvitation } from "@/lib/team/invitations";
import { createUser } from "@/lib/auth/accounts";
import { passwordSchema, personNameSchema } from "@/lib/auth/schemas";
import { AppError } from "@/lib/errors";
import { parseJson } from "@/lib/http";

type P = { token: string };

const newAccount = z.object({ name: personNameSchema, password: passwordSchema });

// POST /api/invitations/:token/accept – join the workspace: as the signed-in user, or by creating an account for the invited e-mail
export const POST = publicRoute<P>(async ({ req, params, user }) => {
  if (user) return acceptInvitation(params.token, user);
  const inv = await lookupInvitation(params.token);
  if (inv.status !== "valid") {
    throw new AppError(inv.status === "unknown" ? "not_found" : "conflict", invitationStatusMessage(inv.status));
  }
  if (inv.accountExists) throw new AppError("unauthenticated", `An account for ${inv.email} already exists. Sign in to accept the invitation.`);
  const body = await parseJson(req, newAccount);
  const created = await createUser({ name: body.name, email: inv.email as string, password: body.password });
  const out = await acceptInvitation(params.token, created);
  return Response.json({ ...out, email: created.email }, { status: 201 });
});
