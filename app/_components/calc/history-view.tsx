"use client";
/**
 * The revision history of a calculation: one row per revision (who prepared, checked, approved
 * and issued it, and when), every saved change below it, and a side-by-side of any two saved
 * states — the inputs as typed and the results as computed, changed rows marked.
 */
import { Fragment, useState } from "react";
import { useQuery } from "@tanstack/react-query";
import type { DiffRow, HistoryEntry, RevisionSummary } from "@/lib/calculations/history";
import { api } from "@/lib/api-client";
import { Notice, cx } from "../ui";
import { EVENT_LABEL, dateTime } from "./format";

interface Compare {
  a: { id: string; revision: string; version: number; at: number; event: string };
  b: { id: string; revision: string; version: number; at: number; event: string };
  inputs: DiffRow[];
  results: DiffRow[];
}

const STATUS_WORD: Record<string, string> = { draft: "Draft", in_check: "In check", approved: "Approved", issued: "Issued" };

/** Who checked a revision: the last reviewer who returned or approved it. */
function checkedBy(entries: HistoryEntry[], revision: string): { name: string; at: number } | undefined {
  const e = [...entries].reverse().find((x) => x.revision === revision && (x.event === "approve" || x.event === "return"));
  return e ? { name: e.actor, at: e.at } : undefined;
}

function Who({ p }: { p?: { name: string; at: number } }) {
  if (!p) return <span className="text-ink-3">—</span>;
  return (
    <span className="whitespace-nowrap">
      {p.name} <span className="mono text-[12px] text-ink-3">{dateTime(p.at)}</span>
    </span>
  );
}

export function HistoryView({ slug, calcId, entries, revisions }: { slug: string; calcId: string; entries: HistoryEntry[]; revisions: RevisionSummary[] }) {
  const newest = [...entries].reverse();
  const [a, setA] = useState(newest[1]?.id ?? newest[0]?.id ?? "");
  const [b, setB] = useState(newest[0]?.id ?? "");
  const [showAll, setShowAll] = useState(false);
  const cmp = useQuery({
    queryKey: ["compare", slug, calcId, a, b],
    queryFn: ({ signal }) => api<Compare>(`/api/w/${slug}/calculations/${calcId}/compare?a=${encodeURIComponent(a)}&b=${encodeURIComponent(b)}`, { signal }),
    enabled: !!a && !!b,
  });
  const label = (id: string) => {
    const e = entries.find((x) => x.id === id);
    return e ? `Rev ${e.revision} · v${e.version}` : "";
  };

  return (
    <div className="space-y-8">
      <section aria-labelledby="rev-title">
        <h2 id="rev-title" className="mb-2 text-[15px]">
          Revisions
        </h2>
        <div className="overflow-x-auto rounded-lg border border-rule bg-sheet">
          <table className="table-dense" aria-label="Revisions">
            <thead>
              <tr>
                <th>Rev.</th>
                <th>Status</th>
                <th>Prepared</th>
                <th>Submitted</th>
                <th>Checked</th>
                <th>Approved</th>
                <th>Issued</th>
                <th className="num">Saves</th>
                <th className="num">Last change</th>
              </tr>
            </thead>
            <tbody>
              {[...revisions].reverse().map((r) => (
                <tr key={r.revision}>
                  <td className="mono font-semibold">{r.revision}</td>
                  <td>{STATUS_WORD[r.status] ?? r.status}</td>
                  <td>
                    <Who p={r.preparedBy} />
                  </td>
                  <td>
                    <Who p={r.submittedBy} />
                  </td>
                  <td>
                    <Who p={checkedBy(entries, r.revision)} />
                  </td>
                  <td>
                    <Who p={r.approvedBy} />
                  </td>
                  <td>
                    <Who p={r.issuedBy} />
                  </td>
                  <td className="num mono">{r.saves}</td>
                  <td className="num mono text-ink-2">{dateTime(r.lastChangeAt)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </section>

      <section aria-labelledby="changes-title">
        <div className="mb-2 flex flex-wrap items-baseline justify-between gap-2">
          <h2 id="changes-title" className="text-[15px]">
            Every saved change
          </h2>
          <p className="text-[12.5px] text-ink-3">Pick two saved states (A and B) to compare them below.</p>
        </div>
        <div className="max-h-[420px] overflow-auto rounded-lg border border-rule bg-sheet">
          <table className="table-dense" aria-label="Saved changes">
            <thead className="sticky top-0 bg-sheet">
              <tr>
                <th>A</th>
                <th>B</th>
                <th>Rev.</th>
                <th className="num">Version</th>
                <th>Change</th>
                <th>Status after</th>
                <th>By</th>
                <th className="num">When</th>
              </tr>
            </thead>
            <tbody>
              {newest.map((e) => (
                <tr key={e.id} className={cx((e.id === a || e.id === b) && "bg-copper-wash/50")}>
                  <td>
                    <input type="radio" name="cmp-a" aria-label={`Compare from Rev ${e.revision} v${e.version}`} className="accent-copper" checked={a === e.id} onChange={() => setA(e.id)} />
                  </td>
                  <td>
                    <input type="radio" name="cmp-b" aria-label={`Compare to Rev ${e.revision} v${e.version}`} className="accent-copper" checked={b === e.id} onChange={() => setB(e.id)} />
                  </td>
                  <td className="mono">{e.revision}</td>
                  <td className="num mono">v{e.version}</td>
                  <td>{EVENT_LABEL[e.event] ?? e.event}</td>
                  <td className="text-ink-2">{STATUS_WORD[e.status] ?? e.status}</td>
                  <td className="text-ink-2">{e.actor}</td>
                  <td className="num mono text-ink-2">{dateTime(e.at)}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </section>

      <section aria-labelledby="cmp-title">
        <div className="mb-2 flex flex-wrap items-baseline justify-between gap-2">
          <h2 id="cmp-title" className="text-[15px]">
            {label(a)} compared with {label(b)}
          </h2>
          <label className="flex items-center gap-1.5 text-[13px] text-ink-2">
            <input type="checkbox" className="accent-copper" checked={showAll} onChange={(e) => setShowAll(e.target.checked)} />
            Show unchanged rows
          </label>
        </div>
        {cmp.error ? <Notice tone="error">{(cmp.error as Error).message}</Notice> : null}
        {cmp.isLoading ? <p className="text-ink-3">Comparing…</p> : null}
        {cmp.data ? (
          <div className="grid gap-6 xl:grid-cols-2">
            <DiffTable title="Inputs (as typed)" rows={cmp.data.inputs} showAll={showAll} a={label(a)} b={label(b)} />
            <DiffTable title="Results and checks" rows={cmp.data.results} showAll={showAll} a={label(a)} b={label(b)} />
          </div>
        ) : null}
      </section>
    </div>
  );
}

function DiffTable({ title, rows, showAll, a, b }: { title: string; rows: DiffRow[]; showAll: boolean; a: string; b: string }) {
  const changed = rows.filter((r) => r.changed).length;
  const shown = showAll ? rows : rows.filter((r) => r.changed);
  return (
    <div>
      <h3 className="mb-1 text-[13.5px] font-semibold">
        {title} <span className="font-normal text-ink-3">— {changed === 0 ? "no changes" : `${changed} changed`}</span>
      </h3>
      <div className="overflow-x-auto rounded-lg border border-rule bg-sheet">
        <table className="table-dense" aria-label={title}>
          <thead>
            <tr>
              <th>Item</th>
              <th className="num">A: {a}</th>
              <th className="num">B: {b}</th>
            </tr>
          </thead>
          <tbody>
            {shown.map((r) => (
              <Fragment key={r.key}>
                <tr className={cx(r.changed && "bg-copper-wash/60")} data-changed={r.changed ? "yes" : "no"}>
                  <td>
                    {r.changed ? (
                      <span className="mr-1.5 mono text-[11px] font-semibold text-copper-strong" aria-label="changed">
                        ≠
                      </span>
                    ) : null}
                    {r.label}
                  </td>
                  <td className={cx("num mono", r.changed && "text-ink-2")}>{r.a}</td>
                  <td className={cx("num mono", r.changed && "font-semibold")}>{r.b}</td>
                </tr>
              </Fragment>
            ))}
            {shown.length === 0 ? (
              <tr>
                <td colSpan={3} className="text-ink-3">
                  Nothing changed here. Tick “Show unchanged rows” to see every row.
                </td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </div>
    </div>
  );
}
