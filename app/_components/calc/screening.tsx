"use client";
/**
 * Part screening: the current inputs run with every part of the library, ranked by the server
 * (passes first, by worst margin); the rest name the check that fails. "Use this part" puts the
 * part's parameters into the form.
 */
import { useQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import type { RawInputs } from "@/lib/calc/core/types";
import { formatQuantity } from "@/lib/calc/core/units";
import { Button, Notice, Tag } from "../ui";
import { Dialog } from "./dialog";
import { SeverityBadge } from "./severity";

interface ScreeningRow {
  partId: string;
  name: string;
  verdict: "pass" | "warning" | "fail" | "invalid";
  worstMargin: number | null;
  limitingCheck: string | null;
  failing: string[];
  warnings: string[];
  problem?: string;
}

export function ScreeningDialog({
  open,
  onClose,
  slug,
  typeId,
  inputs,
  currentPartId,
  canUse,
  onUse,
}: {
  open: boolean;
  onClose: () => void;
  slug: string;
  typeId: string;
  /** The inputs at the moment the dialog opened (JSON text, so the query key is stable). */
  inputs: string;
  currentPartId?: string;
  canUse: boolean;
  onUse: (partId: string) => void;
}) {
  const q = useQuery({
    queryKey: ["screen", slug, typeId, inputs],
    queryFn: ({ signal }) => api<{ partKind: string; field: string; rows: ScreeningRow[] }>(`/api/w/${slug}/screen`, { body: { typeId, inputs: JSON.parse(inputs) as RawInputs }, signal }),
    enabled: open,
    staleTime: 30_000,
    retry: false,
  });
  const rows = q.data?.rows ?? [];
  return (
    <Dialog open={open} onClose={onClose} title="Screen library parts" wide>
      <p className="mb-3 text-[13px] text-ink-2">
        The current inputs, run with every {q.data?.partKind === "reference" ? "reference" : "op-amp"} in the parts library. Parts that pass every check come first, by their smallest margin; for the rest the failing check is named.
      </p>
      {q.isLoading ? <p className="text-ink-3">Running the calculation for each part…</p> : null}
      {q.error ? <Notice tone="error">{(q.error as Error).message}</Notice> : null}
      {q.data && rows.length === 0 ? <p className="text-ink-3">The library has no parts of this kind yet. Add some on the Parts library page.</p> : null}
      {rows.length ? (
        <div className="max-h-[60vh] overflow-auto">
          <table className="table-dense" aria-label="Screening results">
            <thead>
              <tr>
                <th className="num">#</th>
                <th>Part</th>
                <th>Verdict</th>
                <th className="num">Worst margin</th>
                <th>Limiting or failing check</th>
                <th />
              </tr>
            </thead>
            <tbody>
              {rows.map((r, i) => (
                <tr key={r.partId} data-part={r.name}>
                  <td className="num mono text-ink-3">{i + 1}</td>
                  <td className="font-medium">
                    {r.name}
                    {r.partId === currentPartId ? (
                      <span className="ml-2">
                        <Tag tone="muted">in use</Tag>
                      </span>
                    ) : null}
                  </td>
                  <td>{r.verdict === "invalid" ? <Tag tone="muted">not evaluated</Tag> : <SeverityBadge severity={r.verdict} />}</td>
                  <td className="num mono">{r.worstMargin === null ? "—" : `${r.worstMargin >= 0 ? "+" : "−"}${formatQuantity(Math.abs(r.worstMargin) * 100, "%", { digits: 3 })}`}</td>
                  <td className="text-[13px] text-ink-2">
                    {r.verdict === "invalid"
                      ? r.problem
                      : r.failing.length
                        ? `${r.failing[0]}${r.failing.length > 1 ? ` (and ${r.failing.length - 1} more)` : ""}`
                        : r.warnings.length
                          ? `${r.warnings[0]} (warning)`
                          : (r.limitingCheck ?? "—")}
                  </td>
                  <td className="text-right">
                    <Button size="sm" disabled={!canUse || r.partId === currentPartId} onClick={() => onUse(r.partId)}>
                      Use this part
                    </Button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
    </Dialog>
  );
}
