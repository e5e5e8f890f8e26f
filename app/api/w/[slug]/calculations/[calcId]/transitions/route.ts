import { workspaceRoute } from "@/lib/auth/guard";
import { transition, transitionSchema } from "@/lib/calculations/workflow";
import { parseJson } from "@/lib/http";

type P = { slug: string; calcId: string };

// POST /api/w/:slug/calculations/:calcId/transitions – submit, return, approve, reopen or revise (each checks its own role)
export const POST = workspaceRoute<P>("calc.view", async ({ req, params, ctx }) => {
  const input = await parseJson(req, transitionSchema);
  return { calculation: await transition(ctx, params.calcId, input) };
});
