import { z } from "zod";
import { workspaceRoute } from "@/lib/auth/guard";
import { createProject, createProjectSchema, listProjects } from "@/lib/projects";
import { created, parseJson, parseQuery } from "@/lib/http";

const listQuery = z.object({ archived: z.enum(["include", "exclude"], { error: "archived must be include or exclude" }).default("exclude") });

// GET /api/w/:slug/projects – the projects the member may see (?archived=include for all)
export const GET = workspaceRoute("project.view", async ({ req, ctx }) => {
  const q = parseQuery(req, listQuery);
  return { projects: await listProjects(ctx, { includeArchived: q.archived === "include" }) };
});

// POST /api/w/:slug/projects – create a project
export const POST = workspaceRoute("project.create", async ({ req, ctx }) => {
  const input = await parseJson(req, createProjectSchema);
  return created({ project: await createProject(ctx, input) });
});
