import type { Metadata } from "next";
import Link from "next/link";
import { requirePageContext } from "@/lib/auth/page";
import { PageHeader } from "@/app/_components/ui";
import { CSV_MAX_BYTES, CSV_MAX_ROWS } from "@/lib/parts/csv";
import { ImportView } from "./import-view";

export const metadata: Metadata = { title: "Import parts" };

export default async function ImportPartsPage({ params }: { params: Promise<{ slug: string }> }) {
  const { slug } = await params;
  const ctx = await requirePageContext(slug, "parts.manage", `/w/${slug}/parts/import`);
  return (
    <>
      <div className="mb-2 text-[13px] text-ink-3">
        <Link href={`/w/${slug}/parts`} className="hover:text-ink">
          Parts library
        </Link>{" "}
        / Import
      </div>
      <PageHeader title="Import parts from CSV" eyebrow={ctx.workspace.name}>
        Check a file first: every row is validated and nothing is added until you confirm the rows shown as ready.
      </PageHeader>
      <ImportView slug={slug} maxBytes={CSV_MAX_BYTES} maxRows={CSV_MAX_ROWS} />
    </>
  );
}
