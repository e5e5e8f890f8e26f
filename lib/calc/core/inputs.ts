/**
 * From raw form values (as typed, stored on the draft) to the numeric input a compute takes, and
 * back to rows for the report's inputs table.
 */
import type { z } from "zod";
import type { CalcType, FieldError, FieldSpec, RawInputs, RawPart } from "./types";
import { OPAMP_FIELDS, REFERENCE_FIELDS } from "./parts";
import { formatQuantity, parseQuantity } from "./units";

/** Outcome of {@link parseRawInputs}. */
export type ParsedInputs<T> = { ok: true; input: T } | { ok: false; errors: FieldError[] };

/** True when the field is shown for these raw values (its `when` condition holds). */
export function isFieldVisible(field: FieldSpec, values: Record<string, unknown>): boolean {
  if (!field.when) return true;
  const v = values[field.when.key];
  return field.when.in.some((x) => String(x) === String(v));
}

function isRawPart(v: unknown): v is RawPart {
  return typeof v === "object" && v !== null && "values" in v && typeof (v as RawPart).values === "object";
}

function partFieldList(kind: "opamp" | "reference") {
  return kind === "opamp" ? OPAMP_FIELDS : REFERENCE_FIELDS;
}

function parsePart(field: FieldSpec & { kind: "part" }, raw: unknown, errors: FieldError[]): Record<string, unknown> | undefined {
  if (!isRawPart(raw)) {
    errors.push({ field: field.key, message: `${field.label}: choose a part from the library or enter its parameters` });
    return undefined;
  }
  const out: Record<string, unknown> = { name: raw.name };
  for (const pf of partFieldList(field.partKind)) {
    const v = raw.values[pf.key];
    const path = `${field.key}.${pf.key}`;
    if (typeof v === "number") {
      if (!Number.isFinite(v)) errors.push({ field: path, message: `${pf.label} must be a finite number` });
      else out[pf.key] = v;
    } else if (typeof v === "string") {
      const r = parseQuantity(v, { unit: pf.unit, scale: pf.scale });
      if (r.ok) out[pf.key] = r.value;
      else errors.push({ field: path, message: `${pf.label}: ${r.message}` });
    } else {
      errors.push({ field: path, message: `${pf.label} is required` });
    }
  }
  if (field.partKind === "reference") out.topology = raw.values.topology;
  return out;
}

/**
 * Convert raw form values into the input of `type` and validate it with the type's schema.
 *
 * Quantity fields are parsed with {@link parseQuantity} using the field's unit and scale (a
 * finite number is taken as already in SI units); hidden fields (whose `when` does not hold) are
 * left out; part fields are parsed parameter by parameter with OPAMP_FIELDS / REFERENCE_FIELDS.
 * Every problem becomes a FieldError naming the input key ("gain") or the part parameter
 * ("opamp.gbw") and the rule.
 *
 * @param type the calculation type
 * @param raw the raw values as typed
 * @returns `{ ok: true, input }` (SI base units) or `{ ok: false, errors }`
 */
export function parseRawInputs<S extends z.ZodType>(type: CalcType<S>, raw: RawInputs): ParsedInputs<z.output<S>> {
  const errors: FieldError[] = [];
  const input: Record<string, unknown> = {};
  for (const field of type.fields) {
    if (!isFieldVisible(field, raw)) continue;
    const v = raw[field.key];
    switch (field.kind) {
      case "quantity": {
        if (typeof v === "number") {
          if (Number.isFinite(v)) input[field.key] = v;
          else errors.push({ field: field.key, message: `${field.label} must be a finite number` });
        } else if (typeof v === "string") {
          const r = parseQuantity(v, { unit: field.unit, scale: field.scale });
          if (r.ok) input[field.key] = r.value;
          else errors.push({ field: field.key, message: `${field.label}: ${r.message}` });
        } else {
          errors.push({ field: field.key, message: `${field.label} is required` });
        }
        break;
      }
      case "integer": {
        const n = typeof v === "number" ? v : typeof v === "string" && v.trim() !== "" ? Number(v.trim()) : NaN;
        if (!Number.isInteger(n)) errors.push({ field: field.key, message: `${field.label} must be a whole number between ${field.min} and ${field.max}` });
        else input[field.key] = n;
        break;
      }
      case "select": {
        const opt = field.options.find((o) => String(o.value) === String(v));
        if (!opt) errors.push({ field: field.key, message: `${field.label} must be one of: ${field.options.map((o) => o.label).join(", ")}` });
        else input[field.key] = opt.value;
        break;
      }
      case "boolean": {
        if (typeof v === "boolean") input[field.key] = v;
        else if (v === "true" || v === "false") input[field.key] = v === "true";
        else if (v === undefined) input[field.key] = false;
        else errors.push({ field: field.key, message: `${field.label} must be yes or no` });
        break;
      }
      case "part": {
        const p = parsePart(field, v, errors);
        if (p) input[field.key] = p;
        break;
      }
    }
  }
  if (errors.length > 0) return { ok: false, errors };
  const parsed = type.schema.safeParse(input);
  if (!parsed.success) return { ok: false, errors: zodErrors(parsed.error) };
  return { ok: true, input: parsed.data as z.output<S> };
}

/** Map zod issues to field errors: the path joined with "." names the field. */
export function zodErrors(error: z.ZodError): FieldError[] {
  return error.issues.map((issue) => ({
    field: issue.path.map(String).join(".") || "(input)",
    message: issue.message,
  }));
}

/** One row of the report's inputs table. */
export interface InputRow {
  /** Input key, or "part.param" for a part parameter. */
  key: string;
  symbol: string;
  label: string;
  /** Formatted value with unit, e.g. "4.7 kΩ", or an option label. */
  display: string;
  unit: string;
  /** "entered", "part library: NAME" or "override: NOTE". */
  source: string;
}

/**
 * Rows for the inputs table of a report: every visible field, and for a part field one row for the
 * part and one per parameter.
 * @param type the calculation type
 * @param input the parsed input (SI base units)
 * @param raw the raw values, to tell library values from overrides (optional)
 */
export function describeInputs<S extends z.ZodType>(type: CalcType<S>, input: z.output<S>, raw?: RawInputs): InputRow[] {
  const rows: InputRow[] = [];
  const values = input as Record<string, unknown>;
  for (const field of type.fields) {
    if (!isFieldVisible(field, values)) continue;
    const v = values[field.key];
    if (v === undefined) continue;
    const base = { key: field.key, symbol: field.symbol, label: field.label };
    switch (field.kind) {
      case "quantity":
        rows.push({ ...base, display: formatQuantity(Number(v), field.unit, { scale: field.scale }), unit: field.unit, source: "entered" });
        break;
      case "integer":
        rows.push({ ...base, display: String(v), unit: "", source: "entered" });
        break;
      case "select":
        rows.push({ ...base, display: field.options.find((o) => o.value === v)?.label ?? String(v), unit: "", source: "entered" });
        break;
      case "boolean":
        rows.push({ ...base, display: v ? "yes" : "no", unit: "", source: "entered" });
        break;
      case "part": {
        const part = v as Record<string, unknown>;
        const rawPart = raw && isRawPart(raw[field.key]) ? (raw[field.key] as RawPart) : undefined;
        const name = String(part.name);
        const fromLibrary = rawPart?.partId !== undefined;
        const libSource = fromLibrary ? `part library: ${name}` : "entered";
        rows.push({ ...base, display: name, unit: "", source: libSource });
        if (field.partKind === "reference" && part.topology !== undefined) {
          rows.push({ key: `${field.key}.topology`, symbol: "", label: "Topology", display: String(part.topology), unit: "", source: libSource });
        }
        for (const pf of partFieldList(field.partKind)) {
          const pv = part[pf.key];
          if (typeof pv !== "number") continue;
          const note = rawPart?.overrides?.[pf.key]?.note;
          rows.push({
            key: `${field.key}.${pf.key}`,
            symbol: pf.symbol,
            label: pf.label,
            display: formatQuantity(pv, pf.unit, { scale: pf.scale }),
            unit: pf.unit,
            source: note !== undefined ? `override: ${note}` : libSource,
          });
        }
        break;
      }
    }
  }
  return rows;
}
