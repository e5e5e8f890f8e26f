"use client";
/**
 * The calculation register of a project: one row per calculation, sorted, filtered, searched and
 * paged by the server (GET …/calculations ?status ?pack ?q ?sort ?dir ?page ?pageSize), so it
 * stays fast with thousands of rows. The table is @tanstack/react-table in manual mode; the
 * query lives in the address bar so a reload or the back button brings the same view.
 */
import Link from "next/link";
import { useEffect, useMemo, useState } from "react";
import { keepPreviousData, useQuery } from "@tanstack/react-query";
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable, type SortingState } from "@tanstack/react-table";
import { PACKS, type PackId } from "@/lib/calc/core/types";
import type { CalcStatus } from "@/db/schema";
import type { ListQuery, RegisterRow } from "@/lib/calculations";
import { api } from "@/lib/api-client";
import { EmptyState, LinkButton, Notice, Select, TextInput, Tag, cx } from "../ui";
import { CheckCounts } from "./severity";
import { STATUS_LABEL, count, dateTime } from "./format";

export type RegisterQuery = ListQuery;
type SortKey = ListQuery["sort"];

interface RegisterPage {
  rows: RegisterRow[];
  total: number;
  page: number;
  pageSize: number;
}

const PACK_SHORT: Record<string, string> = { amplifier: "Amplifier", filter: "Active filter", reference: "Reference" };

const col = createColumnHelper<RegisterRow>();

function toSearch(q: RegisterQuery): string {
  const p = new URLSearchParams();
  if (q.status) p.set("status", q.status);
  if (q.pack) p.set("pack", q.pack);
  if (q.q) p.set("q", q.q);
  if (q.sort !== "updatedAt") p.set("sort", q.sort);
  if (q.dir !== "desc") p.set("dir", q.dir);
  if (q.page !== 1) p.set("page", String(q.page));
  if (q.pageSize !== 50) p.set("pageSize", String(q.pageSize));
  return p.toString();
}

function apiSearch(q: RegisterQuery): string {
  const p = new URLSearchParams({ sort: q.sort, dir: q.dir, page: String(q.page), pageSize: String(q.pageSize) });
  if (q.status) p.set("status", q.status);
  if (q.pack) p.set("pack", q.pack);
  if (q.q) p.set("q", q.q);
  return p.toString();
}

export function CalculationRegister({ slug, projectId, initialQuery, initial, canCreate }: { slug: string; projectId: string; initialQuery: RegisterQuery; initial: RegisterPage; canCreate: boolean }) {
  const [query, setQuery] = useState<RegisterQuery>(initialQuery);
  const [search, setSearch] = useState(initialQuery.q ?? "");
  const base = `/w/${slug}/projects/${projectId}`;

  // Debounced text search: the query changes 300 ms after the last keystroke.
  useEffect(() => {
    const t = setTimeout(() => setQuery((q) => ((q.q ?? "") === search.trim() ? q : { ...q, q: search.trim() || undefined, page: 1 })), 300);
    return () => clearTimeout(t);
  }, [search]);

  // The address bar follows the query (without a navigation).
  useEffect(() => {
    const s = toSearch(query);
    const url = `${window.location.pathname}${s ? `?${s}` : ""}`;
    if (url !== `${window.location.pathname}${window.location.search}`) window.history.replaceState(window.history.state, "", url);
  }, [query]);

  const initialKey = apiSearch(initialQuery);
  const key = apiSearch(query);
  const { data, error, isFetching } = useQuery({
    queryKey: ["register", slug, projectId, key],
    queryFn: ({ signal }) => api<RegisterPage>(`/api/w/${slug}/projects/${projectId}/calculations?${key}`, { signal }),
    placeholderData: keepPreviousData,
    initialData: key === initialKey ? initial : undefined,
    staleTime: 5_000,
  });
  const page = data ?? { rows: [], total: 0, page: query.page, pageSize: query.pageSize };
  const pages = Math.max(1, Math.ceil(page.total / query.pageSize));

  const columns = useMemo(
    () => [
      col.accessor("number", {
        header: "No.",
        cell: (c) => <span className="mono whitespace-nowrap">{c.getValue()}</span>,
      }),
      col.accessor("title", {
        header: "Title",
        cell: (c) => (
          <Link href={`${base}/calculations/${c.row.original.id}`} className="font-medium text-ink hover:text-copper">
            {c.getValue()}
          </Link>
        ),
      }),
      col.accessor("typeTitle", { id: "type", header: "Type", cell: (c) => <span className="text-ink-2">{c.getValue()}</span> }),
      col.accessor("pack", { header: "Pack", enableSorting: false, cell: (c) => <span className="whitespace-nowrap text-ink-2">{PACK_SHORT[c.getValue()] ?? c.getValue()}</span> }),
      col.accessor("revision", { header: "Rev.", cell: (c) => <span className="mono">{c.getValue()}</span> }),
      col.accessor("status", { header: "Status", cell: (c) => <Tag tone={c.getValue() === "draft" ? "muted" : c.getValue() === "in_check" ? "copper" : "neutral"}>{STATUS_LABEL[c.getValue()]}</Tag> }),
      col.accessor("preparer", { header: "Preparer", cell: (c) => <span className="whitespace-nowrap text-ink-2">{c.getValue()}</span> }),
      col.accessor("checker", { header: "Checker", cell: (c) => <span className="whitespace-nowrap text-ink-2">{c.getValue() ?? "—"}</span> }),
      col.accessor("updatedAt", { header: "Last change", cell: (c) => <span className="mono whitespace-nowrap text-ink-2">{dateTime(c.getValue())}</span>, meta: { num: true } }),
      col.accessor("checkSummary", { id: "checks", header: "Checks", enableSorting: false, cell: (c) => <CheckCounts summary={c.getValue()} className="whitespace-nowrap text-[12.5px]" /> }),
    ],
    [base],
  );

  const sorting: SortingState = [{ id: query.sort, desc: query.dir === "desc" }];
  // TanStack Table's instance is not memoisable by the React Compiler; the compiler skips this
  // component, which is what we want (the table re-renders from the server page anyway).
  // eslint-disable-next-line react-hooks/incompatible-library
  const table = useReactTable({
    data: page.rows,
    columns,
    getCoreRowModel: getCoreRowModel(),
    manualSorting: true,
    manualPagination: true,
    manualFiltering: true,
    enableSortingRemoval: false,
    rowCount: page.total,
    getRowId: (r) => r.id,
    state: { sorting, pagination: { pageIndex: query.page - 1, pageSize: query.pageSize } },
    onSortingChange: (updater) => {
      const next = typeof updater === "function" ? updater(sorting) : updater;
      const s = next[0];
      if (!s) return;
      setQuery((q) => ({ ...q, sort: s.id as SortKey, dir: s.desc ? "desc" : "asc", page: 1 }));
    },
  });

  const from = page.total === 0 ? 0 : (query.page - 1) * query.pageSize + 1;
  const to = Math.min(page.total, query.page * query.pageSize);
  const filtered = !!(query.status || query.pack || query.q);

  return (
    <section aria-labelledby="register-title" className="mb-8">
      <div className="mb-2 flex flex-wrap items-end justify-between gap-3">
        <h2 id="register-title" className="text-[16px]">
          Calculation register
        </h2>
        {canCreate ? (
          <LinkButton href={`${base}/calculations/new`} variant="primary" size="sm">
            New calculation
          </LinkButton>
        ) : null}
      </div>
      <div className="mb-2 flex flex-wrap items-end gap-3">
        <div className="flex flex-col gap-0.5">
          <label htmlFor="reg-q" className="text-[12px] text-ink-2">
            Search
          </label>
          <TextInput id="reg-q" type="search" placeholder="Number, title or type" value={search} onChange={(e) => setSearch(e.target.value)} className="h-8 !w-64" />
        </div>
        <div className="flex flex-col gap-0.5">
          <label htmlFor="reg-status" className="text-[12px] text-ink-2">
            Status
          </label>
          <Select id="reg-status" className="h-8 !w-36" value={query.status ?? ""} onChange={(e) => setQuery((q) => ({ ...q, status: (e.target.value || undefined) as CalcStatus | undefined, page: 1 }))}>
            <option value="">All</option>
            {(Object.keys(STATUS_LABEL) as CalcStatus[]).map((s) => (
              <option key={s} value={s}>
                {STATUS_LABEL[s]}
              </option>
            ))}
          </Select>
        </div>
        <div className="flex flex-col gap-0.5">
          <label htmlFor="reg-pack" className="text-[12px] text-ink-2">
            Pack
          </label>
          <Select id="reg-pack" className="h-8 !w-44" value={query.pack ?? ""} onChange={(e) => setQuery((q) => ({ ...q, pack: (e.target.value || undefined) as PackId | undefined, page: 1 }))}>
            <option value="">All</option>
            {PACKS.map((p) => (
              <option key={p.id} value={p.id}>
                {p.title}
              </option>
            ))}
          </Select>
        </div>
        <p className="ml-auto text-[12.5px] text-ink-3" aria-live="polite">
          {isFetching ? "Loading…" : `${count(page.total)} calculation${page.total === 1 ? "" : "s"}${filtered ? (page.total === 1 ? " matches" : " match") : ""}`}
        </p>
      </div>
      {error ? <Notice tone="error">{(error as Error).message}</Notice> : null}
      {page.total === 0 && !isFetching ? (
        <EmptyState title={filtered ? "No calculation matches" : "No calculations yet"}>{filtered ? "Change the search or the filters." : canCreate ? "Start one with New calculation." : null}</EmptyState>
      ) : (
        <div className={cx("overflow-x-auto rounded-lg border border-rule bg-sheet", isFetching && "opacity-80")}>
          <table className="table-dense" aria-label="Calculation register">
            <thead>
              {table.getHeaderGroups().map((hg) => (
                <tr key={hg.id}>
                  {hg.headers.map((h) => {
                    const canSort = h.column.getCanSort();
                    const dir = h.column.getIsSorted();
                    const num = (h.column.columnDef.meta as { num?: boolean } | undefined)?.num;
                    return (
                      <th key={h.id} className={num ? "num" : undefined} aria-sort={dir === "asc" ? "ascending" : dir === "desc" ? "descending" : canSort ? "none" : undefined}>
                        {canSort ? (
                          <button type="button" onClick={h.column.getToggleSortingHandler()} className={cx("inline-flex items-center gap-1 hover:text-ink", dir && "text-ink")}>
                            {flexRender(h.column.columnDef.header, h.getContext())}
                            <span aria-hidden="true" className="mono text-[10px] text-ink-3">
                              {dir === "asc" ? "▲" : dir === "desc" ? "▼" : "↕"}
                            </span>
                          </button>
                        ) : (
                          flexRender(h.column.columnDef.header, h.getContext())
                        )}
                      </th>
                    );
                  })}
                </tr>
              ))}
            </thead>
            <tbody>
              {table.getRowModel().rows.map((r) => (
                <tr key={r.id}>
                  {r.getVisibleCells().map((c) => (
                    <td key={c.id} className={(c.column.columnDef.meta as { num?: boolean } | undefined)?.num ? "num" : undefined}>
                      {flexRender(c.column.columnDef.cell, c.getContext())}
                    </td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {page.total > 0 ? (
        <nav className="mt-2 flex flex-wrap items-center justify-between gap-3 whitespace-nowrap text-[13px]" aria-label="Register pages">
          <span className="mono text-ink-2">
            {count(from)}–{count(to)} of {count(page.total)}
          </span>
          <div className="flex items-center gap-2">
            <label htmlFor="reg-size" className="text-ink-2">
              Rows
            </label>
            <Select id="reg-size" className="h-8 !w-20" value={String(query.pageSize)} onChange={(e) => setQuery((q) => ({ ...q, pageSize: Number(e.target.value), page: 1 }))}>
              {[25, 50, 100, 200].map((n) => (
                <option key={n} value={n}>
                  {n}
                </option>
              ))}
            </Select>
            <button type="button" className="h-8 rounded-md border border-rule-strong bg-sheet px-2.5 disabled:opacity-40" disabled={query.page <= 1} onClick={() => setQuery((q) => ({ ...q, page: q.page - 1 }))}>
              ← Previous
            </button>
            <span className="mono text-ink-2">
              page {query.page} of {pages}
            </span>
            <button type="button" className="h-8 rounded-md border border-rule-strong bg-sheet px-2.5 disabled:opacity-40" disabled={query.page >= pages} onClick={() => setQuery((q) => ({ ...q, page: q.page + 1 }))}>
              Next →
            </button>
          </div>
        </nav>
      ) : null}
    </section>
  );
}
