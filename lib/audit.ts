/** Audit events: every change of state is recorded with who, what and when. */
import { and, desc, eq, lt } from "drizzle-orm";
import type { Db } from "@/db/client";
import { read } from "@/db/write";
import { auditEvents, users } from "@/db/schema";
import { newId } from "./ids";

export interface AuditInput {
  workspaceId: string;
  actorId: string | null;
  /** Dotted verb, e.g. "project.created", "member.role_changed". */
  action: string;
  targetType: string;
  targetId: string;
  data?: Record<string, unknown>;
}

/** The insert for one audit event, to put in the same db.batch() as the change it records. */
export function auditInsert(db: Db, e: AuditInput) {
  return db.insert(auditEvents).values({ id: newId(), ...e, data: e.data ?? {}, at: Date.now() });
}

/** Recent audit events of a workspace, optionally of one target. */
export async function listAudit(workspaceId: string, target?: { type: string; id: string }, limit = 100) {
  const db = await read();
  const where = target
    ? and(eq(auditEvents.workspaceId, workspaceId), eq(auditEvents.targetType, target.type), eq(auditEvents.targetId, target.id))
    : eq(auditEvents.workspaceId, workspaceId);
  return db.select().from(auditEvents).where(where).orderBy(desc(auditEvents.at)).limit(limit);
}

export interface AuditRow {
  id: string;
  action: string;
  targetType: string;
  targetId: string;
  data: Record<string, unknown>;
  at: number;
  actor: string | null;
}

/** A page of the workspace's audit log, newest first, with actor names. */
export async function auditPage(workspaceId: string, opts: { before?: number; limit?: number } = {}): Promise<AuditRow[]> {
  const db = await read();
  const conds = [eq(auditEvents.workspaceId, workspaceId)];
  if (opts.before) conds.push(lt(auditEvents.at, opts.before));
  return db
    .select({ id: auditEvents.id, action: auditEvents.action, targetType: auditEvents.targetType, targetId: auditEvents.targetId, data: auditEvents.data, at: auditEvents.at, actor: users.name })
    .from(auditEvents)
    .leftJoin(users, eq(users.id, auditEvents.actorId))
    .where(and(...conds))
    .orderBy(desc(auditEvents.at))
    .limit(Math.min(opts.limit ?? 100, 500));
}
