"use client";

import { useState } from "react";
import { Button, Field, Notice, Panel, TextInput } from "@/app/_components/ui";
import { api, ApiError } from "@/lib/api-client";
import type { PackId } from "@/lib/calc/core/types";
import { formatMoney, monthlyTotal, PACK_IDS, planById, plansForPacks } from "@/lib/billing/plans";

/** Pick packs (all three = the bundle) and seats, then go to Stripe's hosted payment page. */
export function CheckoutForm({ slug, minSeats, resubscribe }: { slug: string; minSeats: number; resubscribe: boolean }) {
  const [packs, setPacks] = useState<Set<PackId>>(new Set());
  const [seats, setSeats] = useState(String(minSeats));
  const [error, setError] = useState<{ message: string; fields: Record<string, string> }>();
  const [busy, setBusy] = useState(false);

  const chosen = PACK_IDS.filter((p) => packs.has(p));
  const seatCount = Number(seats);
  const seatsValid = Number.isInteger(seatCount) && seatCount >= 1;
  const bundle = planById("bundle");
  const isBundle = chosen.length === PACK_IDS.length;
  const separate = PACK_IDS.reduce((s, p) => s + planById(p).unitAmount, 0);

  const toggle = (p: PackId) =>
    setPacks((prev) => {
      const next = new Set(prev);
      if (next.has(p)) next.delete(p);
      else next.add(p);
      return next;
    });

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setBusy(true);
    setError(undefined);
    try {
      const r = await api<{ url: string }>(`/api/w/${slug}/billing/checkout`, { body: { packs: chosen, seats: seats.trim() === "" ? null : Number(seats) } });
      window.location.assign(r.url);
    } catch (err) {
      setError(err instanceof ApiError ? { message: err.message, fields: err.fields } : { message: "The checkout page could not be opened.", fields: {} });
      setBusy(false);
    }
  }

  return (
    <Panel title={resubscribe ? "Subscribe again" : "Subscribe"}>
      <form onSubmit={submit} className="space-y-4" noValidate aria-label="Subscribe">
        {error ? <Notice tone="error">{error.message}</Notice> : null}
        <fieldset className="space-y-2">
          <legend className="mb-1 text-[13px] font-medium text-ink-2">Packs</legend>
          {PACK_IDS.map((p) => {
            const plan = planById(p);
            return (
              <label key={p} className="flex items-start gap-2.5 rounded-md border border-rule px-3 py-2 hover:border-rule-strong">
                <input type="checkbox" className="mt-1 accent-copper" checked={packs.has(p)} onChange={() => toggle(p)} name="packs" value={p} />
                <span className="min-w-0 flex-1">
                  <span className="flex items-baseline justify-between gap-2">
                    <span className="font-medium">{plan.title}</span>
                    <span className="mono text-[13px] text-ink-2">{formatMoney(plan.unitAmount)} / seat</span>
                  </span>
                  <span className="block text-[12.5px] text-ink-3">{plan.summary}</span>
                </span>
              </label>
            );
          })}
          <button
            type="button"
            className="text-[13px] font-medium text-copper underline-offset-2 hover:underline"
            onClick={() => setPacks(new Set(isBundle ? [] : PACK_IDS))}
          >
            {isBundle ? "Clear the packs" : `Choose all three (bundle, ${formatMoney(bundle.unitAmount)} / seat)`}
          </button>
          {error?.fields.packs ? (
            <p role="alert" className="text-[12.5px] text-fail">
              {error.fields.packs}
            </p>
          ) : null}
        </fieldset>
        <Field label="Seats" htmlFor="checkout-seats" error={error?.fields.seats} hint={`At least ${minSeats}: one for each owner, engineer and checker. Clients are free.`}>
          <TextInput id="checkout-seats" type="number" inputMode="numeric" min={1} step={1} value={seats} onChange={(e) => setSeats(e.target.value)} aria-invalid={!!error?.fields.seats} />
        </Field>
        <div className="rounded-md border border-rule bg-white/60 px-3 py-2 text-[13.5px]">
          <div className="flex items-baseline justify-between">
            <span className="text-ink-2">Total per month</span>
            <span className="mono text-[15px] font-medium" data-testid="checkout-total">
              {chosen.length > 0 && seatsValid ? formatMoney(monthlyTotal(chosen, seatCount)) : "—"}
            </span>
          </div>
          {chosen.length > 0 && seatsValid ? (
            <p className="mt-0.5 text-[12.5px] text-ink-3">
              {plansForPacks(chosen)
                .map((p) => `${p.title} ${formatMoney(p.unitAmount)} × ${seatCount}`)
                .join(" + ")}
              {isBundle ? `, instead of ${formatMoney(separate)} per seat for the three apart` : ""}
            </p>
          ) : null}
        </div>
        <Button type="submit" variant="primary" disabled={busy}>
          Continue to payment
        </Button>
        <p className="text-[12.5px] text-ink-3">Payment happens on Stripe&apos;s page; you come back here afterwards.</p>
      </form>
    </Panel>
  );
}
