import { workspaceRoute } from "@/lib/auth/guard";
import { listProjectClients, setProjectAccess, shareSchema } from "@/lib/projects";
import { parseJson } from "@/lib/http";

type P = { slug: string; projectId: string };

// GET /api/w/:slug/projects/:projectId/access – client members and whether each sees the project
export const GET = workspaceRoute<P>("project.share", async ({ params, ctx }) => ({ clients: await listProjectClients(ctx, params.projectId) }));

// POST /api/w/:slug/projects/:projectId/access – share the project with a client member
export const POST = workspaceRoute<P>("project.share", async ({ req, params, ctx }) => {
  const { userId } = await parseJson(req, shareSchema);
  await setProjectAccess(ctx, params.projectId, userId, true);
  return { ok: true };
});

// DELETE /api/w/:slug/projects/:projectId/access – stop sharing the project with a client member
export const DELETE = workspaceRoute<P>("project.share", async ({ req, params, ctx }) => {
  const { userId } = await parseJson(req, shareSchema);
  await setProjectAccess(ctx, params.projectId, userId, false);
  return { ok: true };
});
