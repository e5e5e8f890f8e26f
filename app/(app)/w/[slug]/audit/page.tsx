import type { Metadata } from "next";
import { requirePageContext } from "@/lib/auth/page";
import { auditPage } from "@/lib/audit";
import { EmptyState, PageHeader } from "@/app/_components/ui";

export const metadata: Metadata = { title: "Audit log" };

function describe(data: Record<string, unknown>): string {
  return Object.entries(data)
    .filter(([, v]) => v !== null && v !== undefined && v !== "")
    .map(([k, v]) => `${k}: ${typeof v === "object" ? JSON.stringify(v) : String(v)}`)
    .join(" · ");
}

export default async function AuditPage({ params }: { params: Promise<{ slug: string }> }) {
  const { slug } = await params;
  const ctx = await requirePageContext(slug, "audit.view");
  const events = await auditPage(ctx.workspace.id, { limit: 300 });
  return (
    <>
      <PageHeader title="Audit log" eyebrow={ctx.workspace.name}>
        Every change of state in this workspace: who, what and when (newest first, last 300).
      </PageHeader>
      {events.length === 0 ? (
        <EmptyState title="Nothing recorded yet" />
      ) : (
        <div className="overflow-x-auto rounded-lg border border-rule bg-sheet">
          <table className="table-dense" aria-label="Audit log">
            <thead>
              <tr>
                <th>When (UTC)</th>
                <th>Who</th>
                <th>What</th>
                <th>Details</th>
              </tr>
            </thead>
            <tbody>
              {events.map((e) => (
                <tr key={e.id}>
                  <td className="mono whitespace-nowrap text-ink-2">{new Date(e.at).toISOString().replace("T", " ").slice(0, 19)}</td>
                  <td>{e.actor ?? "—"}</td>
                  <td className="mono">{e.action}</td>
                  <td className="max-w-[560px] truncate text-ink-2" title={describe(e.data)}>
                    {describe(e.data)}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </>
  );
}
