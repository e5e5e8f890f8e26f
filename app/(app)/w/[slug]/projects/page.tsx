import type { Metadata } from "next";
import { requirePageContext } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { listProjects } from "@/lib/projects";
import { PageHeader } from "@/app/_components/ui";
import { ProjectsView } from "./projects-view";

export const metadata: Metadata = { title: "Projects" };

export default async function ProjectsPage({ params }: { params: Promise<{ slug: string }> }) {
  const { slug } = await params;
  const ctx = await requirePageContext(slug, "project.view");
  const projects = await listProjects(ctx);
  return (
    <>
      <PageHeader title="Projects" eyebrow={ctx.workspace.name}>
        {ctx.role === "client" ? "The projects this firm has shared with you." : "One project per client job. Calculations, checks and issued reports live inside."}
      </PageHeader>
      <ProjectsView slug={slug} initial={JSON.parse(JSON.stringify(projects))} canCreate={can(ctx.role, "project.create")} />
    </>
  );
}
