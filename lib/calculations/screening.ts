/**
 * Part screening: run one calculation with every op-amp (or reference) in the workspace library
 * and rank which parts pass every check, by their worst margin; name the failing check for the
 * rest. This answers "which of our approved parts can do this job?".
 */
import { and, eq } from "drizzle-orm";
import { parts } from "@/db/schema";
import { read } from "@/db/write";
import { AppError } from "@/lib/errors";
import { assertPackUnlocked } from "@/lib/billing/access";
import type { WorkspaceContext } from "@/lib/auth/guard";
import type { RawInputs, Severity } from "@/lib/calc/core/types";
import { requireCalcType, runCompute } from "./compute";

export interface ScreeningRow {
  partId: string;
  name: string;
  verdict: Severity | "invalid";
  /** Smallest normalised margin over the checks that have one (> 0 passes). */
  worstMargin: number | null;
  /** The check with the smallest margin, or the first failing one. */
  limitingCheck: string | null;
  failing: string[];
  warnings: string[];
  /** Why the part could not be evaluated (a missing parameter…), for verdict "invalid". */
  problem?: string;
}

export const MAX_SCREENED_PARTS = 500;

export async function screenParts(ctx: WorkspaceContext, typeId: string, raw: RawInputs): Promise<{ partKind: string; field: string; rows: ScreeningRow[] }> {
  const type = requireCalcType(typeId);
  assertPackUnlocked(ctx.workspace, type.pack);
  const field = type.fields.find((f) => f.kind === "part");
  if (!field || field.kind !== "part") throw new AppError("invalid_input", `${type.title} does not use a part from the library, so there is nothing to screen.`, { fields: { typeId: "has no part input" } });
  const db = await read();
  const library = await db.select().from(parts).where(and(eq(parts.workspaceId, ctx.workspace.id), eq(parts.kind, field.partKind))).limit(MAX_SCREENED_PARTS);
  const rows: ScreeningRow[] = library.map((p) => {
    const inputs: RawInputs = { ...raw, [field.key]: { partId: p.id, name: p.name, values: { ...(p.params as Record<string, string | number>) } } };
    const r = runCompute(type, inputs);
    if (!r.ok) {
      const partErr = r.errors.find((e) => e.field.startsWith(`${field.key}.`));
      return { partId: p.id, name: p.name, verdict: "invalid", worstMargin: null, limitingCheck: null, failing: [], warnings: [], problem: (partErr ?? r.errors[0]).message };
    }
    const checks = r.output.checks;
    const failing = checks.filter((c) => c.severity === "fail");
    const warnings = checks.filter((c) => c.severity === "warning");
    const withMargin = checks.filter((c) => typeof c.margin === "number" && Number.isFinite(c.margin));
    const worst = withMargin.reduce<(typeof withMargin)[number] | null>((w, c) => (!w || (c.margin as number) < (w.margin as number) ? c : w), null);
    return {
      partId: p.id,
      name: p.name,
      verdict: failing.length ? "fail" : warnings.length ? "warning" : "pass",
      worstMargin: worst ? (worst.margin as number) : null,
      limitingCheck: failing[0]?.title ?? worst?.title ?? null,
      failing: failing.map((c) => c.title),
      warnings: warnings.map((c) => c.title),
    };
  });
  const rank = (v: ScreeningRow["verdict"]) => ({ pass: 0, warning: 1, fail: 2, invalid: 3 })[v];
  rows.sort((a, b) => rank(a.verdict) - rank(b.verdict) || a.failing.length - b.failing.length || (b.worstMargin ?? -Infinity) - (a.worstMargin ?? -Infinity) || a.name.localeCompare(b.name));
  return { partKind: field.partKind, field: field.key, rows };
}
