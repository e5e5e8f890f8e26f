/**
 * The parameter fields of library parts and their validation, shared by the form (browser), the
 * API and the CSV import. Pure: no database, no React, so the form can echo what the server will
 * read ("10M" → 10 MHz) while the user types.
 *
 * Values are typed with engineering notation and parsed with `parseQuantity` from
 * lib/calc/core/units.ts into SI base units (fractions for the %/ppm fields); a value given as a
 * JSON number is taken as already in SI units (fraction for %/ppm), like the calculation inputs.
 * The parameter sets themselves are the zod schemas of lib/calc/core/parts.ts.
 */
import type { z } from "zod";
import { OPAMP_FIELDS, REFERENCE_FIELDS, opAmpParamsSchema, referenceParamsSchema } from "@/lib/calc/core/parts";
import { formatQuantity, parseQuantity } from "@/lib/calc/core/units";

export const PART_KINDS = ["opamp", "reference"] as const;
export type PartKind = (typeof PART_KINDS)[number];

/** Plural label of each kind, for headings and messages. */
export const KIND_LABELS: Record<PartKind, string> = { opamp: "op-amps", reference: "references" };

/** Reference topologies (the select field of reference parts). */
export const TOPOLOGIES = ["shunt", "series", "adjustable"] as const;
export type Topology = (typeof TOPOLOGIES)[number];

/** One numeric parameter of a part: key, label, SI unit (or % / ppm with `scale`). */
export interface ParamField {
  key: string;
  label: string;
  symbol: string;
  /** SI unit symbol ("Hz", "V/s", "V/√Hz", …), or "%", "ppm", "ppm/°C" for scaled fields. */
  unit: string;
  /** "percent" / "ppm": typed as a percentage / in ppm, stored as a fraction. */
  scale?: "percent" | "ppm";
}

/** Largest text accepted for one typed value (longer is not a number anyone types). */
export const MAX_VALUE_TEXT = 64;
/** Longest notes text of a part. */
export const MAX_NOTES = 2000;

/** The numeric parameter fields of a kind, in display order (from lib/calc/core/parts.ts). */
export function paramFields(kind: PartKind): ReadonlyArray<ParamField> {
  return kind === "opamp" ? OPAMP_FIELDS : REFERENCE_FIELDS;
}

/** The zod schema of a kind's full parameter set (name included). */
export function paramsSchema(kind: PartKind): z.ZodType<Record<string, unknown>> {
  return (kind === "opamp" ? opAmpParamsSchema : referenceParamsSchema) as unknown as z.ZodType<Record<string, unknown>>;
}

/** Characters that make a spreadsheet read a cell as a formula (common practice, no source:
 * the usual CSV-injection guidance lists = + - @ TAB and CR). */
export const FORMULA_START = /^[=+\-@\t\r]/;

/** Why a part name is refused when it starts like a spreadsheet formula, or undefined. */
export function formulaNameProblem(name: string): string | undefined {
  const t = name.trim();
  if (FORMULA_START.test(name) || FORMULA_START.test(t)) {
    const ch = JSON.stringify((FORMULA_START.test(name) ? name : t)[0]);
    return `name must not start with ${ch}: a spreadsheet would read a name starting with = + - @, a tab or a carriage return as a formula`;
  }
  return undefined;
}

/** Outcome of parsing one typed value. */
export type ValueResult = { ok: true; value: number } | { ok: false; message: string };

/**
 * Parse one parameter value: a finite JSON number is SI already; text is parsed with
 * parseQuantity for the field's unit and scale ("10M", "0.5 V/µs", "20 nV/√Hz", "0.1 %").
 * @param field the parameter
 * @param raw what was typed (string) or sent (number)
 * @returns SI value (fraction for %/ppm fields), or a message naming the field and the rule
 */
export function parseParamValue(field: ParamField, raw: unknown): ValueResult {
  const name = fieldName(field);
  if (typeof raw === "number") {
    return Number.isFinite(raw) ? { ok: true, value: raw } : { ok: false, message: `${name} must be a finite number` };
  }
  if (raw === undefined || raw === null || (typeof raw === "string" && raw.trim() === "")) return { ok: false, message: `${name} is required` };
  if (typeof raw !== "string") return { ok: false, message: `${name} must be a number or text such as "10M"` };
  if (raw.length > MAX_VALUE_TEXT) return { ok: false, message: `${name} is too long (at most ${MAX_VALUE_TEXT} characters)` };
  const t = raw.trim();
  if (/^[=@]/.test(t)) return { ok: false, message: `${name} looks like a spreadsheet formula (starts with "${t[0]}"); give the value itself, e.g. ${exampleFor(field)}` };
  const r = parseQuantity(t, { unit: field.unit, scale: field.scale });
  return r.ok ? r : { ok: false, message: `${name}: ${r.message} (got ${JSON.stringify(t)})` };
}

/** "vos (Input offset voltage, max)": the key as in the API and CSV, and the label. */
export function fieldName(field: Pick<ParamField, "key" | "label">): string {
  return `${field.key} (${field.label.replace(/\s*\(([^)]*)\)/g, ", $1")})`;
}

function exampleFor(field: ParamField): string {
  if (field.scale === "percent") return `"0.5 %"`;
  if (field.scale) return `"10 ppm"`;
  return `"${editText(field, 1000)}"`;
}

/** Outcome of validating a whole part. */
export type PartValidation =
  | { ok: true; name: string; params: Record<string, number | string> }
  | { ok: false; fields: Record<string, string> };

/**
 * Validate a part: name, every parameter of the kind (typed or SI), topology for references,
 * then the kind's zod schema (ranges and cross-checks such as supplyMax ≥ supplyMin).
 * Field errors are keyed by parameter key ("gbw", "name", "topology") and name the field and rule.
 * @returns the name and the parameter set in SI (without the name), or the field errors
 */
export function validatePart(kind: PartKind, input: { name: unknown; values: Record<string, unknown> }): PartValidation {
  const fields: Record<string, string> = {};
  const out: Record<string, unknown> = { name: typeof input.name === "string" ? input.name : input.name === undefined ? "" : input.name };
  if (typeof input.name === "string") {
    const problem = formulaNameProblem(input.name);
    if (problem) fields.name = problem;
  } else if (input.name !== undefined) {
    fields.name = "name must be text";
  }
  for (const f of paramFields(kind)) {
    const r = parseParamValue(f, input.values[f.key]);
    if (r.ok) out[f.key] = r.value;
    else fields[f.key] = r.message;
  }
  if (kind === "reference") {
    const t = input.values.topology;
    if (typeof t === "string" && (TOPOLOGIES as readonly string[]).includes(t.trim().toLowerCase())) out.topology = t.trim().toLowerCase();
    else fields.topology = t === undefined || t === "" ? "topology is required (shunt, series or adjustable)" : "topology must be shunt, series or adjustable";
  }
  const parsed = paramsSchema(kind).safeParse(out);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const key = issue.path.map(String).join(".") || "name";
      if (key in fields) continue;
      const f = paramFields(kind).find((x) => x.key === key);
      fields[key] = f ? `${fieldName(f)}: ${issue.message}` : issue.message;
    }
  }
  if (Object.keys(fields).length > 0 || !parsed.success) return { ok: false, fields };
  const { name, ...rest } = parsed.data as { name: string } & Record<string, number | string>;
  const params: Record<string, number | string> = {};
  // Keep a stable key order (the field order), so stored JSON and hashes are deterministic.
  if (kind === "reference") params.topology = rest.topology;
  for (const f of paramFields(kind)) params[f.key] = rest[f.key];
  return { ok: true, name, params };
}

/** Comparable form of a part name (trimmed, NFC, case-folded): names are unique per kind in it. */
export function nameKey(name: string): string {
  return name.normalize("NFC").trim().toLowerCase();
}

/** A value formatted for a table cell, with prefix and unit (4 significant figures). */
export function displayValue(field: ParamField, value: number | string | undefined): string {
  if (typeof value !== "number") return value === undefined ? "—" : String(value);
  return formatQuantity(value, field.unit, { scale: field.scale });
}

/**
 * A value as text for an edit field: full precision (15 significant figures) with prefix and
 * unit, so that saving an unchanged form gives back exactly the stored SI number.
 */
export function editText(field: ParamField, value: number | string | undefined): string {
  if (typeof value !== "number") return value === undefined ? "" : String(value);
  return formatQuantity(value, field.unit, { scale: field.scale, digits: 15 });
}
