"use client";

/**
 * The attachments of one calculation: list (name, type, size, SHA-256, uploader, date), upload
 * by choosing or dropping files, download and delete. The server decides the type from the
 * file's bytes and refuses what does not fit; its message is shown here as it comes.
 *
 * Use on the calculation sheet: `<AttachmentsPanel slug={slug} calcId={calc.id}
 * canEdit={can(role, "calc.edit") && calc.status !== "issued"} readOnlyReason="…" />`.
 */
import { useRef, useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { Button, EmptyState, Notice, Panel, cx } from "@/app/_components/ui";
import { api, ApiError } from "@/lib/api-client";
import { ACCEPTED_LABEL, ACCEPTED_TYPES, ACCEPT_ATTR, ATTACHMENT_MAX_BYTES } from "@/lib/attachments/limits";

/** One attachment as the list route returns it. */
export interface AttachmentItem {
  id: string;
  filename: string;
  mime: string;
  /** Bytes. */
  size: number;
  sha256: string;
  uploadedBy: { id: string; name: string };
  /** ms since the epoch. */
  at: number;
}

/** "12.3 kB", "4.56 MB" (1 kB = 1024 bytes, as the 10 MB limit is stated). */
function formatSize(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(1)} kB`;
  return `${(bytes / 1024 / 1024).toFixed(2)} MB`;
}

function formatWhen(ms: number): string {
  return new Date(ms).toISOString().slice(0, 16).replace("T", " ");
}

function typeLabel(mime: string): string {
  return (ACCEPTED_TYPES as Record<string, { label: string }>)[mime]?.label ?? mime;
}

function uploadFile(path: string, file: File): Promise<{ attachment: AttachmentItem }> {
  const form = new FormData();
  form.set("file", file);
  return api<{ attachment: AttachmentItem }>(path, { form });
}

export function AttachmentsPanel({ slug, calcId, canEdit, readOnlyReason }: { slug: string; calcId: string; canEdit: boolean; readOnlyReason?: string }) {
  const base = `/api/w/${slug}/calculations/${calcId}/attachments`;
  const qc = useQueryClient();
  const key = ["attachments", slug, calcId];
  const input = useRef<HTMLInputElement>(null);
  const [drag, setDrag] = useState(false);
  const [errors, setErrors] = useState<Array<{ file: string; message: string }>>([]);
  const [uploading, setUploading] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const { data, isLoading, error: listError } = useQuery({ queryKey: key, queryFn: () => api<{ attachments: AttachmentItem[] }>(base).then((r) => r.attachments) });
  const items = data ?? [];

  const del = useMutation({
    mutationFn: (a: AttachmentItem) => api<{ deleted: string }>(`${base}/${a.id}`, { method: "DELETE" }),
    onSuccess: (_r, a) => {
      setDone(`Deleted "${a.filename}".`);
      qc.invalidateQueries({ queryKey: key });
    },
    onError: (e, a) => setErrors([{ file: a.filename, message: e instanceof ApiError ? e.message : "The attachment could not be deleted." }]),
  });

  const send = async (files: File[]) => {
    setErrors([]);
    setDone(null);
    const failed: Array<{ file: string; message: string }> = [];
    let ok = 0;
    for (const f of files) {
      if (f.size > ATTACHMENT_MAX_BYTES) {
        failed.push({ file: f.name, message: `The file is ${formatSize(f.size)}; an attachment may be at most 10 MB.` });
        continue;
      }
      setUploading(f.name);
      try {
        await uploadFile(base, f);
        ok += 1;
      } catch (e) {
        failed.push({ file: f.name, message: e instanceof ApiError ? e.message : "The upload failed; try again." });
      }
    }
    setUploading(null);
    setErrors(failed);
    if (ok) setDone(`Attached ${ok} file${ok === 1 ? "" : "s"}.`);
    qc.invalidateQueries({ queryKey: key });
    if (input.current) input.current.value = "";
  };

  return (
    <Panel title="Attachments" actions={<span className="text-[12.5px] text-ink-3">{items.length} file{items.length === 1 ? "" : "s"}</span>}>
      {listError ? <Notice tone="error">{listError instanceof ApiError ? listError.message : "The attachments could not be loaded."}</Notice> : null}
      {canEdit ? (
        <div
          onDragOver={(e) => {
            e.preventDefault();
            setDrag(true);
          }}
          onDragLeave={() => setDrag(false)}
          onDrop={(e) => {
            e.preventDefault();
            setDrag(false);
            const files = Array.from(e.dataTransfer.files);
            if (files.length) void send(files);
          }}
          className={cx("mb-3 rounded-md border border-dashed px-4 py-4 text-center text-[13px]", drag ? "border-copper bg-copper-wash/50" : "border-rule-strong")}
          data-testid="attachment-drop"
        >
          <p className="text-ink-2">
            Drop schematics here, or{" "}
            <label htmlFor={`att-file-${calcId}`} className="cursor-pointer font-medium text-copper underline-offset-2 hover:underline">
              choose files
            </label>
            <input
              id={`att-file-${calcId}`}
              ref={input}
              type="file"
              multiple
              accept={ACCEPT_ATTR}
              className="sr-only"
              aria-label="Attach files"
              onChange={(e) => {
                const files = Array.from(e.target.files ?? []);
                if (files.length) void send(files);
              }}
            />
          </p>
          <p className="mt-1 text-[12px] text-ink-3">{ACCEPTED_LABEL}, up to 10 MB each. The type is checked from the file&apos;s contents.</p>
          {uploading ? (
            <p role="status" className="mt-1 text-[12.5px]">
              Uploading {uploading}…
            </p>
          ) : null}
        </div>
      ) : readOnlyReason ? (
        <p className="mb-3 text-[13px] text-ink-3">{readOnlyReason}</p>
      ) : null}
      {errors.length ? (
        <div className="mb-3 space-y-1.5">
          {errors.map((e) => (
            <Notice key={e.file} tone="error" title={`Not attached: ${e.file}`}>
              {e.message}
            </Notice>
          ))}
        </div>
      ) : null}
      {done ? (
        <div className="mb-3">
          <Notice tone="success">{done}</Notice>
        </div>
      ) : null}
      {isLoading ? (
        <p className="text-[13px] text-ink-3">Loading…</p>
      ) : items.length === 0 ? (
        <EmptyState title="No attachments">{canEdit ? "Add the schematic, a scope capture or a data-sheet extract." : undefined}</EmptyState>
      ) : (
        <div className="overflow-x-auto">
          <table className="table-dense" aria-label="Attachments">
            <thead>
              <tr>
                <th>File</th>
                <th>Type</th>
                <th className="num">Size</th>
                <th>SHA-256</th>
                <th>Uploaded by</th>
                <th className="num">Date (UTC)</th>
                {canEdit ? <th className="sr-only">Actions</th> : null}
              </tr>
            </thead>
            <tbody>
              {items.map((a) => (
                <tr key={a.id}>
                  <td>
                    <a href={`${base}/${a.id}`} download={a.filename} className="font-medium text-ink hover:text-copper">
                      {a.filename}
                    </a>
                  </td>
                  <td className="text-ink-2">{typeLabel(a.mime)}</td>
                  <td className="num mono text-ink-2">{formatSize(a.size)}</td>
                  <td className="mono text-[12.5px] text-ink-2" title={a.sha256}>
                    {a.sha256.slice(0, 12)}…
                  </td>
                  <td className="text-ink-2">{a.uploadedBy.name}</td>
                  <td className="num mono text-ink-2">{formatWhen(a.at)}</td>
                  {canEdit ? (
                    <td className="text-right">
                      <Button
                        size="sm"
                        variant="quiet"
                        aria-label={`Delete ${a.filename}`}
                        disabled={del.isPending}
                        onClick={() => {
                          if (window.confirm(`Delete "${a.filename}" from this calculation?`)) del.mutate(a);
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
    </Panel>
  );
}
