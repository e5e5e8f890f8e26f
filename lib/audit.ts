/** Audit events: every change of state is recorded with who, what and when. */
import { and, desc, eq } from "drizzle-orm";
import type { Db } from "@/db/client";
import { read } from "@/db/write";
import { auditEvents } from "@/db/schema";
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
