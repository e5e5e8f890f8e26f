import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { requirePageContext } from "@/lib/auth/page";
import { getCalculation } from "@/lib/calculations";
import { listHistory, summariseRevisions } from "@/lib/calculations/history";
import { getProject } from "@/lib/projects";
import { AppError } from "@/lib/errors";
import { PageHeader } from "@/app/_components/ui";
import { HistoryView } from "@/app/_components/calc/history-view";

export const metadata: Metadata = { title: "Revision history" };

const orNotFound = (e: unknown): never => {
  if (e instanceof AppError && e.code === "not_found") notFound();
  throw e;
};

export default async function HistoryPage({ params }: { params: Promise<{ slug: string; projectId: string; calcId: string }> }) {
  const { slug, projectId, calcId } = await params;
  const ctx = await requirePageContext(slug, "calc.view", `/w/${slug}/projects/${projectId}/calculations/${calcId}/history`);
  const [calc, project, entries] = await Promise.all([getCalculation(ctx, calcId).catch(orNotFound), getProject(ctx, projectId).catch(orNotFound), listHistory(ctx, calcId).catch(orNotFound)]);
  if (calc.projectId !== project.id) notFound();
  const sheet = `/w/${slug}/projects/${projectId}/calculations/${calcId}`;
  return (
    <>
      <nav className="mb-2 text-[13px] text-ink-3" aria-label="Breadcrumb">
        <Link href={`/w/${slug}/projects`} className="hover:text-ink">
          Projects
        </Link>{" "}
        /{" "}
        <Link href={`/w/${slug}/projects/${projectId}`} className="hover:text-ink">
          {project.name}
        </Link>{" "}
        /{" "}
        <Link href={sheet} className="mono hover:text-ink">
          {calc.number}
        </Link>{" "}
        / Revision history
      </nav>
      <PageHeader
        title={`Revision history: ${calc.number} ${calc.title}`}
        actions={
          <Link href={sheet} className="text-[13px] font-medium text-copper hover:underline">
            Back to the sheet
          </Link>
        }
      >
        {calc.typeTitle}
      </PageHeader>
      <HistoryView slug={slug} calcId={calcId} entries={JSON.parse(JSON.stringify(entries))} revisions={JSON.parse(JSON.stringify(summariseRevisions(entries)))} />
    </>
  );
}
