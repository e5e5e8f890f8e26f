"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { Button, Field, Notice, Panel, TextInput } from "@/app/_components/ui";
import { api, ApiError } from "@/lib/api-client";

interface Project {
  id: string;
  name: string;
  clientName: string;
  jobNumber: string;
  description: string;
  archivedAt: number | null;
}

export function ProjectSettings({ slug, project, canEdit, canShare }: { slug: string; project: Project; canEdit: boolean; canShare: boolean }) {
  if (!canEdit && !canShare) return null;
  return (
    <div className="grid gap-6 lg:grid-cols-2">
      {canEdit ? <EditProject slug={slug} project={project} /> : null}
      {canShare ? <ClientAccess slug={slug} projectId={project.id} /> : null}
    </div>
  );
}

function EditProject({ slug, project }: { slug: string; project: Project }) {
  const router = useRouter();
  const [form, setForm] = useState({ name: project.name, clientName: project.clientName, jobNumber: project.jobNumber, description: project.description });
  const m = useMutation({
    mutationFn: (body: Record<string, unknown>) => api(`/api/w/${slug}/projects/${project.id}`, { method: "PATCH", body }),
    onSuccess: () => router.refresh(),
  });
  const err = m.error instanceof ApiError ? m.error : undefined;
  const set = (k: keyof typeof form) => (e: React.ChangeEvent<HTMLInputElement>) => setForm({ ...form, [k]: e.target.value });
  return (
    <Panel
      title="Project details"
      actions={
        <Button size="sm" variant={project.archivedAt ? "secondary" : "quiet"} onClick={() => m.mutate({ archived: !project.archivedAt })}>
          {project.archivedAt ? "Restore project" : "Archive project"}
        </Button>
      }
    >
      <form
        className="grid gap-3 sm:grid-cols-2"
        noValidate
        onSubmit={(e) => {
          e.preventDefault();
          m.mutate(form);
        }}
      >
        {err ? (
          <div className="sm:col-span-2">
            <Notice tone="error">{err.message}</Notice>
          </div>
        ) : null}
        <Field label="Project name" htmlFor="e-name" error={err?.fields.name} className="sm:col-span-2">
          <TextInput id="e-name" value={form.name} onChange={set("name")} aria-invalid={!!err?.fields.name} />
        </Field>
        <Field label="Client" htmlFor="e-client" error={err?.fields.clientName}>
          <TextInput id="e-client" value={form.clientName} onChange={set("clientName")} />
        </Field>
        <Field label="Job number" htmlFor="e-job" error={err?.fields.jobNumber}>
          <TextInput id="e-job" value={form.jobNumber} onChange={set("jobNumber")} />
        </Field>
        <Field label="Description" htmlFor="e-desc" error={err?.fields.description} className="sm:col-span-2">
          <TextInput id="e-desc" value={form.description} onChange={set("description")} />
        </Field>
        <div className="sm:col-span-2">
          <Button type="submit" disabled={m.isPending}>
            Save details
          </Button>
        </div>
      </form>
    </Panel>
  );
}

interface ClientRow {
  userId: string;
  name: string;
  email: string;
  hasAccess: boolean;
}

function ClientAccess({ slug, projectId }: { slug: string; projectId: string }) {
  const qc = useQueryClient();
  const url = `/api/w/${slug}/projects/${projectId}/access`;
  const { data, error } = useQuery({ queryKey: ["access", slug, projectId], queryFn: () => api<{ clients: ClientRow[] }>(url).then((r) => r.clients) });
  const m = useMutation({
    mutationFn: ({ userId, allow }: { userId: string; allow: boolean }) => api(url, { method: allow ? "POST" : "DELETE", body: { userId } }),
    onSuccess: () => qc.invalidateQueries({ queryKey: ["access", slug, projectId] }),
  });
  return (
    <Panel title="Client access">
      <p className="mb-3 text-[13px] text-ink-2">Clients see only the projects ticked here, and only issued reports. Invite new clients from Members.</p>
      {error ? <Notice tone="error">{(error as Error).message}</Notice> : null}
      {m.error ? <Notice tone="error">{(m.error as Error).message}</Notice> : null}
      {data && data.length === 0 ? <p className="text-ink-3">No client members yet.</p> : null}
      <ul className="space-y-1.5">
        {data?.map((c) => (
          <li key={c.userId}>
            <label className="flex items-center gap-2">
              <input type="checkbox" className="accent-copper" checked={c.hasAccess} onChange={(e) => m.mutate({ userId: c.userId, allow: e.target.checked })} />
              <span>{c.name}</span>
              <span className="text-ink-3">{c.email}</span>
            </label>
          </li>
        ))}
      </ul>
    </Panel>
  );
}
