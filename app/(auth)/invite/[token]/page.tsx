import type { Metadata } from "next";
import { pageUser } from "@/lib/auth/page";
import { invitationStatusMessage, lookupInvitation, ROLE_LABELS } from "@/lib/team/invitations";
import { LinkButton, Notice } from "@/app/_components/ui";
import { InviteActions } from "./invite-actions";

export const metadata: Metadata = { title: "Invitation" };

export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const inv = await lookupInvitation(token);
  const user = await pageUser();
  if (inv.status !== "valid") {
    return (
      <div className="space-y-4">
        <h1 className="text-[22px]">Invitation</h1>
        <Notice tone="error">{invitationStatusMessage(inv.status)}</Notice>
        <LinkButton href={user ? "/w" : "/signin"}>{user ? "Go to your workspaces" : "Sign in"}</LinkButton>
      </div>
    );
  }
  return (
    <div className="space-y-4">
      <h1 className="text-[22px]">Join {inv.workspaceName}</h1>
      <p className="text-ink-2">
        You are invited as <strong className="text-ink">{ROLE_LABELS[inv.role!].toLowerCase()}</strong> with the e-mail{" "}
        <strong className="text-ink">{inv.email}</strong>.
      </p>
      <InviteActions
        token={token}
        invitedEmail={inv.email!}
        accountExists={!!inv.accountExists}
        signedInEmail={user?.email}
      />
    </div>
  );
}
