import { userRoute } from "@/lib/auth/guard";
import { listWorkspacesForUser } from "@/db/queries/workspaces";
import { createWorkspace } from "@/lib/auth/accounts";
import { workspaceNameSchema } from "@/lib/auth/schemas";
import { created, parseJson } from "@/lib/http";
import { z } from "zod";

// GET /api/me/workspaces – the workspaces the signed-in user belongs to, with their role
export const GET = userRoute(async ({ user }) => {
  const rows = await listWorkspacesForUser(user.id);
  return { workspaces: rows.map((r) => ({ slug: r.workspace.slug, name: r.workspace.name, role: r.role })) };
});

// POST /api/me/workspaces – create another workspace, owned by the caller
export const POST = userRoute(async ({ req, user }) => {
  const { name } = await parseJson(req, z.object({ name: workspaceNameSchema }));
  const ws = await createWorkspace(user.id, name);
  return created({ workspace: { slug: ws.slug, name } });
});
