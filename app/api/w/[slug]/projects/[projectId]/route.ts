import { workspaceRoute } from "@/lib/auth/guard";
import { getProject, updateProject, updateProjectSchema } from "@/lib/projects";
import { parseJson } from "@/lib/http";

type P = { slug: string; projectId: string };

// GET /api/w/:slug/projects/:projectId – one project
export const GET = workspaceRoute<P>("project.view", async ({ params, ctx }) => ({ project: await getProject(ctx, params.projectId) }));

// PATCH /api/w/:slug/projects/:projectId – rename, edit details, archive or restore
export const PATCH = workspaceRoute<P>("project.update", async ({ req, params, ctx }) => {
  const input = await parseJson(req, updateProjectSchema);
  return { project: await updateProject(ctx, params.projectId, input) };
});
