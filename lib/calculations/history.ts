/**
 * Revision history: every saved change and transition of a calculation, the revisions with who
 * prepared, checked, approved and issued each, and a side-by-side of two saved states.
 */
import { and, asc, eq } from "drizzle-orm";
import { calculationHistory, users } from "@/db/schema";
import { read } from "@/db/write";
import { notFound } from "@/lib/errors";
import type { WorkspaceContext } from "@/lib/auth/guard";
import type { CalcOutput, RawInputs, RawPart } from "@/lib/calc/core/types";
import { getCalcType } from "@/lib/calc/registry";
import { formatQuantity } from "@/lib/calc/core/units";
import { getCalculationRow } from "./index";

export interface HistoryEntry {
  id: string;
  revision: string;
  version: number;
  event: string;
  status: string;
  title: string;
  actor: string;
  at: number;
}

/** Every saved change and transition, oldest first (without the stored inputs and results). */
export async function listHistory(ctx: WorkspaceContext, calcId: string): Promise<HistoryEntry[]> {
  await getCalculationRow(ctx, calcId);
  const db = await read();
  return db
    .select({
      id: calculationHistory.id,
      revision: calculationHistory.revision,
      version: calculationHistory.version,
      event: calculationHistory.event,
      status: calculationHistory.status,
      title: calculationHistory.title,
      actor: users.name,
      at: calculationHistory.at,
    })
    .from(calculationHistory)
    .innerJoin(users, eq(users.id, calculationHistory.actorId))
    .where(and(eq(calculationHistory.calculationId, calcId), eq(calculationHistory.workspaceId, ctx.workspace.id)))
    .orderBy(asc(calculationHistory.version), asc(calculationHistory.at));
}

export interface RevisionSummary {
  revision: string;
  /** The last history entry of the revision: the state to compare. */
  lastEntryId: string;
  status: string;
  startedAt: number;
  lastChangeAt: number;
  preparedBy?: { name: string; at: number };
  submittedBy?: { name: string; at: number };
  approvedBy?: { name: string; at: number };
  issuedBy?: { name: string; at: number };
  saves: number;
}

/** One row per revision letter, oldest first. */
export function summariseRevisions(entries: HistoryEntry[]): RevisionSummary[] {
  const out = new Map<string, RevisionSummary>();
  for (const e of entries) {
    let r = out.get(e.revision);
    if (!r) {
      r = { revision: e.revision, lastEntryId: e.id, status: e.status, startedAt: e.at, lastChangeAt: e.at, saves: 0, preparedBy: { name: e.actor, at: e.at } };
      out.set(e.revision, r);
    }
    r.lastEntryId = e.id;
    r.status = e.status;
    r.lastChangeAt = e.at;
    if (e.event === "save") r.saves++;
    if (e.event === "submit") r.submittedBy = { name: e.actor, at: e.at };
    if (e.event === "approve") r.approvedBy = { name: e.actor, at: e.at };
    if (e.event === "issue") r.issuedBy = { name: e.actor, at: e.at };
    if (e.event === "return" || e.event === "reopen") r.approvedBy = undefined;
  }
  return [...out.values()];
}

export interface DiffRow {
  key: string;
  label: string;
  a: string;
  b: string;
  changed: boolean;
}

function rawText(v: unknown): string {
  if (v === undefined || v === null || v === "") return "—";
  if (typeof v === "object") return JSON.stringify(v);
  return String(v);
}

function flattenInputs(typeId: string, raw: RawInputs): Map<string, { label: string; text: string }> {
  const t = getCalcType(typeId);
  const out = new Map<string, { label: string; text: string }>();
  const labelOf = new Map((t?.fields ?? []).map((f) => [f.key, f.label]));
  for (const [k, v] of Object.entries(raw ?? {})) {
    if (v && typeof v === "object" && "values" in (v as object)) {
      const p = v as RawPart;
      out.set(`${k}.name`, { label: `${labelOf.get(k) ?? k}: part`, text: p.name });
      for (const [pk, pv] of Object.entries(p.values ?? {})) out.set(`${k}.${pk}`, { label: `${labelOf.get(k) ?? k}: ${pk}`, text: rawText(pv) });
    } else out.set(k, { label: labelOf.get(k) ?? k, text: rawText(v) });
  }
  return out;
}

function diffMaps(a: Map<string, { label: string; text: string }>, b: Map<string, { label: string; text: string }>): DiffRow[] {
  const keys = [...new Set([...a.keys(), ...b.keys()])];
  return keys.map((key) => {
    const x = a.get(key);
    const y = b.get(key);
    const at = x?.text ?? "—";
    const bt = y?.text ?? "—";
    return { key, label: (x ?? y)!.label, a: at, b: bt, changed: at !== bt };
  });
}

function resultMap(results: unknown): Map<string, { label: string; text: string }> {
  const out = new Map<string, { label: string; text: string }>();
  const r = results as CalcOutput | null;
  for (const v of r?.results ?? []) out.set(v.key, { label: `${v.label} (${v.symbol})`, text: formatQuantity(v.value, v.unit) });
  for (const c of r?.checks ?? []) out.set(`check:${c.id}`, { label: `Check: ${c.title}`, text: c.severity });
  return out;
}

/** Side-by-side of two saved states of a calculation: inputs as typed, results as formatted. */
export async function compareEntries(ctx: WorkspaceContext, calcId: string, aId: string, bId: string) {
  const c = await getCalculationRow(ctx, calcId);
  const db = await read();
  const load = async (id: string) => {
    const row = await db.query.calculationHistory.findFirst({ where: and(eq(calculationHistory.id, id), eq(calculationHistory.calculationId, calcId), eq(calculationHistory.workspaceId, ctx.workspace.id)) });
    if (!row) throw notFound("That saved state");
    return row;
  };
  const [a, b] = await Promise.all([load(aId), load(bId)]);
  return {
    a: { id: a.id, revision: a.revision, version: a.version, at: a.at, event: a.event },
    b: { id: b.id, revision: b.revision, version: b.version, at: b.at, event: b.event },
    inputs: diffMaps(flattenInputs(c.typeId, a.inputs as RawInputs), flattenInputs(c.typeId, b.inputs as RawInputs)),
    results: diffMaps(resultMap(a.results), resultMap(b.results)),
  };
}
