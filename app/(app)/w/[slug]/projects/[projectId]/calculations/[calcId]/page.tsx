import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { requirePageContext } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { getCalculation } from "@/lib/calculations";
import { getProject } from "@/lib/projects";
import { getCalcType } from "@/lib/calc/registry";
import { accessState, unlockedPacks } from "@/lib/billing/access";
import { AppError } from "@/lib/errors";
import { PACKS } from "@/lib/calc/core/types";
import { CalculationSheet } from "@/app/_components/calc/sheet";
import type { SheetPermissions, SheetType } from "@/app/_components/calc/types";

export const metadata: Metadata = { title: "Calculation" };

const orNotFound = (e: unknown): never => {
  if (e instanceof AppError && e.code === "not_found") notFound();
  throw e;
};

export default async function CalculationPage({ params }: { params: Promise<{ slug: string; projectId: string; calcId: string }> }) {
  const { slug, projectId, calcId } = await params;
  const ctx = await requirePageContext(slug, "calc.view", `/w/${slug}/projects/${projectId}/calculations/${calcId}`);
  const [calc, project] = await Promise.all([getCalculation(ctx, calcId).catch(orNotFound), getProject(ctx, projectId).catch(orNotFound)]);
  if (calc.projectId !== project.id) notFound();
  const t = getCalcType(calc.typeId);
  if (!t) notFound();
  const type: SheetType = JSON.parse(JSON.stringify({ id: t.id, title: t.title, summary: t.summary, pack: t.pack, version: t.version, fields: t.fields, defaults: t.defaults }));
  const access = accessState(ctx.workspace);
  const packUnlocked = unlockedPacks(ctx.workspace).includes(t.pack);
  const packTitle = PACKS.find((p) => p.id === t.pack)?.title ?? t.pack;
  const perms: SheetPermissions = {
    edit: can(ctx.role, "calc.edit"),
    submit: can(ctx.role, "calc.submit"),
    review: can(ctx.role, "calc.review"),
    issue: can(ctx.role, "calc.issue"),
    writable: access.mode !== "read_only",
    readOnlyMessage: access.mode === "read_only" ? access.message : undefined,
    packUnlocked,
    packLockedMessage: packUnlocked ? undefined : access.mode === "read_only" ? `The ${packTitle} cannot run calculations now: the workspace is read-only.` : `The ${packTitle} is not part of this workspace's subscription.`,
    canManageBilling: can(ctx.role, "billing.manage"),
  };
  return (
    <CalculationSheet
      slug={slug}
      projectId={projectId}
      projectName={project.name}
      initial={JSON.parse(JSON.stringify(calc))}
      type={type}
      me={{ id: ctx.user.id, name: ctx.user.name }}
      perms={perms}
    />
  );
}
