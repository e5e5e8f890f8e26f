import { workspaceRoute } from "@/lib/auth/guard";
import { listHistory, summariseRevisions } from "@/lib/calculations/history";

type P = { slug: string; calcId: string };

// GET /api/w/:slug/calculations/:calcId/history – every saved change, and one summary per revision
export const GET = workspaceRoute<P>("calc.view", async ({ params, ctx }) => {
  const entries = await listHistory(ctx, params.calcId);
  return { entries, revisions: summariseRevisions(entries) };
});
