/**
 * The issued reports of a project, for everyone who may see reports (report.view): staff, and
 * clients of projects shared with them. Only issued revisions exist here (no drafts, no
 * calculations, no attachments); superseded revisions stay listed and downloadable, marked as
 * such. Each row links to the signed PDF, exactly as stored, and to its public verification.
 */
import type { WorkspaceContext } from "@/lib/auth/guard";
import { clientProjectScoped } from "@/lib/auth/permissions";
import { listProjectReports } from "@/lib/reports/queries";
import { EmptyState, Panel, Tag } from "@/app/_components/ui";

const day = (ms: number) => new Date(ms).toISOString().slice(0, 10);

function size(bytes: number): string {
  return bytes >= 1024 * 1024 ? `${(bytes / 1024 / 1024).toFixed(1)} MB` : `${Math.max(1, Math.round(bytes / 1024))} kB`;
}

/** Server component: the report list of one project the member may see. */
export async function ProjectReports({ ctx, projectId }: { ctx: WorkspaceContext; projectId: string }) {
  const reports = await listProjectReports(ctx, projectId);
  const client = clientProjectScoped(ctx.role);
  return (
    <Panel title="Issued reports" className="mb-6">
      {client ? (
        <p className="mb-3 max-w-3xl text-[13.5px] text-ink-2">
          Each report is a signed PDF. Keep the file as you downloaded it: anyone can check on the verify page that it is exactly the report {ctx.workspace.name} issued.
        </p>
      ) : null}
      {reports.length === 0 ? (
        <EmptyState title="No report has been issued in this project yet.">{client ? "You will get an e-mail when one is." : "An approved calculation is issued from its sheet."}</EmptyState>
      ) : (
        <div className="overflow-x-auto">
          <table className="table-dense" aria-label="Issued reports">
            <thead>
              <tr>
                <th>Calculation</th>
                <th>Title</th>
                <th>Rev.</th>
                <th>Issued</th>
                <th>Prepared</th>
                <th>Checked</th>
                <th>Approved</th>
                <th>Verification code</th>
                <th>State</th>
                <th className="num">File</th>
              </tr>
            </thead>
            <tbody>
              {reports.map((r) => (
                <tr key={r.id} data-testid="report-row">
                  <td className="mono whitespace-nowrap">{r.number}</td>
                  <td>{r.title}</td>
                  <td className="mono font-semibold">{r.revision}</td>
                  <td className="mono whitespace-nowrap">{day(r.issuedAt)}</td>
                  <td>{r.preparedByName}</td>
                  <td>{r.checkedByName}</td>
                  <td>{r.approvedByName}</td>
                  <td className="mono whitespace-nowrap">
                    <a className="hover:text-copper hover:underline" href={`/verify?code=${encodeURIComponent(r.code)}`}>
                      {r.code}
                    </a>
                  </td>
                  <td>{r.supersededAt ? <Tag tone="muted">superseded{r.supersededByRevision ? ` by rev ${r.supersededByRevision}` : ""}</Tag> : <Tag>current</Tag>}</td>
                  <td className="num whitespace-nowrap">
                    <a className="font-medium text-copper hover:underline" href={r.downloadPath} download={r.filename} aria-label={`Download ${r.filename}`}>
                      PDF
                    </a>{" "}
                    <span className="text-ink-3">{size(r.size)}</span>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </Panel>
  );
}
