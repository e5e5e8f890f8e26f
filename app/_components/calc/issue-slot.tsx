"use client";
/**
 * The reports part of the workflow bar: "Issue report" for an approved calculation (a checker or
 * the owner confirms; the server signs the PDF and marks the revision issued in one step), the
 * download of the issued revision, and a list of every issued revision (superseded ones marked)
 * with the engineer's exports (component list CSV, SPICE netlist, inputs and results JSON).
 */
import { useState } from "react";
import { useQuery, useQueryClient } from "@tanstack/react-query";
import { api, ApiError } from "@/lib/api-client";
import { Button, Notice, Tag, buttonClass } from "../ui";
import { Dialog } from "./dialog";
import type { SheetCalculation } from "./types";

export interface IssueSlotProps {
  slug: string;
  calculation: SheetCalculation;
  /** The member may issue (calc.issue: owner or checker) and the workspace is writable. */
  canIssue: boolean;
  /** Why issuing is not offered, when it is not (shown as the button's title). */
  reason?: string;
  /** Report the calculation after an issue so the sheet updates its status and version. */
  onChanged: (c: SheetCalculation) => void;
}

/** An issued report as the report routes list it. */
interface ReportItem {
  id: string;
  revision: string;
  code: string;
  issuedAt: number;
  issuedByName: string;
  preparedByName: string;
  checkedByName: string;
  approvedByName: string;
  supersededAt: number | null;
  supersededByRevision: string | null;
  filename: string;
  downloadPath: string;
  size: number;
}

const day = (ms: number) => new Date(ms).toISOString().slice(0, 10);

export function IssueSlot({ slug, calculation: calc, canIssue, reason, onChanged }: IssueSlotProps) {
  const qc = useQueryClient();
  const [confirm, setConfirm] = useState(false);
  const [list, setList] = useState(false);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const key = ["reports", slug, calc.id];
  const reports = useQuery({
    queryKey: key,
    queryFn: () => api<{ reports: ReportItem[] }>(`/api/w/${slug}/reports?calculationId=${encodeURIComponent(calc.id)}`).then((r) => r.reports),
  });
  const all = reports.data ?? [];
  const current = calc.status === "issued" ? all.find((r) => r.revision === calc.revision) : undefined;

  async function issue() {
    setBusy(true);
    setError(null);
    try {
      const r = await api<{ report: ReportItem; calculation: SheetCalculation }>(`/api/w/${slug}/calculations/${calc.id}/issue`, { method: "POST", body: { version: calc.version } });
      setConfirm(false);
      await qc.invalidateQueries({ queryKey: key });
      onChanged(r.calculation);
    } catch (e) {
      setError(e instanceof ApiError ? e.message : "The report could not be issued. Nothing was changed; try again.");
    } finally {
      setBusy(false);
    }
  }

  const exportBase = `/api/w/${slug}/calculations/${calc.id}/export`;
  return (
    <>
      {calc.status === "approved" ? (
        <Button
          variant="primary"
          size="sm"
          disabled={!canIssue || busy}
          title={canIssue ? undefined : (reason ?? "Only a checker or the owner issues reports, and only while the workspace accepts changes.")}
          onClick={() => {
            setError(null);
            setConfirm(true);
          }}
        >
          Issue report
        </Button>
      ) : null}
      {current ? (
        <a className={buttonClass("secondary", "sm")} href={current.downloadPath} download={current.filename} data-testid="download-report">
          Download PDF (rev {current.revision})
        </a>
      ) : null}
      <Button size="sm" variant="quiet" onClick={() => setList(true)}>
        Reports and exports{all.length ? ` (${all.length})` : ""}
      </Button>

      <Dialog open={confirm} onClose={() => setConfirm(false)} title={`Issue revision ${calc.revision}`}>
        <div className="space-y-3 text-[13.5px]">
          <p>
            The report of <strong>{calc.number}</strong> “{calc.title}”, revision <span className="mono">{calc.revision}</span>, is rendered from the approved results, signed with the
            workspace certificate and stored. After that, revision {calc.revision} cannot change; a change needs a new revision.
          </p>
          <p className="text-ink-2">The clients this project is shared with get an e-mail with a link to it.</p>
          {error ? <Notice tone="error">{error}</Notice> : null}
          <div className="flex justify-end gap-2">
            <Button size="sm" onClick={() => setConfirm(false)} disabled={busy}>
              Cancel
            </Button>
            <Button size="sm" variant="primary" onClick={() => void issue()} disabled={busy}>
              {busy ? "Signing and issuing…" : "Sign and issue"}
            </Button>
          </div>
        </div>
      </Dialog>

      <Dialog open={list} onClose={() => setList(false)} title={`Reports and exports of ${calc.number}`} wide>
        <div className="space-y-4 text-[13.5px]">
          {reports.isLoading ? <p className="text-ink-3">Loading…</p> : null}
          {reports.error ? <Notice tone="error">{reports.error instanceof Error ? reports.error.message : "The reports could not be loaded."}</Notice> : null}
          {!reports.isLoading && all.length === 0 ? <p className="text-ink-2">No revision of this calculation has been issued yet.</p> : null}
          {all.length ? (
            <table className="table-dense" aria-label="Issued reports">
              <thead>
                <tr>
                  <th>Rev.</th>
                  <th>Issued</th>
                  <th>Prepared / checked / approved</th>
                  <th>Code</th>
                  <th>State</th>
                  <th />
                </tr>
              </thead>
              <tbody>
                {all.map((r) => (
                  <tr key={r.id}>
                    <td className="mono font-semibold">{r.revision}</td>
                    <td className="mono">{day(r.issuedAt)}</td>
                    <td>
                      {r.preparedByName} / {r.checkedByName} / {r.approvedByName}
                    </td>
                    <td className="mono">{r.code}</td>
                    <td>{r.supersededAt ? <Tag tone="muted">superseded{r.supersededByRevision ? ` by ${r.supersededByRevision}` : ""}</Tag> : <Tag>current</Tag>}</td>
                    <td className="text-right">
                      <a className="font-medium text-copper hover:underline" href={r.downloadPath} download={r.filename}>
                        PDF
                      </a>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          ) : null}
          <div>
            <h3 className="mb-1 text-[13px] font-medium text-ink-2">Exports of the current state</h3>
            <div className="flex flex-wrap gap-2">
              <a className={buttonClass("secondary", "sm")} href={`${exportBase}/components`}>
                Component list (CSV)
              </a>
              <a className={buttonClass("secondary", "sm")} href={`${exportBase}/netlist?model=ideal`}>
                SPICE netlist, ideal op-amp
              </a>
              <a className={buttonClass("secondary", "sm")} href={`${exportBase}/netlist?model=single-pole`}>
                SPICE netlist, single-pole op-amp
              </a>
              <a className={buttonClass("secondary", "sm")} href={`${exportBase}/json`}>
                Inputs and results (JSON)
              </a>
            </div>
          </div>
        </div>
      </Dialog>
    </>
  );
}
