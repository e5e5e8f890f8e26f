import type { Metadata } from "next";
import Link from "next/link";
import { requirePageContext } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { getProject } from "@/lib/projects";
import { AppError } from "@/lib/errors";
import { notFound } from "next/navigation";
import { PageHeader, Tag } from "@/app/_components/ui";
import { ProjectSettings } from "./project-settings";

export const metadata: Metadata = { title: "Project" };

export default async function ProjectPage({ params }: { params: Promise<{ slug: string; projectId: string }> }) {
  const { slug, projectId } = await params;
  const ctx = await requirePageContext(slug, "project.view");
  const project = await getProject(ctx, projectId).catch((e) => {
    if (e instanceof AppError && e.code === "not_found") notFound();
    throw e;
  });
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
      <ProjectSettings
        slug={slug}
        project={JSON.parse(JSON.stringify(project))}
        canEdit={can(ctx.role, "project.update")}
        canShare={can(ctx.role, "project.share")}
      />
    </>
  );
}
