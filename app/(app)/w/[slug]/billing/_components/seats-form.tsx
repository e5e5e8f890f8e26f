"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button, Field, Notice, Panel, TextInput } from "@/app/_components/ui";
import { api, ApiError } from "@/lib/api-client";

/** "Add seats": set the number of paid seats of the running subscription. */
export function SeatsForm({ slug, paid, used }: { slug: string; paid: number; used: number }) {
  const router = useRouter();
  const [seats, setSeats] = useState(String(paid));
  const [error, setError] = useState<{ message: string; field?: string }>();
  const [done, setDone] = useState<string>();
  const [busy, setBusy] = useState(false);

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setBusy(true);
    setError(undefined);
    setDone(undefined);
    try {
      const r = await api<{ seatsPaid: number }>(`/api/w/${slug}/billing/seats`, { body: { seats: seats.trim() === "" ? null : Number(seats) } });
      setDone(`The subscription now has ${r.seatsPaid} paid seat${r.seatsPaid === 1 ? "" : "s"}. Stripe prorates the difference on the next invoice.`);
      router.refresh();
    } catch (err) {
      setError(err instanceof ApiError ? { message: err.message, field: err.fields.seats } : { message: "The seats could not be changed." });
    } finally {
      setBusy(false);
    }
  }

  return (
    <Panel title="Add seats">
      <form id="seats" onSubmit={submit} className="space-y-4" noValidate aria-label="Add seats">
        {error ? <Notice tone="error">{error.message}</Notice> : null}
        {done ? <Notice tone="info">{done}</Notice> : null}
        <Field label="Paid seats" htmlFor="paid-seats" error={error?.field} hint={`${used} in use now; the subscription needs at least that many.`}>
          <TextInput id="paid-seats" type="number" inputMode="numeric" min={1} step={1} value={seats} onChange={(e) => setSeats(e.target.value)} aria-invalid={!!error?.field} />
        </Field>
        <Button type="submit" variant="primary" disabled={busy}>
          Update seats
        </Button>
      </form>
    </Panel>
  );
}
