/**
 * Invitations: a random token, stored only as its SHA-256, single use, valid 7 days, revocable.
 * The e-mail carries the link; the owner also sees the link once, to pass on by hand if mail fails.
 */
import { and, desc, eq, gt, inArray, isNull } from "drizzle-orm";
import { z } from "zod";
import { invitations, memberships, projectAccess, projects, users, workspaces, ROLES, type Role, type User } from "@/db/schema";
import { read, write } from "@/db/write";
import { AppError } from "@/lib/errors";
import { newId, newToken, sha256Hex } from "@/lib/ids";
import { appUrl } from "@/lib/env";
import { sendMail } from "@/lib/mail";
import { auditInsert } from "@/lib/audit";
import { emailSchema } from "@/lib/auth/schemas";
import { assertSeatAvailable } from "@/lib/billing/seats";
import type { WorkspaceContext } from "@/lib/auth/guard";

export const INVITE_TTL_MS = 7 * 24 * 60 * 60 * 1000;

export const ROLE_LABELS: Record<Role, string> = {
  owner: "Owner",
  engineer: "Engineer",
  checker: "Checker",
  client: "Client",
};

export const roleSchema = z.enum(ROLES, { error: "role must be one of owner, engineer, checker, client" });

export const inviteSchema = z
  .object({
    email: emailSchema,
    role: roleSchema,
    projectIds: z.array(z.string().max(64), { error: "projectIds must be a list of project ids" }).max(200).default([]),
  })
  .refine((v) => v.role !== "client" || v.projectIds.length > 0, {
    message: "a client must be given at least one project to see",
    path: ["projectIds"],
  });
export type InviteInput = z.output<typeof inviteSchema>;

export interface InvitationView {
  id: string;
  email: string;
  role: Role;
  projectIds: string[];
  invitedBy: string;
  createdAt: number;
  expiresAt: number;
}

/** Pending invitations of the workspace (not accepted, not revoked, not expired). */
export async function listPendingInvitations(workspaceId: string): Promise<InvitationView[]> {
  const db = await read();
  const rows = await db
    .select({
      id: invitations.id,
      email: invitations.email,
      role: invitations.role,
      projectIds: invitations.projectIds,
      invitedBy: users.name,
      createdAt: invitations.createdAt,
      expiresAt: invitations.expiresAt,
    })
    .from(invitations)
    .innerJoin(users, eq(invitations.invitedBy, users.id))
    .where(and(eq(invitations.workspaceId, workspaceId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, Date.now())))
    .orderBy(desc(invitations.createdAt));
  return rows;
}

/** Invite someone by e-mail. Returns the invitation and its link (shown once to the inviter). */
export async function createInvitation(ctx: WorkspaceContext, input: InviteInput): Promise<{ invitation: InvitationView; link: string; mailSent: boolean }> {
  const ws = ctx.workspace;
  const token = newToken();
  const now = Date.now();
  const id = newId();
  await write(async (db) => {
    const existingMember = await db
      .select({ id: memberships.id })
      .from(memberships)
      .innerJoin(users, eq(memberships.userId, users.id))
      .where(and(eq(memberships.workspaceId, ws.id), eq(users.email, input.email)));
    if (existingMember.length) throw new AppError("conflict", `${input.email} is already a member of this workspace.`, { fields: { email: "is already a member" } });
    const pending = await db
      .select({ id: invitations.id })
      .from(invitations)
      .where(and(eq(invitations.workspaceId, ws.id), eq(invitations.email, input.email), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, now)));
    if (pending.length) throw new AppError("conflict", `${input.email} already has a pending invitation. Revoke it first to send a new one.`, { fields: { email: "already has a pending invitation" } });
    if (input.projectIds.length) {
      const found = await db.select({ id: projects.id }).from(projects).where(and(eq(projects.workspaceId, ws.id), inArray(projects.id, input.projectIds)));
      if (found.length !== new Set(input.projectIds).size) throw new AppError("invalid_input", "One of the chosen projects does not exist in this workspace.", { fields: { projectIds: "contains an unknown project" } });
    }
    await assertSeatAvailable(ws, input.role, { countPending: true, db });
    await db.batch([
      db.insert(invitations).values({
        id,
        workspaceId: ws.id,
        email: input.email,
        role: input.role,
        projectIds: input.role === "client" ? [...new Set(input.projectIds)] : [],
        tokenHash: sha256Hex(token),
        invitedBy: ctx.user.id,
        createdAt: now,
        expiresAt: now + INVITE_TTL_MS,
      }),
      auditInsert(db, { workspaceId: ws.id, actorId: ctx.user.id, action: "member.invited", targetType: "invitation", targetId: id, data: { email: input.email, role: input.role } }),
    ]);
  });
  const link = `${appUrl()}/invite/${token}`;
  const mailSent = await sendMail({
    to: input.email,
    subject: `${ctx.user.name} invited you to ${ws.name} on Loopwright`,
    text:
      `Hello,\n\n${ctx.user.name} invited you to join ${ws.name} on Loopwright as ${ROLE_LABELS[input.role].toLowerCase()}.\n\n` +
      `Accept the invitation here (it works once and expires in 7 days):\n\n${link}\n\n` +
      `If you do not have an account yet, you can create one from that page.`,
  });
  return {
    invitation: { id, email: input.email, role: input.role, projectIds: input.projectIds, invitedBy: ctx.user.name, createdAt: now, expiresAt: now + INVITE_TTL_MS },
    link,
    mailSent,
  };
}

/** Revoke a pending invitation. 404 if it is not a pending invitation of this workspace. */
export async function revokeInvitation(ctx: WorkspaceContext, invitationId: string): Promise<void> {
  await write(async (db) => {
    const rows = await db
      .update(invitations)
      .set({ revokedAt: Date.now() })
      .where(and(eq(invitations.id, invitationId), eq(invitations.workspaceId, ctx.workspace.id), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)))
      .returning({ id: invitations.id, email: invitations.email });
    if (!rows.length) throw new AppError("not_found", "That invitation was not found, or it was already accepted or revoked.");
    await auditInsert(db, { workspaceId: ctx.workspace.id, actorId: ctx.user.id, action: "member.invitation_revoked", targetType: "invitation", targetId: invitationId, data: { email: rows[0].email } });
  });
}

export type InvitationStatus = "valid" | "expired" | "used" | "revoked" | "unknown";

export interface InvitationLookup {
  status: InvitationStatus;
  email?: string;
  role?: Role;
  workspaceName?: string;
  workspaceSlug?: string;
  /** Whether an account with the invited e-mail exists (to offer sign-in rather than sign-up). */
  accountExists?: boolean;
}

const STATUS_MESSAGES: Record<Exclude<InvitationStatus, "valid">, string> = {
  expired: "This invitation has expired. Ask the person who invited you for a new one.",
  used: "This invitation has already been used. Sign in to reach the workspace.",
  revoked: "This invitation was withdrawn by the workspace. Ask for a new one if you still need access.",
  unknown: "This invitation link is not valid. Check that you copied the whole link.",
};

export function invitationStatusMessage(status: Exclude<InvitationStatus, "valid">): string {
  return STATUS_MESSAGES[status];
}

/** What an invitation link stands for, without consuming it. */
export async function lookupInvitation(token: string): Promise<InvitationLookup> {
  if (!token || token.length > 200) return { status: "unknown" };
  const db = await read();
  const inv = await db.query.invitations.findFirst({ where: eq(invitations.tokenHash, sha256Hex(token)) });
  if (!inv) return { status: "unknown" };
  const ws = await db.query.workspaces.findFirst({ where: eq(workspaces.id, inv.workspaceId) });
  const account = await db.query.users.findFirst({ where: eq(users.email, inv.email), columns: { id: true } });
  const status: InvitationStatus = inv.revokedAt ? "revoked" : inv.acceptedAt ? "used" : inv.expiresAt <= Date.now() ? "expired" : "valid";
  return { status, email: inv.email, role: inv.role, workspaceName: ws?.name, workspaceSlug: ws?.slug, accountExists: !!account };
}

/**
 * Accept an invitation as `user` (whose e-mail must be the invited one). Adds the membership
 * (and, for a client, access to the chosen projects) and uses the invitation up, atomically.
 */
export async function acceptInvitation(token: string, user: User): Promise<{ workspaceSlug: string }> {
  const hash = sha256Hex(token);
  return write(async (db) => {
    const inv = await db.query.invitations.findFirst({ where: eq(invitations.tokenHash, hash) });
    if (!inv) throw new AppError("not_found", STATUS_MESSAGES.unknown);
    if (inv.revokedAt) throw new AppError("conflict", STATUS_MESSAGES.revoked);
    if (inv.acceptedAt) throw new AppError("conflict", STATUS_MESSAGES.used);
    if (inv.expiresAt <= Date.now()) throw new AppError("conflict", STATUS_MESSAGES.expired);
    if (inv.email !== user.email) {
      throw new AppError("forbidden", `This invitation is for ${inv.email}, but you are signed in as ${user.email}. Sign in with the invited e-mail to accept it.`);
    }
    const ws = await db.query.workspaces.findFirst({ where: eq(workspaces.id, inv.workspaceId) });
    if (!ws) throw new AppError("not_found", STATUS_MESSAGES.unknown);
    const member = await db.query.memberships.findFirst({ where: and(eq(memberships.workspaceId, ws.id), eq(memberships.userId, user.id)) });
    if (member) throw new AppError("conflict", `You are already a member of ${ws.name}.`);
    await assertSeatAvailable(ws, inv.role, { countPending: false, db });
    const now = Date.now();
    const projectIds = inv.role === "client" ? inv.projectIds : [];
    const live = projectIds.length
      ? (await db.select({ id: projects.id }).from(projects).where(and(eq(projects.workspaceId, ws.id), inArray(projects.id, projectIds)))).map((p) => p.id)
      : [];
    await db.batch([
      db.update(invitations).set({ acceptedAt: now, acceptedBy: user.id }).where(and(eq(invitations.id, inv.id), isNull(invitations.acceptedAt))),
      db.insert(memberships).values({ id: newId(), workspaceId: ws.id, userId: user.id, role: inv.role, createdAt: now }),
      ...live.map((projectId) => db.insert(projectAccess).values({ projectId, userId: user.id, workspaceId: ws.id, createdAt: now })),
      auditInsert(db, { workspaceId: ws.id, actorId: user.id, action: "member.joined", targetType: "invitation", targetId: inv.id, data: { email: user.email, role: inv.role } }),
    ]);
    return { workspaceSlug: ws.slug };
  });
}
