import type { Metadata } from "next";
import { requirePageContext } from "@/lib/auth/page";
import { can } from "@/lib/auth/permissions";
import { accessState } from "@/lib/billing/access";
import { listParts } from "@/lib/parts";
import { LinkButton, PageHeader } from "@/app/_components/ui";
import { PartsView } from "./parts-view";

export const metadata: Metadata = { title: "Parts library" };

export default async function PartsPage({ params }: { params: Promise<{ slug: string }> }) {
  const { slug } = await params;
  const ctx = await requirePageContext(slug, "parts.view");
  const parts = await listParts(ctx);
  const readOnly = accessState(ctx.workspace).mode === "read_only";
  const canManage = can(ctx.role, "parts.manage") && !readOnly;
  return (
    <>
      <PageHeader
        title="Parts library"
        eyebrow={ctx.workspace.name}
        actions={canManage ? <LinkButton href={`/w/${slug}/parts/import`}>Import CSV</LinkButton> : null}
      >
        The op-amps and references your calculations draw on, with their parameters in SI units. A calculation keeps its own copy of the part it used.
      </PageHeader>
      <PartsView slug={slug} initial={parts} canManage={canManage} />
    </>
  );
}
