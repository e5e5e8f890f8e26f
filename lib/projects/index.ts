/**
 * Projects: one client job each. Staff see every project of the workspace; a client sees only
 * the projects shared with them. Another workspace's project, or one not shared with a client,
 * answers 404.
 */
import { and, asc, desc, eq, inArray, isNull, sql } from "drizzle-orm";
import { z } from "zod";
import { memberships, projectAccess, projects, users, type Project } from "@/db/schema";
import { read, write } from "@/db/write";
import { AppError, notFound } from "@/lib/errors";
import { newId } from "@/lib/ids";
import { auditInsert } from "@/lib/audit";
import { clientProjectScoped } from "@/lib/auth/permissions";
import type { WorkspaceContext } from "@/lib/auth/guard";

const projectName = z
  .string({ error: "name is required" })
  .trim()
  .min(1, "name must not be empty")
  .max(200, "name must be at most 200 characters");

export const createProjectSchema = z.object({
  name: projectName,
  clientName: z.string().trim().max(200, "clientName must be at most 200 characters").default(""),
  jobNumber: z.string().trim().max(50, "jobNumber must be at most 50 characters").default(""),
  description: z.string().trim().max(2000, "description must be at most 2000 characters").default(""),
});
export type CreateProjectInput = z.output<typeof createProjectSchema>;

export const updateProjectSchema = z
  .object({
    name: projectName.optional(),
    clientName: z.string().trim().max(200, "clientName must be at most 200 characters").optional(),
    jobNumber: z.string().trim().max(50, "jobNumber must be at most 50 characters").optional(),
    description: z.string().trim().max(2000, "description must be at most 2000 characters").optional(),
    archived: z.boolean({ error: "archived must be true or false" }).optional(),
  })
  .refine((v) => Object.values(v).some((x) => x !== undefined), { message: "nothing to change: give at least one field", path: ["body"] });
export type UpdateProjectInput = z.output<typeof updateProjectSchema>;

export const projectIdSchema = z.object({ slug: z.string(), projectId: z.string().min(1).max(64) });

export interface ProjectListOptions {
  includeArchived?: boolean;
}

/** Projects the member may see, newest first (archived ones only on request). */
export async function listProjects(ctx: WorkspaceContext, opts: ProjectListOptions = {}): Promise<Project[]> {
  const db = await read();
  const conds = [eq(projects.workspaceId, ctx.workspace.id)];
  if (!opts.includeArchived) conds.push(isNull(projects.archivedAt));
  if (clientProjectScoped(ctx.role)) {
    const shared = db.select({ id: projectAccess.projectId }).from(projectAccess).where(and(eq(projectAccess.userId, ctx.user.id), eq(projectAccess.workspaceId, ctx.workspace.id)));
    conds.push(inArray(projects.id, shared));
  }
  return db.select().from(projects).where(and(...conds)).orderBy(desc(projects.updatedAt));
}

/** One project the member may see, or 404. */
export async function getProject(ctx: WorkspaceContext, projectId: string): Promise<Project> {
  const db = await read();
  const p = await db.query.projects.findFirst({ where: and(eq(projects.id, projectId), eq(projects.workspaceId, ctx.workspace.id)) });
  if (!p) throw notFound("That project");
  if (clientProjectScoped(ctx.role)) {
    const access = await db.query.projectAccess.findFirst({ where: and(eq(projectAccess.projectId, p.id), eq(projectAccess.userId, ctx.user.id)) });
    if (!access) throw notFound("That project");
  }
  return p;
}

export async function createProject(ctx: WorkspaceContext, input: CreateProjectInput): Promise<Project> {
  const id = newId();
  const now = Date.now();
  await write(async (db) => {
    await db.batch([
      db.insert(projects).values({ id, workspaceId: ctx.workspace.id, ...input, createdBy: ctx.user.id, createdAt: now, updatedAt: now }),
      auditInsert(db, { workspaceId: ctx.workspace.id, actorId: ctx.user.id, action: "project.created", targetType: "project", targetId: id, data: { name: input.name } }),
    ]);
  });
  return getProject(ctx, id);
}

export async function updateProject(ctx: WorkspaceContext, projectId: string, input: UpdateProjectInput): Promise<Project> {
  const before = await getProject(ctx, projectId);
  const { archived, ...fields } = input;
  const set: Partial<Project> = { ...Object.fromEntries(Object.entries(fields).filter(([, v]) => v !== undefined)), updatedAt: Date.now() };
  if (archived !== undefined) set.archivedAt = archived ? (before.archivedAt ?? Date.now()) : null;
  const action = archived === true ? "project.archived" : archived === false ? "project.restored" : "project.updated";
  await write(async (db) => {
    await db.batch([
      db.update(projects).set(set).where(and(eq(projects.id, projectId), eq(projects.workspaceId, ctx.workspace.id))),
      auditInsert(db, { workspaceId: ctx.workspace.id, actorId: ctx.user.id, action, targetType: "project", targetId: projectId, data: { ...fields, ...(archived !== undefined ? { archived } : {}) } }),
    ]);
  });
  return getProject(ctx, projectId);
}

export const shareSchema = z.object({ userId: z.string({ error: "userId is required" }).min(1, "userId is required").max(64) });

/** Client members and whether each may see this project. */
export async function listProjectClients(ctx: WorkspaceContext, projectId: string) {
  await getProject(ctx, projectId);
  const db = await read();
  return db
    .select({
      userId: users.id,
      name: users.name,
      email: users.email,
      hasAccess: sql<number>`exists (select 1 from project_access pa where pa.project_id = ${projectId} and pa.user_id = ${users.id})`,
    })
    .from(memberships)
    .innerJoin(users, eq(memberships.userId, users.id))
    .where(and(eq(memberships.workspaceId, ctx.workspace.id), eq(memberships.role, "client")))
    .orderBy(asc(users.name))
    .then((rows) => rows.map((r) => ({ ...r, hasAccess: Boolean(r.hasAccess) })));
}

/** Give (or take away) a client member's access to a project. */
export async function setProjectAccess(ctx: WorkspaceContext, projectId: string, userId: string, allow: boolean): Promise<void> {
  await getProject(ctx, projectId);
  await write(async (db) => {
    const m = await db.query.memberships.findFirst({ where: and(eq(memberships.workspaceId, ctx.workspace.id), eq(memberships.userId, userId)) });
    if (!m) throw new AppError("not_found", "That member was not found.");
    if (m.role !== "client") throw new AppError("invalid_input", "Only client members are given project access; staff see every project.", { fields: { userId: "is not a client member" } });
    const audit = auditInsert(db, { workspaceId: ctx.workspace.id, actorId: ctx.user.id, action: allow ? "project.shared" : "project.unshared", targetType: "project", targetId: projectId, data: { userId } });
    if (allow) {
      await db.batch([db.insert(projectAccess).values({ projectId, userId, workspaceId: ctx.workspace.id, createdAt: Date.now() }).onConflictDoNothing(), audit]);
    } else {
      await db.batch([db.delete(projectAccess).where(and(eq(projectAccess.projectId, projectId), eq(projectAccess.userId, userId))), audit]);
    }
  });
}
