"use client";
/**
 * The two ways to verify: type the code printed on the report (a plain GET form, so it works
 * without scripts and from the QR code's link), or upload the PDF, which is hashed on the server
 * and compared with the stored hashes of issued reports.
 */
import { useState } from "react";
import type { VerifyResult } from "@/lib/reports/verify";
import { ApiError } from "@/lib/api-client";
import { Button, Field, Notice, TextInput } from "@/app/_components/ui";
import { ResultCard } from "./result-card";

/** Largest upload, bytes (the server checks it again). */
const MAX_BYTES = 20 * 1024 * 1024;

export function CodeForm({ initial }: { initial: string }) {
  return (
    <form method="get" action="/verify" className="flex flex-wrap items-end gap-2" noValidate>
      <Field label="Verification code" htmlFor="verify-code" hint="Printed on every page of the report, e.g. LW-7K3Q-9XPA." className="min-w-[240px] flex-1">
        <TextInput id="verify-code" name="code" defaultValue={initial} placeholder="LW-XXXX-XXXX" autoComplete="off" spellCheck={false} className="mono uppercase" />
      </Field>
      <Button type="submit" variant="primary" className="mb-[22px]">
        Check code
      </Button>
    </form>
  );
}

export function UploadForm() {
  const [file, setFile] = useState<File | null>(null);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [result, setResult] = useState<VerifyResult | null>(null);

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setResult(null);
    setError(null);
    if (!file) return setError("Choose the PDF you received.");
    if (file.size > MAX_BYTES) return setError(`The file is ${(file.size / 1024 / 1024).toFixed(1)} MB; the verify page accepts PDFs up to 20 MB. An issued report is far smaller: check you chose the right file.`);
    setBusy(true);
    try {
      const form = new FormData();
      form.append("file", file);
      const res = await fetch("/api/verify", { method: "POST", body: form, credentials: "same-origin" });
      const data = (await res.json().catch(() => null)) as { result?: VerifyResult; error?: { message?: string } } | null;
      if (!res.ok || !data?.result) throw new ApiError(res.status, "error", data?.error?.message ?? `The server answered ${res.status}.`);
      setResult(data.result);
    } catch (err) {
      setError(err instanceof ApiError ? err.message : "The file could not be checked. Try again.");
    } finally {
      setBusy(false);
    }
  }

  return (
    <div className="space-y-3">
      <form onSubmit={(e) => void submit(e)} className="flex flex-wrap items-end gap-2" noValidate>
        <Field label="Report PDF" htmlFor="verify-file" hint="The file is compared byte for byte; it is not stored." className="min-w-[240px] flex-1">
          <input
            id="verify-file"
            type="file"
            accept="application/pdf,.pdf"
            onChange={(e) => setFile(e.target.files?.[0] ?? null)}
            className="block w-full text-[13.5px] file:mr-3 file:rounded-md file:border file:border-rule-strong file:bg-sheet file:px-3 file:py-1.5 file:text-sm file:text-ink hover:file:border-ink-3"
          />
        </Field>
        <Button type="submit" variant="primary" disabled={busy} className="mb-[22px]">
          {busy ? "Checking…" : "Check file"}
        </Button>
      </form>
      {error ? <Notice tone="error">{error}</Notice> : null}
      {result ? <ResultCard result={result} /> : null}
    </div>
  );
}
