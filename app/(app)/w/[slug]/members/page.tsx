import type { Metadata } from "next";
import { requirePageContext } from "@/lib/auth/page";
import { listMembers } from "@/db/queries/workspaces";
import { listPendingInvitations } from "@/lib/team/invitations";
import { listProjects } from "@/lib/projects";
import { seatUsage } from "@/lib/billing/seats";
import { PageHeader } from "@/app/_components/ui";
import { MembersView } from "./members-view";

export const metadata: Metadata = { title: "Members" };

export default async function MembersPage({ params }: { params: Promise<{ slug: string }> }) {
  const { slug } = await params;
  const ctx = await requirePageContext(slug, "members.view");
  const [members, invitations, projects, seats] = await Promise.all([
    listMembers(ctx.workspace.id),
    listPendingInvitations(ctx.workspace.id),
    listProjects(ctx),
    seatUsage(ctx.workspace),
  ]);
  return (
    <>
      <PageHeader title="Members" eyebrow={ctx.workspace.name}>
        Owners, engineers and checkers use paid seats; clients are free and see only the projects you share with them.
      </PageHeader>
      <MembersView
        slug={slug}
        selfUserId={ctx.user.id}
        initial={JSON.parse(JSON.stringify({ members, invitations, seats }))}
        projects={projects.map((p) => ({ id: p.id, name: p.name }))}
      />
    </>
  );
}
