"use client";

import Link from "next/link";
import { useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { Button, EmptyState, Field, Notice, Panel, Tag, TextInput } from "@/app/_components/ui";
import { api, ApiError } from "@/lib/api-client";

export interface ProjectRow {
  id: string;
  name: string;
  clientName: string;
  jobNumber: string;
  description: string;
  archivedAt: number | null;
  updatedAt: number;
}

function fmtDate(ms: number): string {
  return new Date(ms).toISOString().slice(0, 10);
}

export function ProjectsView({ slug, initial, canCreate }: { slug: string; initial: ProjectRow[]; canCreate: boolean }) {
  const qc = useQueryClient();
  const [showArchived, setShowArchived] = useState(false);
  const key = ["projects", slug, showArchived];
  const { data } = useQuery({
    queryKey: key,
    queryFn: () => api<{ projects: ProjectRow[] }>(`/api/w/${slug}/projects?archived=${showArchived ? "include" : "exclude"}`).then((r) => r.projects),
    initialData: showArchived ? undefined : initial,
  });
  const projects = data ?? [];

  return (
    <div className="grid gap-6 lg:grid-cols-[1fr_320px]">
      <div>
        <div className="mb-2 flex items-center justify-between">
          <p className="text-[13px] text-ink-3">{projects.length} project{projects.length === 1 ? "" : "s"}</p>
          <label className="flex items-center gap-2 text-[13px] text-ink-2">
            <input type="checkbox" checked={showArchived} onChange={(e) => setShowArchived(e.target.checked)} className="accent-copper" />
            Show archived
          </label>
        </div>
        {projects.length === 0 ? (
          <EmptyState title="No projects yet">{canCreate ? "Create the first one for a client job." : "Nothing has been shared with you yet."}</EmptyState>
        ) : (
          <div className="overflow-x-auto rounded-lg border border-rule bg-sheet">
            <table className="table-dense" aria-label="Projects">
              <thead>
                <tr>
                  <th>Project</th>
                  <th>Client</th>
                  <th>Job no.</th>
                  <th className="num">Last change</th>
                </tr>
              </thead>
              <tbody>
                {projects.map((p) => (
                  <tr key={p.id}>
                    <td>
                      <Link href={`/w/${slug}/projects/${p.id}`} className="font-medium text-ink hover:text-copper">
                        {p.name}
                      </Link>
                      {p.archivedAt ? (
                        <span className="ml-2">
                          <Tag tone="muted">archived</Tag>
                        </span>
                      ) : null}
                    </td>
                    <td className="text-ink-2">{p.clientName || "—"}</td>
                    <td className="mono text-ink-2">{p.jobNumber || "—"}</td>
                    <td className="num mono text-ink-2">{fmtDate(p.updatedAt)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </div>
      {canCreate ? <CreateProject slug={slug} onCreated={() => qc.invalidateQueries({ queryKey: ["projects", slug] })} /> : null}
    </div>
  );
}

function CreateProject({ slug, onCreated }: { slug: string; onCreated: () => void }) {
  const [form, setForm] = useState({ name: "", clientName: "", jobNumber: "", description: "" });
  const m = useMutation({
    mutationFn: (body: typeof form) => api<{ project: ProjectRow }>(`/api/w/${slug}/projects`, { body }),
    onSuccess: () => {
      setForm({ name: "", clientName: "", jobNumber: "", description: "" });
      onCreated();
    },
  });
  const err = m.error instanceof ApiError ? m.error : undefined;
  const set = (k: keyof typeof form) => (e: React.ChangeEvent<HTMLInputElement>) => setForm({ ...form, [k]: e.target.value });
  return (
    <Panel title="New project">
      <form
        className="space-y-3"
        noValidate
        onSubmit={(e) => {
          e.preventDefault();
          m.mutate(form);
        }}
      >
        {err ? <Notice tone="error">{err.message}</Notice> : null}
        {m.isSuccess ? <Notice tone="success">Project created.</Notice> : null}
        <Field label="Project name" htmlFor="p-name" error={err?.fields.name}>
          <TextInput id="p-name" value={form.name} onChange={set("name")} aria-invalid={!!err?.fields.name} />
        </Field>
        <Field label="Client" htmlFor="p-client" error={err?.fields.clientName}>
          <TextInput id="p-client" value={form.clientName} onChange={set("clientName")} />
        </Field>
        <Field label="Job number" htmlFor="p-job" error={err?.fields.jobNumber}>
          <TextInput id="p-job" value={form.jobNumber} onChange={set("jobNumber")} />
        </Field>
        <Field label="Description" htmlFor="p-desc" error={err?.fields.description}>
          <TextInput id="p-desc" value={form.description} onChange={set("description")} />
        </Field>
        <Button type="submit" variant="primary" disabled={m.isPending}>
          Create project
        </Button>
      </form>
    </Panel>
  );
}
