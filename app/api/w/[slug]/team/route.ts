import { z } from "zod";
import { workspaceRoute } from "@/lib/auth/guard";
import { listMembers } from "@/db/queries/workspaces";
import { parseQuery } from "@/lib/http";

const query = z.object({ role: z.enum(["checker", "reviewer", "staff"], { error: "role must be checker, reviewer or staff" }).default("staff") });

// GET /api/w/:slug/team – staff names for pickers (e.g. choosing a checker); no e-mails, no clients
export const GET = workspaceRoute("team.list", async ({ req, ctx }) => {
  const { role } = parseQuery(req, query);
  const roles = role === "checker" ? (["checker"] as const) : role === "reviewer" ? (["owner", "checker"] as const) : (["owner", "engineer", "checker"] as const);
  const rows = await listMembers(ctx.workspace.id, [...roles]);
  return { team: rows.map((m) => ({ userId: m.userId, name: m.name, role: m.role })) };
});
