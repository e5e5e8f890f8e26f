/**
 * The workspace parts library: op-amps and references with their parameter sets in SI units.
 *
 * Names are unique per kind within a workspace, compared trimmed and case-folded (`nameKey`);
 * the unique index (workspace, kind, name) backs that up across processes. Deleting a part only
 * removes it from the library: calculations keep the snapshot of the parameters they used
 * (RawPart in their inputs), so nothing issued changes.
 */
import { and, asc, eq } from "drizzle-orm";
import { z } from "zod";
import { parts, type Part } from "@/db/schema";
import type { Db } from "@/db/client";
import { read, write } from "@/db/write";
import { AppError, notFound } from "@/lib/errors";
import { newId } from "@/lib/ids";
import { auditInsert } from "@/lib/audit";
import type { WorkspaceContext } from "@/lib/auth/guard";
import { MAX_NOTES, MAX_VALUE_TEXT, PART_KINDS, nameKey, validatePart, type PartKind } from "./fields";

export { PART_KINDS, type PartKind } from "./fields";

export const partKindSchema = z.enum(PART_KINDS, { error: "kind must be opamp or reference" });

const valueInput = z.union([z.string().max(MAX_VALUE_TEXT, `a value must be at most ${MAX_VALUE_TEXT} characters`), z.number()], {
  error: 'each value must be a number (SI units) or text such as "10M" or "0.5 V/µs"',
});
const valuesInput = z.record(z.string().max(40), valueInput, { error: "values must be an object of parameter → value" });
const notesInput = z.string({ error: "notes must be text" }).max(MAX_NOTES, `notes must be at most ${MAX_NOTES} characters`);

/** Body of POST /parts. Values are typed text (engineering notation) or SI numbers. */
export const createPartSchema = z.object({
  kind: partKindSchema,
  name: z.string({ error: "name is required" }),
  values: valuesInput,
  notes: notesInput.default(""),
});
export type CreatePartInput = z.output<typeof createPartSchema>;

/** Body of PATCH /parts/:id. Given values replace the stored ones; the result is validated whole. */
export const updatePartSchema = z
  .object({ name: z.string({ error: "name must be text" }).optional(), values: valuesInput.optional(), notes: notesInput.optional() })
  .refine((v) => v.name !== undefined || v.values !== undefined || v.notes !== undefined, { message: "nothing to change: give name, values or notes", path: ["body"] });
export type UpdatePartInput = z.output<typeof updatePartSchema>;

export const partListQuery = z.object({ kind: partKindSchema.optional() });

/** A part as the API returns it: `values` is the full parameter set in SI (RawPart.values). */
export interface PartDto {
  id: string;
  kind: PartKind;
  name: string;
  values: Record<string, number | string>;
  notes: string;
  createdAt: number;
  updatedAt: number;
}

/** The API shape of a row. */
export function toDto(p: Part): PartDto {
  return { id: p.id, kind: p.kind, name: p.name, values: p.params, notes: p.notes, createdAt: p.createdAt, updatedAt: p.updatedAt };
}

/** The workspace's parts (of one kind, or all), by kind then name. */
export async function listParts(ctx: WorkspaceContext, kind?: PartKind): Promise<PartDto[]> {
  const db = await read();
  const where = kind ? and(eq(parts.workspaceId, ctx.workspace.id), eq(parts.kind, kind)) : eq(parts.workspaceId, ctx.workspace.id);
  const rows = await db.select().from(parts).where(where).orderBy(asc(parts.kind), asc(parts.name));
  return rows.map(toDto);
}

/** One part of this workspace, or 404 (also for another workspace's part). */
export async function getPart(ctx: WorkspaceContext, partId: string): Promise<PartDto> {
  const db = await read();
  const p = await db.query.parts.findFirst({ where: and(eq(parts.id, partId), eq(parts.workspaceId, ctx.workspace.id)) });
  if (!p) throw notFound("That part");
  return toDto(p);
}

/** Names already used for `kind` in the workspace, as nameKey → stored name. */
export async function libraryNames(db: Db, workspaceId: string, kind: PartKind, exceptId?: string): Promise<Map<string, string>> {
  const rows = await db.select({ id: parts.id, name: parts.name }).from(parts).where(and(eq(parts.workspaceId, workspaceId), eq(parts.kind, kind)));
  const out = new Map<string, string>();
  for (const r of rows) if (r.id !== exceptId) out.set(nameKey(r.name), r.name);
  return out;
}

function duplicate(kind: PartKind, name: string, existing: string): AppError {
  const same = existing === name ? `"${name}"` : `"${existing}" (names are compared without regard to case)`;
  return new AppError("conflict", `The library already has ${kind === "opamp" ? "an op-amp" : "a reference"} named ${same}. Choose another name or edit that part.`, {
    fields: { name: `a part named ${same} already exists` },
  });
}

function invalid(fields: Record<string, string>): AppError {
  const summary = Object.entries(fields)
    .slice(0, 3)
    .map(([, m]) => m)
    .join("; ");
  return new AppError("invalid_input", `Please correct the highlighted fields (${summary}).`, { fields });
}

/** A unique-index failure from SQLite as a 409 (two processes saving the same name at once). */
function isUniqueViolation(err: unknown): boolean {
  const text = err instanceof Error ? `${err.message} ${String((err as { cause?: unknown }).cause ?? "")}` : String(err);
  return /UNIQUE constraint failed: parts\./.test(text);
}

/** Add a part; 422 naming each wrong field, 409 for a name already in the library. */
export async function createPart(ctx: WorkspaceContext, input: CreatePartInput): Promise<PartDto> {
  const v = validatePart(input.kind, { name: input.name, values: input.values });
  if (!v.ok) throw invalid(v.fields);
  const id = newId();
  const now = Date.now();
  await write(async (db) => {
    const existing = (await libraryNames(db, ctx.workspace.id, input.kind)).get(nameKey(v.name));
    if (existing !== undefined) throw duplicate(input.kind, v.name, existing);
    try {
      await db.batch([
        db.insert(parts).values({ id, workspaceId: ctx.workspace.id, kind: input.kind, name: v.name, params: v.params, notes: input.notes.trim(), createdBy: ctx.user.id, createdAt: now, updatedAt: now }),
        auditInsert(db, { workspaceId: ctx.workspace.id, actorId: ctx.user.id, action: "part.created", targetType: "part", targetId: id, data: { kind: input.kind, name: v.name } }),
      ]);
    } catch (err) {
      if (isUniqueViolation(err)) throw duplicate(input.kind, v.name, v.name);
      throw err;
    }
  });
  return getPart(ctx, id);
}

/** Change a part's name, values (merged over the stored ones, then validated whole) or notes. */
export async function updatePart(ctx: WorkspaceContext, partId: string, input: UpdatePartInput): Promise<PartDto> {
  const before = await getPart(ctx, partId);
  const v = validatePart(before.kind, { name: input.name ?? before.name, values: { ...before.values, ...(input.values ?? {}) } });
  if (!v.ok) throw invalid(v.fields);
  await write(async (db) => {
    const existing = (await libraryNames(db, ctx.workspace.id, before.kind, partId)).get(nameKey(v.name));
    if (existing !== undefined) throw duplicate(before.kind, v.name, existing);
    const changed = Object.keys(v.params).filter((k) => before.values[k] !== v.params[k]);
    try {
      await db.batch([
        db
          .update(parts)
          .set({ name: v.name, params: v.params, notes: (input.notes ?? before.notes).trim(), updatedAt: Date.now() })
          .where(and(eq(parts.id, partId), eq(parts.workspaceId, ctx.workspace.id))),
        auditInsert(db, {
          workspaceId: ctx.workspace.id,
          actorId: ctx.user.id,
          action: "part.updated",
          targetType: "part",
          targetId: partId,
          data: { name: v.name, ...(v.name !== before.name ? { renamedFrom: before.name } : {}), changed },
        }),
      ]);
    } catch (err) {
      if (isUniqueViolation(err)) throw duplicate(before.kind, v.name, v.name);
      throw err;
    }
  });
  return getPart(ctx, partId);
}

/**
 * Remove a part from the library. Calculations that used it keep their own snapshot of its
 * parameters (their inputs are not touched), so their results and reports stay as they were.
 */
export async function deletePart(ctx: WorkspaceContext, partId: string): Promise<{ deleted: string }> {
  const before = await getPart(ctx, partId);
  await write(async (db) => {
    await db.batch([
      db.delete(parts).where(and(eq(parts.id, partId), eq(parts.workspaceId, ctx.workspace.id))),
      auditInsert(db, { workspaceId: ctx.workspace.id, actorId: ctx.user.id, action: "part.deleted", targetType: "part", targetId: partId, data: { kind: before.kind, name: before.name, values: before.values } }),
    ]);
  });
  return { deleted: partId };
}
