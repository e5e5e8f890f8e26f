import type { ReactNode } from "react";
import Link from "next/link";
import { requirePageContext } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { listWorkspacesForUser } from "@/db/queries/workspaces";
import { accessState } from "@/lib/billing/access";
import { Mark } from "@/app/_components/mark";
import { ROLE_LABELS } from "@/lib/team/invitations";
import { WorkspaceSwitcher } from "./_components/workspace-switcher";
import { NavLinks } from "./_components/nav-links";
import { UserMenu } from "./_components/user-menu";

export default async function WorkspaceLayout({ children, params }: { children: ReactNode; params: Promise<{ slug: string }> }) {
  const { slug } = await params;
  const ctx = await requirePageContext(slug, "workspace.view");
  const all = await listWorkspacesForUser(ctx.user.id);
  const access = accessState(ctx.workspace);
  const base = `/w/${slug}`;
  const nav = [
    { href: `${base}/projects`, label: "Projects", show: can(ctx.role, "project.view") },
    { href: `${base}/parts`, label: "Parts library", show: can(ctx.role, "parts.view") },
    { href: `${base}/members`, label: "Members", show: can(ctx.role, "members.view") },
    { href: `${base}/billing`, label: "Billing", show: can(ctx.role, "billing.view") },
    { href: `${base}/audit`, label: "Audit log", show: can(ctx.role, "audit.view") },
  ].filter((n) => n.show);

  return (
    <div className="min-h-screen">
      <header className="border-b border-rule bg-sheet/80 backdrop-blur">
        <div className="mx-auto flex h-12 max-w-[1400px] items-center gap-4 px-5">
          <Link href={`${base}/projects`} aria-label="Loopwright home" className="shrink-0">
            <Mark size={22} />
          </Link>
          <WorkspaceSwitcher current={slug} workspaces={all.map((w) => ({ slug: w.workspace.slug, name: w.workspace.name, role: ROLE_LABELS[w.role] }))} />
          <NavLinks items={nav.map(({ href, label }) => ({ href, label }))} />
          <div className="ml-auto flex items-center gap-3">
            <span className="hidden text-[12.5px] text-ink-3 sm:inline" data-testid="current-role">
              {ROLE_LABELS[ctx.role]}
            </span>
            <UserMenu name={ctx.user.name} email={ctx.user.email} />
          </div>
        </div>
      </header>
      {access.mode !== "full" ? (
        <div role="status" className={`border-b px-5 py-2 text-center text-[13px] ${access.mode === "grace" ? "border-warn/30 bg-warn-wash" : "border-rule-strong bg-white/70"}`}>
          <strong className="mr-1.5">{access.mode === "grace" ? "Payment overdue:" : "Read-only:"}</strong>
          {access.message}
          {can(ctx.role, "billing.view") ? (
            <Link href={`${base}/billing`} className="ml-2 font-medium text-copper underline-offset-2 hover:underline">
              Open billing
            </Link>
          ) : null}
        </div>
      ) : null}
      <main className="mx-auto max-w-[1400px] px-5 py-6">{children}</main>
    </div>
  );
}
