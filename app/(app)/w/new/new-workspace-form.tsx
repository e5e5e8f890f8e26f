"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button, Field, Notice, TextInput } from "@/app/_components/ui";
import { api, ApiError } from "@/lib/api-client";

export function NewWorkspaceForm() {
  const router = useRouter();
  const [name, setName] = useState("");
  const [error, setError] = useState<{ message: string; field?: string }>();
  const [busy, setBusy] = useState(false);
  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setBusy(true);
    setError(undefined);
    try {
      const r = await api<{ workspace: { slug: string } }>("/api/me/workspaces", { body: { name } });
      router.push(`/w/${r.workspace.slug}/projects`);
    } catch (err) {
      setError(err instanceof ApiError ? { message: err.message, field: err.fields.name } : { message: "Could not create the workspace." });
      setBusy(false);
    }
  }
  return (
    <form onSubmit={submit} className="space-y-4" noValidate>
      {error ? <Notice tone="error">{error.message}</Notice> : null}
      <Field label="Firm name" htmlFor="ws-name" error={error?.field}>
        <TextInput id="ws-name" value={name} onChange={(e) => setName(e.target.value)} autoFocus aria-invalid={!!error?.field} />
      </Field>
      <Button type="submit" variant="primary" disabled={busy}>
        Create workspace
      </Button>
    </form>
  );
}
