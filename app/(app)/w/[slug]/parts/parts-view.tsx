"use client";

import { useMemo, useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { Button, EmptyState, Field, Notice, Panel, Select, TextArea, TextInput, buttonClass, cx } from "@/app/_components/ui";
import { api, ApiError } from "@/lib/api-client";
import type { PartDto } from "@/lib/parts";
import { KIND_LABELS, TOPOLOGIES, displayValue, editText, paramFields, parseParamValue, type ParamField, type PartKind } from "@/lib/parts/fields";

/** A table column: a value to show and a number (or text) to sort by. */
interface Column {
  id: string;
  label: string;
  title?: string;
  numeric: boolean;
  show: (p: PartDto) => string;
  sort: (p: PartDto) => number | string;
}

function field(kind: PartKind, key: string): ParamField {
  return paramFields(kind).find((f) => f.key === key) as ParamField;
}

function q(kind: PartKind, key: string) {
  const f = field(kind, key);
  return (p: PartDto) => displayValue(f, p.values[key]);
}
const num = (key: string) => (p: PartDto) => (typeof p.values[key] === "number" ? (p.values[key] as number) : Number.NEGATIVE_INFINITY);
const one = (kind: PartKind, key: string, label: string, title?: string): Column => ({ id: key, label, title: title ?? field(kind, key).label, numeric: true, show: q(kind, key), sort: num(key) });

const NAME: Column = { id: "name", label: "Name", numeric: false, show: (p) => p.name, sort: (p) => p.name.toLowerCase() };

const COLUMNS: Record<PartKind, Column[]> = {
  opamp: [
    NAME,
    { id: "supply", label: "Supply", title: "Total supply range (V+ − V−)", numeric: true, show: (p) => `${q("opamp", "supplyMin")(p)} – ${q("opamp", "supplyMax")(p)}`, sort: num("supplyMax") },
    one("opamp", "gbw", "GBW"),
    one("opamp", "slewRate", "Slew rate"),
    one("opamp", "aolDb", "A₀"),
    one("opamp", "vos", "Vos"),
    one("opamp", "vosDrift", "ΔVos/ΔT"),
    one("opamp", "ib", "Ib"),
    one("opamp", "en", "en"),
    {
      id: "swing",
      label: "Swing headroom −/+",
      title: "Output swing headroom from the negative / positive rail at the stated load",
      numeric: true,
      show: (p) => `${q("opamp", "swingNeg")(p)} / ${q("opamp", "swingPos")(p)} @ ${q("opamp", "swingLoad")(p)}`,
      sort: num("swingPos"),
    },
    one("opamp", "ioutMax", "Iout"),
  ],
  reference: [
    NAME,
    { id: "topology", label: "Topology", numeric: false, show: (p) => String(p.values.topology ?? "—"), sort: (p) => String(p.values.topology ?? "") },
    one("reference", "vNom", "Vref"),
    one("reference", "accuracy", "Accuracy"),
    one("reference", "tempco", "TC"),
    { id: "current", label: "Current", title: "Operating current range", numeric: true, show: (p) => `${q("reference", "iMin")(p)} – ${q("reference", "iMax")(p)}`, sort: num("iMax") },
    one("reference", "zDyn", "Zd"),
    one("reference", "noisePp", "Noise p-p"),
    one("reference", "longTermDrift", "Drift /1000 h"),
  ],
};

type Sort = { id: string; dir: "asc" | "desc" };

export function PartsView({ slug, initial, canManage }: { slug: string; initial: PartDto[]; canManage: boolean }) {
  const qc = useQueryClient();
  const [kind, setKind] = useState<PartKind>("opamp");
  const [sort, setSort] = useState<Sort>({ id: "name", dir: "asc" });
  const [editing, setEditing] = useState<PartDto | "new" | null>(null);
  const [notice, setNotice] = useState<string | null>(null);
  const { data } = useQuery({
    queryKey: ["parts", slug],
    queryFn: () => api<{ parts: PartDto[] }>(`/api/w/${slug}/parts`).then((r) => r.parts),
    initialData: initial,
  });
  const all = useMemo(() => data ?? [], [data]);
  const counts = { opamp: all.filter((p) => p.kind === "opamp").length, reference: all.filter((p) => p.kind === "reference").length };
  const columns = COLUMNS[kind];
  const rows = useMemo(() => {
    const col = COLUMNS[kind].find((c) => c.id === sort.id) ?? NAME;
    const list = all.filter((p) => p.kind === kind);
    return [...list].sort((a, b) => {
      const x = col.sort(a);
      const y = col.sort(b);
      const c = typeof x === "number" && typeof y === "number" ? x - y : String(x).localeCompare(String(y));
      return sort.dir === "asc" ? c : -c;
    });
  }, [all, kind, sort]);

  const del = useMutation({
    mutationFn: (p: PartDto) => api<{ deleted: string }>(`/api/w/${slug}/parts/${p.id}`, { method: "DELETE" }),
    onSuccess: (_r, p) => {
      setNotice(`Removed "${p.name}" from the library. Calculations that used it keep their own copy.`);
      if (editing !== "new" && editing?.id === p.id) setEditing(null);
      qc.invalidateQueries({ queryKey: ["parts", slug] });
    },
  });
  const delErr = del.error instanceof ApiError ? del.error : undefined;

  const toggleSort = (id: string) => setSort((s) => (s.id === id ? { id, dir: s.dir === "asc" ? "desc" : "asc" } : { id, dir: "asc" }));

  return (
    <div className={cx("grid gap-6", canManage && editing ? "xl:grid-cols-[1fr_400px]" : undefined)}>
      <div className="min-w-0">
        <div className="mb-3 flex flex-wrap items-center justify-between gap-3">
          <div role="group" aria-label="Kind of part" className="inline-flex rounded-md border border-rule-strong bg-sheet p-0.5">
            {(["opamp", "reference"] as const).map((k) => (
              <button
                key={k}
                type="button"
                aria-pressed={kind === k}
                onClick={() => {
                  setKind(k);
                  setSort({ id: "name", dir: "asc" });
                  if (editing === "new") setEditing(null);
                }}
                className={cx("rounded px-3 py-1 text-[13px]", kind === k ? "bg-ink text-sheet" : "text-ink-2 hover:text-ink")}
              >
                {k === "opamp" ? "Op-amps" : "References"} <span className="mono opacity-70">{counts[k]}</span>
              </button>
            ))}
          </div>
          <div className="flex items-center gap-2">
            <a href={`/api/w/${slug}/parts/export?kind=${kind}`} className={buttonClass("quiet", "sm")} download>
              Export {KIND_LABELS[kind]} as CSV
            </a>
            {canManage ? (
              <Button size="sm" variant="primary" onClick={() => setEditing("new")}>
                Add {kind === "opamp" ? "op-amp" : "reference"}
              </Button>
            ) : null}
          </div>
        </div>
        {notice ? (
          <div className="mb-3">
            <Notice tone="success">{notice}</Notice>
          </div>
        ) : null}
        {delErr ? (
          <div className="mb-3">
            <Notice tone="error">{delErr.message}</Notice>
          </div>
        ) : null}
        {rows.length === 0 ? (
          <EmptyState title={`No ${KIND_LABELS[kind]} in the library yet`}>
            {canManage ? (
              <>
                <p>Add one with the form, or import a CSV file.</p>
                <p className="mt-3">
                  <Button
                    size="sm"
                    onClick={async () => {
                      try {
                        const r = await api<{ added: number }>(`/api/w/${slug}/parts/starter`, { body: { kind } });
                        setNotice(`Added ${r.added} generic example ${KIND_LABELS[kind]} with invented values. Replace them with your firm's approved parts before relying on them.`);
                        qc.invalidateQueries({ queryKey: ["parts", slug] });
                      } catch (e) {
                        setNotice((e as Error).message);
                      }
                    }}
                  >
                    Add the generic starter set to try things out
                  </Button>
                </p>
              </>
            ) : (
              "Ask an engineer to add some."
            )}
          </EmptyState>
        ) : (
          <div className="overflow-x-auto rounded-lg border border-rule bg-sheet">
            <table className="table-dense" aria-label={kind === "opamp" ? "Op-amps" : "References"}>
              <thead>
                <tr>
                  {columns.map((c) => (
                    <th key={c.id} className={c.numeric ? "num" : undefined} aria-sort={sort.id === c.id ? (sort.dir === "asc" ? "ascending" : "descending") : "none"} title={c.title}>
                      <button type="button" onClick={() => toggleSort(c.id)} className="inline-flex items-center gap-1 hover:text-ink">
                        {c.label}
                        <span aria-hidden className="text-[10px] text-ink-3">
                          {sort.id === c.id ? (sort.dir === "asc" ? "▲" : "▼") : "↕"}
                        </span>
                      </button>
                    </th>
                  ))}
                  {canManage ? <th className="sr-only">Actions</th> : null}
                </tr>
              </thead>
              <tbody>
                {rows.map((p) => (
                  <tr key={p.id} data-part={p.name} className={editing !== "new" && editing?.id === p.id ? "bg-copper-wash/60" : undefined}>
                    {columns.map((c) =>
                      c.id === "name" ? (
                        <td key={c.id} className="min-w-[14rem] font-medium">
                          {p.name}
                          {p.notes ? <div className="text-[12px] font-normal text-ink-3">{p.notes}</div> : null}
                        </td>
                      ) : (
                        <td key={c.id} className={cx(c.numeric ? "num mono" : undefined, "text-ink-2")}>
                          {c.show(p)}
                        </td>
                      ),
                    )}
                    {canManage ? (
                      <td className="whitespace-nowrap text-right">
                        <Button size="sm" variant="quiet" onClick={() => setEditing(p)} aria-label={`Edit ${p.name}`}>
                          Edit
                        </Button>
                        <Button
                          size="sm"
                          variant="quiet"
                          aria-label={`Delete ${p.name}`}
                          disabled={del.isPending}
                          onClick={() => {
                            if (window.confirm(`Remove "${p.name}" from the library? Calculations that used it keep their own copy of its parameters.`)) del.mutate(p);
                          }}
                        >
                          Delete
                        </Button>
                      </td>
                    ) : null}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
        <p className="mt-2 text-[12.5px] text-ink-3">Click a column heading to sort. Values are shown to 4 significant figures; the library keeps them as entered.</p>
      </div>
      {canManage && editing ? (
        <PartForm
          key={editing === "new" ? `new-${kind}` : editing.id}
          slug={slug}
          kind={editing === "new" ? kind : editing.kind}
          part={editing === "new" ? undefined : editing}
          onDone={(msg) => {
            setNotice(msg);
            setEditing(null);
            qc.invalidateQueries({ queryKey: ["parts", slug] });
          }}
          onCancel={() => setEditing(null)}
        />
      ) : null}
    </div>
  );
}

function PartForm({ slug, kind, part, onDone, onCancel }: { slug: string; kind: PartKind; part?: PartDto; onDone: (msg: string) => void; onCancel: () => void }) {
  const fields = paramFields(kind);
  const [name, setName] = useState(part?.name ?? "");
  const [notes, setNotes] = useState(part?.notes ?? "");
  const [topology, setTopology] = useState(String(part?.values.topology ?? "shunt"));
  const [values, setValues] = useState<Record<string, string>>(() => Object.fromEntries(fields.map((f) => [f.key, part ? editText(f, part.values[f.key]) : ""])));
  const save = useMutation({
    mutationFn: () => {
      const body = { name, notes, values: { ...values, ...(kind === "reference" ? { topology } : {}) } };
      return part
        ? api<{ part: PartDto }>(`/api/w/${slug}/parts/${part.id}`, { method: "PATCH", body })
        : api<{ part: PartDto }>(`/api/w/${slug}/parts`, { body: { kind, ...body } });
    },
    onSuccess: (r) => onDone(part ? `Saved "${r.part.name}".` : `Added "${r.part.name}" to the library.`),
  });
  const err = save.error instanceof ApiError ? save.error : undefined;
  const fieldErr = (key: string) => err?.fields[key] ?? err?.fields[`values.${key}`];
  const title = part ? `Edit ${part.name}` : `New ${kind === "opamp" ? "op-amp" : "reference"}`;
  return (
    <Panel title={title} className="self-start xl:sticky xl:top-4">
      <form
        className="space-y-3"
        noValidate
        aria-label={title}
        onSubmit={(e) => {
          e.preventDefault();
          save.mutate();
        }}
      >
        {err ? <Notice tone="error">{err.message}</Notice> : null}
        <Field label="Name" htmlFor="part-name" error={fieldErr("name")} hint="Unique among the library's parts of this kind.">
          <TextInput id="part-name" value={name} onChange={(e) => setName(e.target.value)} aria-invalid={!!fieldErr("name")} maxLength={80} />
        </Field>
        {kind === "reference" ? (
          <Field label="Topology" htmlFor="part-topology" error={fieldErr("topology")}>
            <Select id="part-topology" value={topology} onChange={(e) => setTopology(e.target.value)}>
              {TOPOLOGIES.map((t) => (
                <option key={t} value={t}>
                  {t}
                </option>
              ))}
            </Select>
          </Field>
        ) : null}
        <p className="text-[12.5px] text-ink-3">Type values with a prefix and unit as you like: 10M, 10 MHz, 0.5 V/µs, 12 nV/√Hz, 4k7. Each is read into SI units.</p>
        <div className="grid grid-cols-1 gap-3 sm:grid-cols-2 xl:grid-cols-1 2xl:grid-cols-2">
          {fields.map((f) => {
            const text = values[f.key] ?? "";
            const parsed = text.trim() ? parseParamValue(f, text) : undefined;
            const error = fieldErr(f.key);
            return (
              <Field
                key={f.key}
                label={`${f.label} (${f.symbol})`}
                htmlFor={`part-${f.key}`}
                error={error}
                hint={parsed ? (parsed.ok ? <span className="mono">= {displayValue(f, parsed.value)}</span> : <span>{parsed.message.replace(/^[^:]*: /, "")}</span>) : <span>in {f.unit}</span>}
              >
                <TextInput
                  id={`part-${f.key}`}
                  value={text}
                  onChange={(e) => setValues({ ...values, [f.key]: e.target.value })}
                  aria-invalid={!!error}
                  aria-describedby={error ? `part-${f.key}-error` : undefined}
                  className="mono"
                  autoComplete="off"
                  spellCheck={false}
                />
              </Field>
            );
          })}
        </div>
        <Field label="Notes" htmlFor="part-notes" error={fieldErr("notes")}>
          <TextArea id="part-notes" value={notes} onChange={(e) => setNotes(e.target.value)} rows={2} maxLength={2000} />
        </Field>
        <div className="flex gap-2">
          <Button type="submit" variant="primary" disabled={save.isPending}>
            {part ? "Save part" : "Add part"}
          </Button>
          <Button type="button" variant="quiet" onClick={onCancel}>
            Cancel
          </Button>
        </div>
      </form>
    </Panel>
  );
}
