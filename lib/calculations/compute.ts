/**
 * Running a calculation type on raw inputs, as the app does it: look the type up, parse the raw
 * values (field errors name the field), compute, and summarise the checks. Never throws for user
 * input; an engine exception (a bug) is reported as a failing result, not a 500.
 */
import { getCalcType } from "@/lib/calc/registry";
import { parseRawInputs } from "@/lib/calc/core/inputs";
import type { CalcOutput, CalcType, FieldError, RawInputs } from "@/lib/calc/core/types";
import { AppError } from "@/lib/errors";

export interface CheckSummary {
  pass: number;
  warning: number;
  fail: number;
}

export type ComputeResult =
  | { ok: true; type: CalcType; input: unknown; output: CalcOutput; summary: CheckSummary }
  | { ok: false; type: CalcType; errors: FieldError[] };

/** The calculation type, or 422 naming the typeId field. */
export function requireCalcType(typeId: string): CalcType {
  const t = getCalcType(typeId);
  if (!t) throw new AppError("invalid_input", `Unknown calculation type "${typeId}".`, { fields: { typeId: "is not a calculation type" } });
  return t;
}

export function summarise(output: CalcOutput): CheckSummary {
  const s = { pass: 0, warning: 0, fail: 0 };
  for (const c of output.checks) s[c.severity]++;
  return s;
}

/** Parse and compute. Input problems come back as field errors, not exceptions. */
export function runCompute(type: CalcType, raw: RawInputs): ComputeResult {
  const parsed = parseRawInputs(type, raw ?? {});
  if (!parsed.ok) return { ok: false, type, errors: parsed.errors };
  let output: CalcOutput;
  try {
    output = type.compute(parsed.input);
  } catch (err) {
    console.error(`[loopwright] ${type.id} compute threw`, err);
    return { ok: false, type, errors: [{ field: "_engine", message: `The ${type.title} calculation could not be completed for these inputs. Nothing was saved wrongly; please report this to support with the inputs.` }] };
  }
  return { ok: true, type, input: parsed.input, output, summary: summarise(output) };
}

/** Field errors as the `fields` map of an AppError. */
export function fieldMap(errors: FieldError[]): Record<string, string> {
  const out: Record<string, string> = {};
  for (const e of errors) if (!(e.field in out)) out[e.field] = e.message;
  return out;
}
