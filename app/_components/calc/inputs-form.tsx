"use client";
/**
 * The inputs of a calculation, generated from its type's fields: grouped under their headings in
 * display order, hidden while their `when` condition does not hold. Engineering fields take what
 * an engineer types ("4k7", "2.2u", "10 kHz") and show what it parsed to right beside it, or the
 * parse message; server field errors (422 `fields`) show at the field they name.
 */
import { Controller, useWatch, type UseFormReturn } from "react-hook-form";
import type { FieldSpec, QuantityField, RawPart } from "@/lib/calc/core/types";
import { isFieldVisible } from "@/lib/calc/core/inputs";
import { formatQuantity, parseQuantity } from "@/lib/calc/core/units";
import { cx } from "../ui";
import { PartPicker } from "./part-picker";

export type FormValues = Record<string, unknown>;

/** Groups of fields in display order (a field without a group goes under "Inputs"). */
export function groupFields(fields: FieldSpec[]): Array<{ group: string; fields: FieldSpec[] }> {
  const out: Array<{ group: string; fields: FieldSpec[] }> = [];
  for (const f of fields) {
    const g = f.group ?? "Inputs";
    let entry = out.find((x) => x.group === g);
    if (!entry) out.push((entry = { group: g, fields: [] }));
    entry.fields.push(f);
  }
  return out;
}

/** What a quantity field's text parses to: the formatted SI value, or the parse message. */
export function quantityPreview(field: Pick<QuantityField, "unit" | "scale">, raw: unknown): { ok: true; text: string } | { ok: false; message: string } | null {
  if (typeof raw === "number") return Number.isFinite(raw) ? { ok: true, text: formatQuantity(raw, field.unit, { scale: field.scale }) } : { ok: false, message: "must be a finite number" };
  if (raw === undefined || raw === null || (typeof raw === "string" && raw.trim() === "")) return { ok: false, message: "No value entered" };
  if (typeof raw !== "string") return null;
  const r = parseQuantity(raw, { unit: field.unit, scale: field.scale });
  return r.ok ? { ok: true, text: formatQuantity(r.value, field.unit, { scale: field.scale, digits: 6 }) } : { ok: false, message: r.message };
}

/** A whole number in range, or a message. */
function integerProblem(field: FieldSpec & { kind: "integer" }, raw: unknown): string | null {
  const n = typeof raw === "number" ? raw : typeof raw === "string" && raw.trim() !== "" ? Number(raw.trim()) : NaN;
  if (!Number.isInteger(n)) return `must be a whole number between ${field.min.toLocaleString("en-GB")} and ${field.max.toLocaleString("en-GB")}`;
  if (n < field.min || n > field.max) return `must be between ${field.min.toLocaleString("en-GB")} and ${field.max.toLocaleString("en-GB")}`;
  return null;
}

const inputClass =
  "h-8 w-full rounded border border-rule-strong bg-white/85 px-2 text-[13.5px] text-ink placeholder:text-ink-3/80 focus:border-copper focus:outline-none focus:ring-2 focus:ring-copper/20 aria-[invalid=true]:border-fail disabled:border-transparent disabled:bg-transparent disabled:text-ink disabled:opacity-100";

function Label({ htmlFor, field }: { htmlFor: string; field: FieldSpec }) {
  return (
    <label htmlFor={htmlFor} className="block pt-1.5 text-[13px] leading-snug text-ink">
      {field.label}
      {field.symbol ? <span className="ml-1.5 mono text-[12px] text-ink-3">{field.symbol}</span> : null}
    </label>
  );
}

/** The inputs column of the sheet. */
export function InputsForm({
  form,
  fields,
  serverErrors,
  readOnly,
  slug,
  idPrefix = "in",
  onScreenParts,
}: {
  form: UseFormReturn<FormValues>;
  fields: FieldSpec[];
  /** Field errors of the last compute or save (keys as the server names them: "gain", "opamp.gbw"). */
  serverErrors: Record<string, string>;
  readOnly: boolean;
  slug: string;
  idPrefix?: string;
  onScreenParts?: () => void;
}) {
  const values = useWatch({ control: form.control }) as FormValues;
  const groups = groupFields(fields);
  return (
    <fieldset disabled={readOnly} className="min-w-0 space-y-5">
      <legend className="sr-only">Inputs</legend>
      {groups.map(({ group, fields: gf }) => {
        const visible = gf.filter((f) => isFieldVisible(f, values));
        if (!visible.length) return null;
        return (
          <section key={group} aria-label={group}>
            <h3 className="mb-1 border-b border-rule-strong pb-1 text-[11.5px] font-semibold uppercase tracking-[0.08em] text-ink-2">{group}</h3>
            <div>
              {visible.map((f) => (
                <FieldRow key={f.key} form={form} field={f} value={values[f.key]} serverError={serverErrors[f.key]} serverErrors={serverErrors} readOnly={readOnly} slug={slug} id={`${idPrefix}-${f.key}`} onScreenParts={onScreenParts} />
              ))}
            </div>
          </section>
        );
      })}
    </fieldset>
  );
}

function FieldRow({
  form,
  field,
  value,
  serverError,
  serverErrors,
  readOnly,
  slug,
  id,
  onScreenParts,
}: {
  form: UseFormReturn<FormValues>;
  field: FieldSpec;
  value: unknown;
  serverError?: string;
  serverErrors: Record<string, string>;
  readOnly: boolean;
  slug: string;
  id: string;
  onScreenParts?: () => void;
}) {
  const row = "grid grid-cols-[minmax(0,1fr)_10rem] gap-x-3 border-b border-rule/70 py-1";
  const helpId = field.help ? `${id}-help` : undefined;
  const msgId = `${id}-msg`;
  switch (field.kind) {
    case "quantity": {
      const preview = quantityPreview(field, value);
      const problem = preview && !preview.ok ? preview.message : serverError;
      return (
        <div className={row} data-field={field.key}>
          <div className="min-w-0">
            <Label htmlFor={id} field={field} />
            {field.help ? <p id={helpId} className="text-[12px] leading-snug text-ink-3">{field.help}</p> : null}
          </div>
          <div className="min-w-0">
            <input
              id={id}
              type="text"
              inputMode="text"
              autoComplete="off"
              spellCheck={false}
              placeholder={field.placeholder}
              className={cx(inputClass, "mono text-right")}
              aria-invalid={!!problem}
              aria-describedby={[msgId, helpId].filter(Boolean).join(" ")}
              {...form.register(field.key)}
            />
            <p id={msgId} className={cx("mt-0.5 min-h-[16px] text-right text-[12px] leading-tight", problem ? "text-fail" : "mono text-ink-3")} role={problem ? "alert" : undefined} data-testid={`parsed-${field.key}`}>
              {problem ? problem : preview?.ok ? `= ${preview.text}` : ""}
            </p>
          </div>
        </div>
      );
    }
    case "integer": {
      const problem = integerProblem(field, value) ?? serverError;
      return (
        <div className={row} data-field={field.key}>
          <div className="min-w-0">
            <Label htmlFor={id} field={field} />
            {field.help ? <p id={helpId} className="text-[12px] leading-snug text-ink-3">{field.help}</p> : null}
          </div>
          <div>
            <input
              id={id}
              type="text"
              inputMode="numeric"
              autoComplete="off"
              className={cx(inputClass, "mono text-right")}
              aria-invalid={!!problem}
              aria-describedby={msgId}
              {...form.register(field.key, { setValueAs: (v: unknown) => (typeof v === "string" && /^\s*-?\d+\s*$/.test(v) ? Number(v) : v) })}
            />
            <p id={msgId} className={cx("mt-0.5 min-h-[16px] text-right text-[12px] leading-tight", problem ? "text-fail" : "text-ink-3")} role={problem ? "alert" : undefined}>
              {problem ?? `${field.min.toLocaleString("en-GB")} … ${field.max.toLocaleString("en-GB")}`}
            </p>
          </div>
        </div>
      );
    }
    case "select": {
      return (
        <div className="grid grid-cols-[minmax(0,1fr)_minmax(10rem,13.5rem)] gap-x-3 border-b border-rule/70 py-1" data-field={field.key}>
          <div className="min-w-0">
            <Label htmlFor={id} field={field} />
            {field.help ? <p id={helpId} className="text-[12px] leading-snug text-ink-3">{field.help}</p> : null}
          </div>
          <div>
            <select
              id={id}
              className={cx(inputClass, "pr-6 disabled:appearance-none")}
              aria-invalid={!!serverError}
              aria-describedby={msgId}
              {...form.register(field.key, { setValueAs: (v: unknown) => field.options.find((o) => String(o.value) === String(v))?.value ?? v })}
            >
              {field.options.map((o) => (
                <option key={String(o.value)} value={String(o.value)}>
                  {o.label}
                </option>
              ))}
            </select>
            <p id={msgId} className="mt-0.5 min-h-[6px] text-right text-[12px] leading-tight text-fail" role={serverError ? "alert" : undefined}>
              {serverError ?? ""}
            </p>
          </div>
        </div>
      );
    }
    case "boolean": {
      return (
        <div className="border-b border-rule/70 py-1.5" data-field={field.key}>
          <label htmlFor={id} className="flex items-start gap-2 text-[13px]">
            <input id={id} type="checkbox" className="mt-0.5 accent-copper" {...form.register(field.key)} />
            <span>
              {field.label}
              {field.symbol ? <span className="ml-1.5 mono text-[12px] text-ink-3">{field.symbol}</span> : null}
              {field.help ? <span className="block text-[12px] text-ink-3">{field.help}</span> : null}
            </span>
          </label>
          {serverError ? (
            <p role="alert" className="text-[12px] text-fail">
              {serverError}
            </p>
          ) : null}
        </div>
      );
    }
    case "part": {
      return (
        <div className="border-b border-rule/70 py-1.5" data-field={field.key}>
          <Controller
            control={form.control}
            name={field.key}
            render={({ field: c }) => (
              <PartPicker
                id={id}
                field={field}
                value={c.value as RawPart | undefined}
                onChange={(v) => c.onChange(v)}
                readOnly={readOnly}
                errors={serverErrors}
                slug={slug}
                onScreenParts={onScreenParts}
              />
            )}
          />
        </div>
      );
    }
  }
}
