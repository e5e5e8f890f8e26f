"use client";
/**
 * The part of a calculation: picked from the workspace library (its whole parameter set is
 * snapshotted into the inputs), each parameter overridable with a note saying why. Overrides are
 * kept in RawPart.overrides and shown as such here and in the report.
 */
import { Fragment, useMemo, useState } from "react";
import { useQuery } from "@tanstack/react-query";
import type { PartField, RawPart } from "@/lib/calc/core/types";
import { OPAMP_FIELDS, REFERENCE_FIELDS } from "@/lib/calc/core/parts";
import { formatQuantity, parseQuantity } from "@/lib/calc/core/units";
import { api } from "@/lib/api-client";
import { Button, Tag, cx } from "../ui";
import type { LibraryPart } from "./types";

/** The library parts of one kind, cached per workspace (the picker and the screening share it). */
export function useLibrary(slug: string, kind: "opamp" | "reference") {
  return useQuery({
    queryKey: ["parts", slug, kind],
    queryFn: ({ signal }) => api<{ parts: LibraryPart[] }>(`/api/w/${slug}/parts?kind=${kind}`, { signal }).then((r) => r.parts),
    staleTime: 60_000,
    retry: false,
  });
}

/** The RawPart a library part becomes on a calculation: its full parameter set, no overrides. */
export function partFromLibrary(p: LibraryPart): RawPart {
  return { partId: p.id, name: p.name, values: { ...p.values } };
}

const TOPOLOGIES = [
  { value: "shunt", label: "Shunt (two-terminal)" },
  { value: "series", label: "Series (three-terminal)" },
  { value: "adjustable", label: "Adjustable shunt" },
];

const cellInput =
  "h-7 w-full rounded border border-rule-strong bg-white/85 px-1.5 text-right mono text-[12.5px] focus:border-copper focus:outline-none focus:ring-2 focus:ring-copper/20 aria-[invalid=true]:border-fail disabled:border-transparent disabled:bg-transparent";

export function PartPicker({
  id,
  field,
  value,
  onChange,
  readOnly,
  errors,
  slug,
  onScreenParts,
}: {
  id: string;
  field: PartField;
  value: RawPart | undefined;
  onChange: (v: RawPart) => void;
  readOnly: boolean;
  errors: Record<string, string>;
  slug: string;
  onScreenParts?: () => void;
}) {
  const lib = useLibrary(slug, field.partKind);
  const params = field.partKind === "opamp" ? OPAMP_FIELDS : REFERENCE_FIELDS;
  // The parameter set as first loaded: what "library value" means for a part without a library id.
  const [snapshot] = useState<RawPart | undefined>(value);
  const libPart = value?.partId ? lib.data?.find((p) => p.id === value.partId) : undefined;
  const overrides = value?.overrides ?? {};
  const overrideCount = Object.keys(overrides).length;
  const partErrors = Object.keys(errors).filter((k) => k === field.key || k.startsWith(`${field.key}.`));

  /** The library (or first-loaded) value of a parameter, before any override. */
  const baseValue = (key: string): string | number | undefined => {
    if (libPart) return libPart.values[key];
    const snap = snapshot;
    if (snap && snap.name === value?.name && !snap.overrides?.[key]) return snap.values[key];
    return undefined;
  };

  const fmt = (v: string | number | undefined, unit: string, scale?: "percent" | "ppm") => (typeof v === "number" ? formatQuantity(v, unit, { scale, digits: 6 }) : (v ?? ""));

  const setParam = (key: string, text: string, unit: string, scale?: "percent" | "ppm") => {
    if (!value) return;
    const base = baseValue(key);
    const values = { ...value.values };
    const nextOverrides = { ...overrides };
    if (base !== undefined && text.trim() === fmt(base, unit, scale)) {
      values[key] = base;
      delete nextOverrides[key];
    } else {
      values[key] = text;
      nextOverrides[key] = { note: overrides[key]?.note ?? "" };
    }
    onChange({ ...value, values, overrides: Object.keys(nextOverrides).length ? nextOverrides : undefined });
  };

  const revert = (key: string) => {
    if (!value) return;
    const base = baseValue(key);
    if (base === undefined) return;
    const nextOverrides = { ...overrides };
    delete nextOverrides[key];
    onChange({ ...value, values: { ...value.values, [key]: base }, overrides: Object.keys(nextOverrides).length ? nextOverrides : undefined });
  };

  const setNote = (key: string, note: string) => {
    if (!value) return;
    onChange({ ...value, overrides: { ...overrides, [key]: { note } } });
  };

  const options = useMemo(() => lib.data ?? [], [lib.data]);
  const inLibrary = !!libPart;

  return (
    <div>
      <div className="flex items-baseline justify-between gap-2">
        <label htmlFor={id} className="text-[13px]">
          {field.label}
          {field.symbol ? <span className="ml-1.5 mono text-[12px] text-ink-3">{field.symbol}</span> : null}
        </label>
        {onScreenParts && !readOnly ? (
          <Button type="button" size="sm" variant="quiet" onClick={onScreenParts}>
            Screen library parts
          </Button>
        ) : null}
      </div>
      <select
        id={id}
        className="mt-1 h-8 w-full rounded border border-rule-strong bg-white/85 px-2 text-[13.5px] focus:border-copper focus:outline-none focus:ring-2 focus:ring-copper/20 disabled:border-rule disabled:bg-transparent"
        value={inLibrary ? value!.partId : "__current"}
        onChange={(e) => {
          const p = options.find((o) => o.id === e.target.value);
          if (p) onChange(partFromLibrary(p));
        }}
        aria-describedby={`${id}-source`}
      >
        {!inLibrary ? <option value="__current">{value ? value.name : "Choose a part"}</option> : null}
        {options.map((p) => (
          <option key={p.id} value={p.id}>
            {p.name}
          </option>
        ))}
      </select>
      <p id={`${id}-source`} className="mt-0.5 text-[12px] text-ink-3">
        {lib.isError
          ? "The parts library could not be loaded; the parameters below stay as they are."
          : inLibrary
            ? `From the parts library${overrideCount ? `, ${overrideCount} parameter${overrideCount === 1 ? "" : "s"} overridden` : ""}.`
            : value
              ? `Snapshot kept with this calculation${value.partId ? " (no longer in the library)" : ""}${overrideCount ? `, ${overrideCount} overridden` : ""}.`
              : "No part chosen yet."}
      </p>
      {errors[field.key] ? (
        <p role="alert" className="text-[12px] text-fail">
          {errors[field.key]}
        </p>
      ) : null}
      {value ? (
        <details className="group mt-1.5" open={overrideCount > 0 || partErrors.length > 0 ? true : undefined}>
          <summary className="cursor-pointer select-none text-[12.5px] font-medium text-ink-2 hover:text-ink">
            Parameters of {value.name}
            <span className="ml-1 font-normal text-ink-3">({params.length + (field.partKind === "reference" ? 1 : 0)})</span>
          </summary>
          <table className="mt-1 w-full border-collapse text-[12.5px]" aria-label={`Parameters of ${value.name}`}>
            <tbody>
              {field.partKind === "reference" ? (
                <tr className="border-b border-rule/70">
                  <td className="py-1 pr-2">
                    <label htmlFor={`${id}-topology`}>Topology</label>
                  </td>
                  <td className="w-[9.5rem] py-1">
                    <select
                      id={`${id}-topology`}
                      className={cx(cellInput, "text-left")}
                      value={String(value.values.topology ?? "")}
                      onChange={(e) => onChange({ ...value, values: { ...value.values, topology: e.target.value } })}
                    >
                      {TOPOLOGIES.map((t) => (
                        <option key={t.value} value={t.value}>
                          {t.label}
                        </option>
                      ))}
                    </select>
                  </td>
                </tr>
              ) : null}
              {params.map((pf) => {
                const v = value.values[pf.key];
                const overridden = !!overrides[pf.key];
                const path = `${field.key}.${pf.key}`;
                const parsed = typeof v === "string" ? parseQuantity(v, { unit: pf.unit, scale: pf.scale }) : null;
                const problem = parsed && !parsed.ok ? `${pf.label}: ${parsed.message}` : errors[path];
                const inputId = `${id}-${pf.key}`;
                return (
                  <Fragment key={pf.key}>
                  <tr className={cx("align-top", !problem && "border-b border-rule/70", overridden && "bg-copper-wash/40")} data-param={pf.key}>
                    <td className="py-1 pr-2">
                      <label htmlFor={inputId} className="block leading-snug">
                        {pf.label}
                        <span className="ml-1 mono text-[11.5px] text-ink-3">{pf.symbol}</span>
                      </label>
                      {overridden ? (
                        <div className="mt-0.5 flex items-center gap-1.5">
                          <Tag>overridden</Tag>
                          {baseValue(pf.key) !== undefined ? (
                            <button type="button" className="text-[11.5px] text-copper hover:underline disabled:hidden" onClick={() => revert(pf.key)}>
                              back to {fmt(baseValue(pf.key), pf.unit, pf.scale)}
                            </button>
                          ) : null}
                        </div>
                      ) : null}
                    </td>
                    <td className="w-[9.5rem] py-1">
                      <input
                        id={inputId}
                        type="text"
                        autoComplete="off"
                        spellCheck={false}
                        className={cellInput}
                        value={fmt(v, pf.unit, pf.scale)}
                        onChange={(e) => setParam(pf.key, e.target.value, pf.unit, pf.scale)}
                        aria-invalid={!!problem}
                        aria-describedby={problem ? `${inputId}-err` : undefined}
                      />
                      {parsed?.ok ? <div className="mt-0.5 text-right mono text-[11.5px] text-ink-3">= {formatQuantity(parsed.value, pf.unit, { scale: pf.scale, digits: 6 })}</div> : null}
                      {overridden ? (
                        <input
                          type="text"
                          aria-label={`Why ${pf.label} is overridden`}
                          placeholder="Why? (shown in the report)"
                          className="mt-1 h-7 w-full rounded border border-rule-strong bg-white/85 px-1.5 text-[12px] focus:border-copper focus:outline-none"
                          value={overrides[pf.key]?.note ?? ""}
                          onChange={(e) => setNote(pf.key, e.target.value)}
                        />
                      ) : null}
                    </td>
                  </tr>
                  {problem ? (
                    <tr className="border-b border-rule/70">
                      <td colSpan={2} id={`${inputId}-err`} role="alert" className="pb-1 text-[12px] text-fail">
                        {problem}
                      </td>
                    </tr>
                  ) : null}
                  </Fragment>
                );
              })}
            </tbody>
          </table>
        </details>
      ) : null}
    </div>
  );
}
