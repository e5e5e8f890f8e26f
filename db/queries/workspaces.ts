/** Workspace and membership queries. Everything a member sees is scoped by workspace id. */
import { and, asc, eq, inArray } from "drizzle-orm";
import { read } from "../write";
import { memberships, users, workspaces, type Role, type Workspace } from "../schema";

export async function getWorkspaceBySlug(slug: string): Promise<Workspace | undefined> {
  const db = await read();
  return db.query.workspaces.findFirst({ where: eq(workspaces.slug, slug) });
}

export async function getWorkspaceById(id: string): Promise<Workspace | undefined> {
  const db = await read();
  return db.query.workspaces.findFirst({ where: eq(workspaces.id, id) });
}

/** The user's role in a workspace, or undefined when they are not a member. */
export async function getMembership(workspaceId: string, userId: string) {
  const db = await read();
  return db.query.memberships.findFirst({
    where: and(eq(memberships.workspaceId, workspaceId), eq(memberships.userId, userId)),
  });
}

/** Every workspace the user belongs to, with their role, oldest first. */
export async function listWorkspacesForUser(userId: string): Promise<Array<{ workspace: Workspace; role: Role }>> {
  const db = await read();
  const rows = await db
    .select({ workspace: workspaces, role: memberships.role })
    .from(memberships)
    .innerJoin(workspaces, eq(memberships.workspaceId, workspaces.id))
    .where(eq(memberships.userId, userId))
    .orderBy(asc(memberships.createdAt));
  return rows;
}

export interface MemberRow {
  membershipId: string;
  userId: string;
  name: string;
  email: string;
  role: Role;
  joinedAt: number;
}

/** Members of a workspace, optionally only those with the given roles. */
export async function listMembers(workspaceId: string, roles?: Role[]): Promise<MemberRow[]> {
  const db = await read();
  const where = roles
    ? and(eq(memberships.workspaceId, workspaceId), inArray(memberships.role, roles))
    : eq(memberships.workspaceId, workspaceId);
  return db
    .select({
      membershipId: memberships.id,
      userId: users.id,
      name: users.name,
      email: users.email,
      role: memberships.role,
      joinedAt: memberships.createdAt,
    })
    .from(memberships)
    .innerJoin(users, eq(memberships.userId, users.id))
    .where(where)
    .orderBy(asc(users.name));
}
