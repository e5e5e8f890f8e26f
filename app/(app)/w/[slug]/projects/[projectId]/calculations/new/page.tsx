import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePageContext } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { getProject } from "@/lib/projects";
import { nextNumber } from "@/lib/calculations";
import { calcTypesOfPack } from "@/lib/calc/registry";
import { PACKS } from "@/lib/calc/core/types";
import { accessState, unlockedPacks } from "@/lib/billing/access";
import { AppError } from "@/lib/errors";
import { PageHeader } from "@/app/_components/ui";
import { NewCalculationForm, type PackChoice } from "@/app/_components/calc/new-calculation";

export const metadata: Metadata = { title: "New calculation" };

export default async function NewCalculationPage({ params }: { params: Promise<{ slug: string; projectId: string }> }) {
  const { slug, projectId } = await params;
  const ctx = await requirePageContext(slug, "calc.create", `/w/${slug}/projects/${projectId}/calculations/new`);
  const project = await getProject(ctx, projectId).catch((e) => {
    if (e instanceof AppError && e.code === "not_found") notFound();
    throw e;
  });
  const unlocked = unlockedPacks(ctx.workspace);
  const access = accessState(ctx.workspace);
  const packs: PackChoice[] = PACKS.map((p) => ({
    id: p.id,
    title: p.title,
    summary: p.summary,
    locked: !unlocked.includes(p.id),
    types: calcTypesOfPack(p.id).map((t) => ({ id: t.id, title: t.title, summary: t.summary })),
  }));
  return (
    <>
      <div className="mb-2 text-[13px] text-ink-3">
        <Link href={`/w/${slug}/projects`} className="hover:text-ink">
          Projects
        </Link>{" "}
        /{" "}
        <Link href={`/w/${slug}/projects/${projectId}`} className="hover:text-ink">
          {project.name}
        </Link>{" "}
        / New calculation
      </div>
      <PageHeader title="New calculation">Choose what to calculate; the sheet opens with sensible starting values that you then change.</PageHeader>
      <NewCalculationForm
        slug={slug}
        projectId={projectId}
        packs={packs}
        suggestedNumber={await nextNumber(projectId)}
        canManageBilling={can(ctx.role, "billing.manage")}
        readOnlyMessage={access.mode === "read_only" ? access.message : undefined}
        archived={!!project.archivedAt}
      />
    </>
  );
}
