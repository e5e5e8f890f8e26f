import { workspaceRoute } from "@/lib/auth/guard";
import { getCalculation, saveCalculation, saveCalculationSchema } from "@/lib/calculations";
import { parseJson } from "@/lib/http";

type P = { slug: string; calcId: string };

// GET /api/w/:slug/calculations/:calcId – one calculation with its raw inputs and last results
export const GET = workspaceRoute<P>("calc.view", async ({ params, ctx }) => ({ calculation: await getCalculation(ctx, params.calcId) }));

// PATCH /api/w/:slug/calculations/:calcId – save a draft ({ version, inputs?, title? }); 409 when stale
export const PATCH = workspaceRoute<P>("calc.edit", async ({ req, params, ctx }) => {
  const input = await parseJson(req, saveCalculationSchema);
  return { calculation: await saveCalculation(ctx, params.calcId, input) };
});
