/**
 * Calculations: create, read, list (the register), and save drafts with optimistic concurrency.
 * Every saved change is kept in calculation_history; the state machine is in ./workflow.ts.
 *
 * Concurrency: a save names the version it was based on. The UPDATE is guarded by
 * `WHERE version = ? AND status = 'draft'`, and the history row is inserted in the same atomic
 * batch only if that UPDATE applied, so a stale save changes nothing and answers 409.
 */
import { and, asc, desc, eq, like, or, sql, type SQL } from "drizzle-orm";
import { alias } from "drizzle-orm/sqlite-core";
import { z } from "zod";
import { calculationHistory, calculations, projects, users, CALC_STATUSES, type Calculation } from "@/db/schema";
import { read, write } from "@/db/write";
import { insertWhere } from "@/db/guarded";
import { AppError, notFound } from "@/lib/errors";
import { newId } from "@/lib/ids";
import { auditInsert } from "@/lib/audit";
import { getProject } from "@/lib/projects";
import { assertPackUnlocked } from "@/lib/billing/access";
import type { WorkspaceContext } from "@/lib/auth/guard";
import type { RawInputs } from "@/lib/calc/core/types";
import { getCalcType } from "@/lib/calc/registry";
import { requireCalcType, runCompute, type CheckSummary } from "./compute";

/** Raw inputs larger than this are refused (a sheet is a few kB). */
export const MAX_INPUTS_BYTES = 256 * 1024;

const title = z.string({ error: "title is required" }).trim().min(1, "title must not be empty").max(200, "title must be at most 200 characters");
const number = z
  .string({ error: "number must be text" })
  .trim()
  .min(1, "number must not be empty")
  .max(30, "number must be at most 30 characters")
  .regex(/^[A-Za-z0-9][A-Za-z0-9._\-/]*$/, "number may contain letters, digits and . _ - / only");

export const createCalculationSchema = z.object({
  typeId: z.string({ error: "typeId is required" }).min(1, "typeId is required").max(100),
  title,
  number: number.optional(),
});

const rawInputs = z
  .record(z.string(), z.unknown(), { error: "inputs must be an object of field values" })
  .refine((v) => JSON.stringify(v).length <= MAX_INPUTS_BYTES, { message: `inputs must be smaller than ${MAX_INPUTS_BYTES / 1024} kB` });

export const saveCalculationSchema = z.object({
  version: z.number({ error: "version is required (the version your edit is based on)" }).int().min(1),
  title: title.optional(),
  inputs: rawInputs.optional(),
});
export type SaveCalculationInput = z.output<typeof saveCalculationSchema>;

export const SORT_KEYS = ["number", "title", "type", "revision", "status", "preparer", "checker", "updatedAt"] as const;

export const listQuerySchema = z.object({
  status: z.enum(CALC_STATUSES, { error: `status must be one of ${CALC_STATUSES.join(", ")}` }).optional(),
  pack: z.enum(["amplifier", "filter", "reference"], { error: "pack must be amplifier, filter or reference" }).optional(),
  q: z.string().trim().max(100, "q must be at most 100 characters").optional(),
  sort: z.enum(SORT_KEYS, { error: `sort must be one of ${SORT_KEYS.join(", ")}` }).default("updatedAt"),
  dir: z.enum(["asc", "desc"], { error: "dir must be asc or desc" }).default("desc"),
  page: z.coerce.number({ error: "page must be a number" }).int().min(1, "page must be 1 or more").default(1),
  pageSize: z.coerce.number({ error: "pageSize must be a number" }).int().min(5, "pageSize must be at least 5").max(200, "pageSize must be at most 200").default(50),
});
export type ListQuery = z.output<typeof listQuerySchema>;

export interface PersonRef {
  id: string;
  name: string;
}

export interface CalculationView {
  id: string;
  projectId: string;
  number: string;
  title: string;
  typeId: string;
  typeTitle: string;
  pack: string;
  engineVersion: string;
  /** Version of the engine module now (differs from engineVersion when the type was updated since). */
  currentEngineVersion: string | null;
  status: Calculation["status"];
  revision: string;
  inputs: RawInputs;
  results: Record<string, unknown> | null;
  checkSummary: CheckSummary | null;
  preparedBy: PersonRef;
  checker: PersonRef | null;
  approvedBy: PersonRef | null;
  submittedAt: number | null;
  approvedAt: number | null;
  issuedAt: number | null;
  version: number;
  createdAt: number;
  updatedAt: number;
  updatedBy: PersonRef | null;
}

async function people(ids: Array<string | null>): Promise<Map<string, PersonRef>> {
  const wanted = [...new Set(ids.filter((x): x is string => !!x))];
  if (!wanted.length) return new Map();
  const db = await read();
  const rows = await db.query.users.findMany({ where: (u, { inArray }) => inArray(u.id, wanted), columns: { id: true, name: true } });
  return new Map(rows.map((r) => [r.id, r]));
}

export async function toView(c: Calculation): Promise<CalculationView> {
  const p = await people([c.preparedBy, c.checkerId, c.approvedBy, c.updatedBy]);
  const t = getCalcType(c.typeId);
  const ref = (id: string | null) => (id ? (p.get(id) ?? { id, name: "(removed user)" }) : null);
  return {
    id: c.id,
    projectId: c.projectId,
    number: c.number,
    title: c.title,
    typeId: c.typeId,
    typeTitle: t?.title ?? c.typeId,
    pack: t?.pack ?? c.typeId.split(".")[0],
    engineVersion: c.engineVersion,
    currentEngineVersion: t?.version ?? null,
    status: c.status,
    revision: c.revision,
    inputs: c.inputs as RawInputs,
    results: c.results,
    checkSummary: c.checkSummary,
    preparedBy: ref(c.preparedBy) as PersonRef,
    checker: ref(c.checkerId),
    approvedBy: ref(c.approvedBy),
    submittedAt: c.submittedAt,
    approvedAt: c.approvedAt,
    issuedAt: c.issuedAt,
    version: c.version,
    createdAt: c.createdAt,
    updatedAt: c.updatedAt,
    updatedBy: ref(c.updatedBy),
  };
}

/** The calculation row, scoped to the workspace (404 otherwise). */
export async function getCalculationRow(ctx: WorkspaceContext, calcId: string): Promise<Calculation> {
  const db = await read();
  const c = await db.query.calculations.findFirst({ where: and(eq(calculations.id, calcId), eq(calculations.workspaceId, ctx.workspace.id)) });
  if (!c) throw notFound("That calculation");
  return c;
}

export async function getCalculation(ctx: WorkspaceContext, calcId: string): Promise<CalculationView> {
  return toView(await getCalculationRow(ctx, calcId));
}

/** The next free number in a project: C-001, C-002, … */
export async function nextNumber(projectId: string): Promise<string> {
  const db = await read();
  const rows = await db.select({ number: calculations.number }).from(calculations).where(eq(calculations.projectId, projectId));
  let max = 0;
  for (const r of rows) {
    const m = /^C-(\d+)$/.exec(r.number);
    if (m) max = Math.max(max, Number(m[1]));
  }
  return `C-${String(max + 1).padStart(3, "0")}`;
}

/** Create a draft calculation (revision A) with the type's defaults. */
export async function createCalculation(ctx: WorkspaceContext, projectId: string, input: z.output<typeof createCalculationSchema>): Promise<CalculationView> {
  const project = await getProject(ctx, projectId);
  if (project.archivedAt) throw new AppError("conflict", "This project is archived. Restore it to add calculations.");
  const type = requireCalcType(input.typeId);
  assertPackUnlocked(ctx.workspace, type.pack);
  const id = newId();
  const now = Date.now();
  const inputs = structuredClone(type.defaults) as Record<string, unknown>;
  const r = runCompute(type, inputs as RawInputs);
  const results = r.ok ? (r.output as unknown as Record<string, unknown>) : null;
  const checkSummary = r.ok ? r.summary : null;
  await write(async (db) => {
    const num = input.number ?? (await nextNumber(projectId));
    const taken = await db.query.calculations.findFirst({ where: and(eq(calculations.projectId, projectId), eq(calculations.number, num)), columns: { id: true } });
    if (taken) throw new AppError("conflict", `Number ${num} is already used in this project.`, { fields: { number: "is already used in this project" } });
    const row = {
      id,
      workspaceId: ctx.workspace.id,
      projectId,
      number: num,
      title: input.title,
      typeId: type.id,
      engineVersion: type.version,
      status: "draft" as const,
      revision: "A",
      inputs,
      results,
      checkSummary,
      preparedBy: ctx.user.id,
      version: 1,
      createdAt: now,
      updatedAt: now,
      updatedBy: ctx.user.id,
    };
    await db.batch([
      db.insert(calculations).values(row),
      db.insert(calculationHistory).values({
        id: newId(),
        workspaceId: ctx.workspace.id,
        calculationId: id,
        revision: "A",
        version: 1,
        event: "create",
        status: "draft",
        title: input.title,
        inputs,
        results,
        engineVersion: type.version,
        actorId: ctx.user.id,
        at: now,
      }),
      db.update(projects).set({ updatedAt: now }).where(eq(projects.id, projectId)),
      auditInsert(db, { workspaceId: ctx.workspace.id, actorId: ctx.user.id, action: "calculation.created", targetType: "calculation", targetId: id, data: { typeId: type.id, number: num, title: input.title } }),
    ]);
  });
  return getCalculation(ctx, id);
}

const STATUS_WORDS: Record<Calculation["status"], string> = {
  draft: "a draft",
  in_check: "in check",
  approved: "approved",
  issued: "issued",
};

/** Why a calculation in this status cannot be edited, as a sentence. */
export function notEditableMessage(c: Pick<Calculation, "status" | "revision">): string {
  switch (c.status) {
    case "in_check":
      return "This calculation is in check. Ask the checker to return it before editing.";
    case "approved":
      return "This calculation is approved. Reopen it as a draft to edit (its approval is then withdrawn).";
    case "issued":
      return `Revision ${c.revision} is issued and cannot change. Start a new revision to edit.`;
    default:
      return "This calculation cannot be edited now.";
  }
}

/**
 * Save a draft: raw inputs (kept even when they do not parse) and/or the title, recomputed with
 * the current engine. 409 if someone saved first (stale version) or the status moved on.
 */
export async function saveCalculation(ctx: WorkspaceContext, calcId: string, input: SaveCalculationInput): Promise<CalculationView> {
  const before = await getCalculationRow(ctx, calcId);
  const type = requireCalcType(before.typeId);
  const inputs = (input.inputs ?? before.inputs) as Record<string, unknown>;
  const r = runCompute(type, inputs as RawInputs);
  const results = r.ok ? (r.output as unknown as Record<string, unknown>) : null;
  const checkSummary = r.ok ? r.summary : null;
  const now = Date.now();
  const newVersion = input.version + 1;
  await write(async (db) => {
    const cur = await db.query.calculations.findFirst({ where: eq(calculations.id, calcId) });
    if (!cur) throw notFound("That calculation");
    if (cur.version !== input.version) throw await staleError(cur);
    if (cur.status !== "draft") throw new AppError("conflict", notEditableMessage(cur));
    const nextTitle = input.title ?? cur.title;
    const [upd] = await db.batch([
      db
        .update(calculations)
        .set({ inputs, title: nextTitle, results, checkSummary, engineVersion: type.version, version: newVersion, updatedAt: now, updatedBy: ctx.user.id })
        .where(and(eq(calculations.id, calcId), eq(calculations.version, input.version), eq(calculations.status, "draft"))),
      insertWhere(
        db,
        calculationHistory,
        {
          id: newId(),
          workspaceId: ctx.workspace.id,
          calculationId: calcId,
          revision: cur.revision,
          version: newVersion,
          event: "save",
          status: "draft",
          title: nextTitle,
          inputs,
          results,
          engineVersion: type.version,
          actorId: ctx.user.id,
          at: now,
        },
        sql`SELECT 1 FROM calculations WHERE id = ${calcId} AND version = ${newVersion} AND updated_at = ${now} AND updated_by = ${ctx.user.id}`,
      ),
    ]);
    if (upd.rowsAffected === 0) throw await staleError(await db.query.calculations.findFirst({ where: eq(calculations.id, calcId) }));
  });
  return getCalculation(ctx, calcId);
}

/** 409 telling who saved the newer version and when. */
async function staleError(cur: Calculation | undefined): Promise<AppError> {
  if (!cur) return notFound("That calculation");
  const who = cur.updatedBy ? (await people([cur.updatedBy])).get(cur.updatedBy)?.name : undefined;
  const when = new Date(cur.updatedAt).toISOString().replace("T", " ").slice(0, 16) + " UTC";
  return new AppError(
    "conflict",
    `${who ?? "Someone"} saved a newer version (v${cur.version}) at ${when}, so your change was not saved. Reload to see theirs, then apply yours again.`,
    { fields: { version: `is ${cur.version} now` } },
  );
}

export interface RegisterRow {
  id: string;
  number: string;
  title: string;
  typeId: string;
  typeTitle: string;
  pack: string;
  revision: string;
  status: Calculation["status"];
  preparer: string;
  checker: string | null;
  updatedAt: number;
  checkSummary: CheckSummary | null;
}

/** The project's calculation register: filtered, searched, sorted and paged in SQL. */
export async function listCalculations(ctx: WorkspaceContext, projectId: string, q: ListQuery): Promise<{ rows: RegisterRow[]; total: number; page: number; pageSize: number }> {
  await getProject(ctx, projectId);
  const db = await read();
  const preparer = alias(users, "preparer");
  const checker = alias(users, "checker");
  const conds: SQL[] = [eq(calculations.workspaceId, ctx.workspace.id), eq(calculations.projectId, projectId)];
  if (q.status) conds.push(eq(calculations.status, q.status));
  if (q.pack) conds.push(like(calculations.typeId, `${q.pack}.%`));
  if (q.q) {
    const pat = `%${q.q.replace(/[%_\\]/g, (c) => `\\${c}`)}%`;
    conds.push(or(sql`${calculations.title} LIKE ${pat} ESCAPE '\\'`, sql`${calculations.number} LIKE ${pat} ESCAPE '\\'`, sql`${calculations.typeId} LIKE ${pat} ESCAPE '\\'`) as SQL);
  }
  const where = and(...conds);
  const sortCol = {
    number: calculations.number,
    title: calculations.title,
    type: calculations.typeId,
    revision: calculations.revision,
    status: calculations.status,
    preparer: preparer.name,
    checker: checker.name,
    updatedAt: calculations.updatedAt,
  }[q.sort];
  const order = q.dir === "asc" ? asc(sortCol) : desc(sortCol);
  const [rows, [{ n }]] = await Promise.all([
    db
      .select({
        id: calculations.id,
        number: calculations.number,
        title: calculations.title,
        typeId: calculations.typeId,
        revision: calculations.revision,
        status: calculations.status,
        preparer: preparer.name,
        checker: checker.name,
        updatedAt: calculations.updatedAt,
        checkSummary: calculations.checkSummary,
      })
      .from(calculations)
      .innerJoin(preparer, eq(preparer.id, calculations.preparedBy))
      .leftJoin(checker, eq(checker.id, calculations.checkerId))
      .where(where)
      .orderBy(order, asc(calculations.id))
      .limit(q.pageSize)
      .offset((q.page - 1) * q.pageSize),
    db.select({ n: sql<number>`count(*)` }).from(calculations).where(where),
  ]);
  return {
    rows: rows.map((r) => {
      const t = getCalcType(r.typeId);
      return { ...r, typeTitle: t?.title ?? r.typeId, pack: t?.pack ?? r.typeId.split(".")[0] };
    }),
    total: Number(n),
    page: q.page,
    pageSize: q.pageSize,
  };
}

export { STATUS_WORDS };
