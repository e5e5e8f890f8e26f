"use client";
/**
 * Starting a calculation: pick a type (grouped by pack, each with what it does; a locked pack's
 * types are shown but cannot be picked, with the way to unlock them), give it a title and a
 * number (the next free one is suggested).
 */
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useMutation } from "@tanstack/react-query";
import { api, ApiError } from "@/lib/api-client";
import type { PackId } from "@/lib/calc/core/types";
import { Button, Field, Notice, Tag, TextInput, cx } from "../ui";

export interface PackChoice {
  id: PackId;
  title: string;
  summary: string;
  locked: boolean;
  types: Array<{ id: string; title: string; summary: string }>;
}

export function NewCalculationForm({
  slug,
  projectId,
  packs,
  suggestedNumber,
  canManageBilling,
  readOnlyMessage,
  archived,
}: {
  slug: string;
  projectId: string;
  packs: PackChoice[];
  suggestedNumber: string;
  canManageBilling: boolean;
  readOnlyMessage?: string;
  archived: boolean;
}) {
  const router = useRouter();
  const firstOpen = packs.find((p) => !p.locked)?.types[0]?.id ?? "";
  const [typeId, setTypeId] = useState(firstOpen);
  const [title, setTitle] = useState("");
  const [number, setNumber] = useState(suggestedNumber);
  const chosen = packs.flatMap((p) => p.types).find((t) => t.id === typeId);
  const m = useMutation({
    mutationFn: () => api<{ calculation: { id: string } }>(`/api/w/${slug}/projects/${projectId}/calculations`, { body: { typeId, title: title.trim() || chosen?.title || "", number: number.trim() || undefined } }),
    onSuccess: (r) => router.push(`/w/${slug}/projects/${projectId}/calculations/${r.calculation.id}`),
  });
  const err = m.error instanceof ApiError ? m.error : undefined;
  const blocked = archived ? "This project is archived. Restore it to add calculations." : readOnlyMessage;

  return (
    <form
      className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_340px]"
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
        if (typeId) m.mutate();
      }}
    >
      <fieldset className="min-w-0 space-y-5">
        <legend className="mb-2 text-[15px] font-semibold">Calculation type</legend>
        {packs.map((p) => (
          <section key={p.id} aria-label={p.title} className="rounded-lg border border-rule bg-sheet">
            <header className="flex flex-wrap items-baseline justify-between gap-2 border-b border-rule px-4 py-2">
              <div>
                <h3 className="text-[14px]">
                  {p.title}
                  {p.locked ? (
                    <span className="ml-2 align-middle">
                      <Tag tone="muted">locked</Tag>
                    </span>
                  ) : null}
                </h3>
                <p className="text-[12.5px] text-ink-3">{p.summary}</p>
              </div>
              {p.locked ? (
                canManageBilling ? (
                  <Link href={`/w/${slug}/billing`} className="text-[13px] font-medium text-copper hover:underline">
                    Unlock on the billing page
                  </Link>
                ) : (
                  <span className="text-[12.5px] text-ink-2">Not in your subscription: ask your workspace owner to add it.</span>
                )
              ) : null}
            </header>
            <ul className="divide-y divide-rule">
              {p.types.map((t) => (
                <li key={t.id}>
                  <label className={cx("flex gap-3 px-4 py-2.5", p.locked ? "cursor-not-allowed opacity-60" : "cursor-pointer hover:bg-copper/[0.04]", typeId === t.id && "bg-copper-wash/50")}>
                    <input type="radio" name="typeId" value={t.id} checked={typeId === t.id} disabled={p.locked} onChange={() => setTypeId(t.id)} className="mt-1 accent-copper" />
                    <span>
                      <span className="block font-medium">{t.title}</span>
                      <span className="block text-[13px] text-ink-2">{t.summary}</span>
                      <span className="mono text-[11.5px] text-ink-3">{t.id}</span>
                    </span>
                  </label>
                </li>
              ))}
              {p.types.length === 0 ? <li className="px-4 py-2.5 text-[13px] text-ink-3">No calculation types in this pack yet.</li> : null}
            </ul>
          </section>
        ))}
      </fieldset>
      <div>
        <div className="space-y-3 rounded-lg border border-rule bg-sheet p-4 lg:sticky lg:top-3">
          {blocked ? <Notice tone="info">{blocked}</Notice> : null}
          {err ? <Notice tone="error">{err.message}</Notice> : null}
          <Field label="Title" htmlFor="nc-title" error={err?.fields.title} hint={chosen ? `Leave empty for “${chosen.title}”.` : undefined}>
            <TextInput id="nc-title" value={title} onChange={(e) => setTitle(e.target.value)} placeholder={chosen?.title} aria-invalid={!!err?.fields.title} />
          </Field>
          <Field label="Number" htmlFor="nc-number" error={err?.fields.number} hint="The next free number in this project is suggested.">
            <TextInput id="nc-number" value={number} onChange={(e) => setNumber(e.target.value)} className="mono" aria-invalid={!!err?.fields.number} />
          </Field>
          <Button type="submit" variant="primary" disabled={!typeId || m.isPending || !!blocked} className="w-full">
            {m.isPending ? "Creating…" : "Create calculation"}
          </Button>
        </div>
      </div>
    </form>
  );
}
