import { z } from "zod";
import { workspaceRoute } from "@/lib/auth/guard";
import { auditPage } from "@/lib/audit";
import { parseQuery } from "@/lib/http";

const query = z.object({
  before: z.coerce.number({ error: "before must be a time in ms" }).int().positive().optional(),
  limit: z.coerce.number({ error: "limit must be a number" }).int().min(1, "limit must be at least 1").max(500, "limit must be at most 500").default(100),
});

// GET /api/w/:slug/audit – the workspace's audit log, newest first (?before=ms&limit=n)
export const GET = workspaceRoute("audit.view", async ({ req, ctx }) => {
  const q = parseQuery(req, query);
  return { events: await auditPage(ctx.workspace.id, q) };
});
