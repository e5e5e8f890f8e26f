/** Members: change a role, remove a member. The last owner can be neither removed nor demoted. */
import { and, eq, sql } from "drizzle-orm";
import { z } from "zod";
import { memberships, projectAccess, users } from "@/db/schema";
import { write } from "@/db/write";
import { AppError } from "@/lib/errors";
import { auditInsert } from "@/lib/audit";
import { assertSeatAvailable } from "@/lib/billing/seats";
import { SEAT_ROLES } from "@/lib/auth/permissions";
import type { WorkspaceContext } from "@/lib/auth/guard";
import { roleSchema } from "./invitations";

export const changeRoleSchema = z.object({ role: roleSchema });

async function ownerCount(db: Parameters<Parameters<typeof write>[0]>[0], workspaceId: string): Promise<number> {
  const [r] = await db
    .select({ n: sql<number>`count(*)` })
    .from(memberships)
    .where(and(eq(memberships.workspaceId, workspaceId), eq(memberships.role, "owner")));
  return Number(r?.n ?? 0);
}

/** Change a member's role. */
export async function changeRole(ctx: WorkspaceContext, membershipId: string, role: z.output<typeof roleSchema>): Promise<void> {
  await write(async (db) => {
    const m = await db.query.memberships.findFirst({ where: and(eq(memberships.id, membershipId), eq(memberships.workspaceId, ctx.workspace.id)) });
    if (!m) throw new AppError("not_found", "That member was not found.");
    if (m.role === role) return;
    if (m.role === "owner" && (await ownerCount(db, ctx.workspace.id)) <= 1) {
      throw new AppError("conflict", "This is the workspace's only owner. Make another member owner first.", { fields: { role: "the last owner cannot be demoted" } });
    }
    if (!SEAT_ROLES.includes(m.role)) await assertSeatAvailable(ctx.workspace, role, { countPending: false, db });
    await db.batch([
      db.update(memberships).set({ role }).where(eq(memberships.id, m.id)),
      auditInsert(db, { workspaceId: ctx.workspace.id, actorId: ctx.user.id, action: "member.role_changed", targetType: "membership", targetId: m.id, data: { from: m.role, to: role, userId: m.userId } }),
    ]);
  });
}

/** Remove a member (and their client project access) from the workspace. */
export async function removeMember(ctx: WorkspaceContext, membershipId: string): Promise<void> {
  await write(async (db) => {
    const m = await db.query.memberships.findFirst({ where: and(eq(memberships.id, membershipId), eq(memberships.workspaceId, ctx.workspace.id)) });
    if (!m) throw new AppError("not_found", "That member was not found.");
    if (m.role === "owner" && (await ownerCount(db, ctx.workspace.id)) <= 1) {
      throw new AppError("conflict", "This is the workspace's only owner and cannot be removed. Make another member owner first.");
    }
    const u = await db.query.users.findFirst({ where: eq(users.id, m.userId), columns: { email: true } });
    await db.batch([
      db.delete(projectAccess).where(and(eq(projectAccess.workspaceId, ctx.workspace.id), eq(projectAccess.userId, m.userId))),
      db.delete(memberships).where(eq(memberships.id, m.id)),
      auditInsert(db, { workspaceId: ctx.workspace.id, actorId: ctx.user.id, action: "member.removed", targetType: "membership", targetId: m.id, data: { userId: m.userId, email: u?.email, role: m.role } }),
    ]);
  });
}
