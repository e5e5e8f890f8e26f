import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePageContext } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { getProject } from "@/lib/projects";
import { listCalculations, listQuerySchema } from "@/lib/calculations";
import { AppError } from "@/lib/errors";
import { PageHeader, Tag } from "@/app/_components/ui";
import { CalculationRegister } from "@/app/_components/calc/register";
import { ProjectReports } from "@/app/_components/reports/project-reports";
import { ProjectSettings } from "./project-settings";

export const metadata: Metadata = { title: "Project" };

export default async function ProjectPage({ params, searchParams }: { params: Promise<{ slug: string; projectId: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const { slug, projectId } = await params;
  const ctx = await requirePageContext(slug, "project.view");
  const project = await getProject(ctx, projectId).catch((e) => {
    if (e instanceof AppError && e.code === "not_found") notFound();
    throw e;
  });
  // Clients never see calculations (only issued reports); staff see the register.
  const showRegister = can(ctx.role, "calc.view");
  let register: { query: ReturnType<typeof listQuerySchema.parse>; page: Awaited<ReturnType<typeof listCalculations>> } | null = null;
  if (showRegister) {
    const sp = await searchParams;
    const raw = Object.fromEntries(Object.entries(sp).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v]).filter(([, v]) => v !== undefined));
    const parsed = listQuerySchema.safeParse(raw);
    const query = parsed.success ? parsed.data : listQuerySchema.parse({});
    register = { query, page: await listCalculations(ctx, projectId, query) };
  }
  return (
    <>
      <div className="mb-2 text-[13px] text-ink-3">
        <Link href={`/w/${slug}/projects`} className="hover:text-ink">
          Projects
        </Link>{" "}
        / {project.name}
      </div>
      <PageHeader
        title={
          <span className="flex items-center gap-2">
            {project.name}
            {project.archivedAt ? <Tag tone="muted">archived</Tag> : null}
          </span>
        }
      >
        <span className="mr-4">Client: {project.clientName || "—"}</span>
        <span className="mono">Job {project.jobNumber || "—"}</span>
      </PageHeader>
      {project.description ? <p className="mb-5 max-w-3xl text-ink-2">{project.description}</p> : null}
      {register ? (
        <CalculationRegister
          slug={slug}
          projectId={projectId}
          initialQuery={register.query}
          initial={JSON.parse(JSON.stringify(register.page))}
          canCreate={can(ctx.role, "calc.create") && !project.archivedAt}
        />
      ) : null}
      {can(ctx.role, "report.view") ? <ProjectReports ctx={ctx} projectId={projectId} /> : null}
      <ProjectSettings
        slug={slug}
        project={JSON.parse(JSON.stringify(project))}
        canEdit={can(ctx.role, "project.update")}
        canShare={can(ctx.role, "project.share")}
      />
    </>
  );
}
