import { workspaceRoute } from "@/lib/auth/guard";
import { createCalculation, createCalculationSchema, listCalculations, listQuerySchema } from "@/lib/calculations";
import { created, parseJson, parseQuery } from "@/lib/http";

type P = { slug: string; projectId: string };

// GET /api/w/:slug/projects/:projectId/calculations – the register (?status ?pack ?q ?sort ?dir ?page ?pageSize)
export const GET = workspaceRoute<P>("calc.view", async ({ req, params, ctx }) => listCalculations(ctx, params.projectId, parseQuery(req, listQuerySchema)));

// POST /api/w/:slug/projects/:projectId/calculations – create a draft of a calculation type
export const POST = workspaceRoute<P>("calc.create", async ({ req, params, ctx }) => {
  const input = await parseJson(req, createCalculationSchema);
  return created({ calculation: await createCalculation(ctx, params.projectId, input) });
});
