"use client";

import Link from "next/link";
import { useState } from "react";
import { useQueryClient } from "@tanstack/react-query";
import { Button, Field, Notice, Panel, Select, Tag, buttonClass, cx } from "@/app/_components/ui";
import { api, ApiError } from "@/lib/api-client";
import type { ImportPreview, ImportRow } from "@/lib/parts/csv";
import type { PartKind } from "@/lib/parts/fields";

/** POST a multipart form; errors arrive as ApiError like the JSON calls. */
function postForm<T>(path: string, form: FormData): Promise<T> {
  return api<T>(path, { form });
}

export function ImportView({ slug, maxBytes, maxRows }: { slug: string; maxBytes: number; maxRows: number }) {
  const qc = useQueryClient();
  const [kind, setKind] = useState<PartKind>("opamp");
  const [file, setFile] = useState<File | null>(null);
  const [preview, setPreview] = useState<ImportPreview | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState<"check" | "import" | null>(null);
  const [done, setDone] = useState<{ imported: number; skipped: number; kind: PartKind } | null>(null);

  const form = (confirm?: string) => {
    const f = new FormData();
    f.set("kind", kind);
    if (file) f.set("file", file);
    if (confirm) f.set("confirm", confirm);
    return f;
  };

  const check = async () => {
    setError(null);
    setDone(null);
    setPreview(null);
    if (!file) return setError("Choose a CSV file first.");
    if (file.size > maxBytes) return setError(`The file is ${(file.size / 1024 / 1024).toFixed(2)} MB; a parts CSV may be at most ${maxBytes / 1024 / 1024} MB. Split it into smaller files.`);
    setBusy("check");
    try {
      setPreview((await postForm<{ preview: ImportPreview }>(`/api/w/${slug}/parts/import`, form())).preview);
    } catch (e) {
      setError(e instanceof ApiError ? e.message : "The file could not be checked. Try again.");
    } finally {
      setBusy(null);
    }
  };

  const confirm = async () => {
    if (!preview) return;
    setError(null);
    setBusy("import");
    try {
      const r = await postForm<{ result: { imported: number; skipped: number; kind: PartKind } }>(`/api/w/${slug}/parts/import`, form(preview.previewHash));
      setDone(r.result);
      setPreview(null);
      qc.invalidateQueries({ queryKey: ["parts", slug] });
    } catch (e) {
      setError(e instanceof ApiError ? e.message : "The import failed; nothing was imported. Try again.");
    } finally {
      setBusy(null);
    }
  };

  const kindWord = kind === "opamp" ? "op-amps" : "references";
  return (
    <div className="space-y-5">
      <Panel title="1. The file">
        <div className="grid gap-4 md:grid-cols-[220px_1fr_auto] md:items-end">
          <Field label="Kind of parts" htmlFor="import-kind">
            <Select
              id="import-kind"
              value={kind}
              onChange={(e) => {
                setKind(e.target.value as PartKind);
                setPreview(null);
              }}
            >
              <option value="opamp">Op-amps</option>
              <option value="reference">References</option>
            </Select>
          </Field>
          <Field label="CSV file" htmlFor="import-file" hint={`UTF-8, at most ${maxBytes / 1024 / 1024} MB and ${maxRows.toLocaleString("en")} rows. Columns as in the template.`}>
            <input
              id="import-file"
              type="file"
              accept=".csv,text/csv"
              className="block w-full text-[13px] file:mr-3 file:rounded-md file:border file:border-rule-strong file:bg-sheet file:px-3 file:py-1.5 file:text-ink"
              onChange={(e) => {
                setFile(e.target.files?.[0] ?? null);
                setPreview(null);
                setDone(null);
              }}
            />
          </Field>
          <div className="flex gap-2">
            <a className={buttonClass("quiet")} href={`/api/w/${slug}/parts/template?kind=${kind}`} download>
              Download template
            </a>
            <Button variant="primary" onClick={check} disabled={!file || busy !== null}>
              {busy === "check" ? "Checking…" : "Check file"}
            </Button>
          </div>
        </div>
        <p className="mt-3 text-[12.5px] text-ink-3">
          Each value is a plain number in the unit named in its column heading (e.g. <span className="mono">gbw [Hz]</span>), or a value with prefix and unit such as{" "}
          <span className="mono">10M</span>, <span className="mono">0.5 V/µs</span> or <span className="mono">12 nV/√Hz</span>. Text starting with = + − or @ is refused, because a spreadsheet would run it as a formula.
        </p>
      </Panel>

      {error ? <Notice tone="error">{error}</Notice> : null}
      {done ? (
        <Notice tone="success">
          Imported {done.imported.toLocaleString("en")} {done.kind === "opamp" ? "op-amps" : "references"}.
          {done.skipped ? ` ${done.skipped.toLocaleString("en")} row${done.skipped === 1 ? "" : "s"} with problems ${done.skipped === 1 ? "was" : "were"} not imported.` : ""}{" "}
          <Link href={`/w/${slug}/parts`} className="font-medium text-copper underline-offset-2 hover:underline">
            Open the parts library
          </Link>
        </Notice>
      ) : null}

      {preview ? <PreviewPanel preview={preview} kindWord={kindWord} busy={busy === "import"} onConfirm={confirm} /> : null}
    </div>
  );
}

function PreviewPanel({ preview, kindWord, busy, onConfirm }: { preview: ImportPreview; kindWord: string; busy: boolean; onConfirm: () => void }) {
  const [onlyProblems, setOnlyProblems] = useState(preview.invalid > 0);
  const rows = onlyProblems ? preview.rows.filter((r) => !r.ok) : preview.rows;
  const cols = preview.columns;
  return (
    <Panel
      title="2. Check and confirm"
      actions={
        <Button variant="primary" onClick={onConfirm} disabled={busy || preview.valid === 0}>
          {busy ? "Importing…" : `Import ${preview.valid.toLocaleString("en")} valid row${preview.valid === 1 ? "" : "s"}`}
        </Button>
      }
    >
      <p className="mb-3" data-testid="import-summary">
        {preview.total.toLocaleString("en")} row{preview.total === 1 ? "" : "s"} read: <strong>{preview.valid.toLocaleString("en")} ready</strong>,{" "}
        <strong>{preview.invalid.toLocaleString("en")} with problems</strong>. Nothing has been imported yet; rows with problems will be left out. The import adds all ready rows at once, or none.
      </p>
      {preview.fileNotes.map((n) => (
        <p key={n} className="mb-1 text-[13px] text-ink-2">
          Note: {n}
        </p>
      ))}
      <div className="my-2 flex items-center justify-between">
        <label className="flex items-center gap-2 text-[13px] text-ink-2">
          <input type="checkbox" checked={onlyProblems} onChange={(e) => setOnlyProblems(e.target.checked)} className="accent-copper" />
          Show only rows with problems
        </label>
        {preview.truncated ? <span className="text-[12.5px] text-ink-3">Showing {preview.rows.length.toLocaleString("en")} of {preview.total.toLocaleString("en")} rows (every row was checked).</span> : null}
      </div>
      <div className="max-h-[32rem] overflow-auto rounded-md border border-rule">
        <table className="table-dense" aria-label={`Import preview of ${kindWord}`}>
          <thead className="sticky top-0 bg-sheet">
            <tr>
              <th className="num">Row</th>
              <th>Status</th>
              <th>Problems</th>
              {cols.map((c) => (
                <th key={c.key} title={c.label} className={c.unit ? "num" : undefined}>
                  {c.header}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <PreviewRow key={r.row} row={r} cols={cols} />
            ))}
          </tbody>
        </table>
      </div>
    </Panel>
  );
}

function PreviewRow({ row, cols }: { row: ImportRow; cols: ImportPreview["columns"] }) {
  const problems = Object.entries(row.errors);
  return (
    <tr data-row={row.row} aria-invalid={!row.ok || undefined} className={row.ok ? undefined : "bg-fail-wash/40"}>
      <td className="num mono">{row.row}</td>
      <td className="whitespace-nowrap">{row.ok ? <Tag tone="neutral">✓ ready</Tag> : <span className="text-[12.5px] font-semibold text-fail">✗ problem</span>}</td>
      <td className="min-w-[18rem] text-[12.5px]">
        {problems.length ? (
          <ul className="space-y-0.5">
            {problems.map(([k, m]) => (
              <li key={k}>
                <span className="font-semibold">{k === "row" ? "row" : k}:</span> {m}
              </li>
            ))}
          </ul>
        ) : null}
        {row.notes.map((n) => (
          <div key={n} className="text-ink-3">
            {n}
          </div>
        ))}
      </td>
      {cols.map((c) => {
        const bad = c.key in row.errors;
        return (
          <td key={c.key} className={cx(c.unit ? "num mono" : c.key === "name" ? "min-w-[14rem]" : undefined, bad && "font-semibold text-fail underline decoration-dotted")} aria-invalid={bad || undefined} title={bad ? row.errors[c.key] : undefined}>
            {row.cells[c.key] ?? ""}
          </td>
        );
      })}
    </tr>
  );
}
