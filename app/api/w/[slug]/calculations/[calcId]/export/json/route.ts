import { workspaceRoute } from "@/lib/auth/guard";
import { contentDisposition } from "@/lib/reports/queries";
import { exportJson } from "@/lib/reports/exports";

type P = { slug: string; calcId: string };

// GET /api/w/:slug/calculations/:calcId/export/json – raw inputs, parsed SI inputs, results and engine version as JSON
export const GET = workspaceRoute<P>("calc.view", async ({ params, ctx }) => {
  const { data, filename } = await exportJson(ctx, params.calcId);
  return Response.json(data, { headers: { "content-disposition": contentDisposition(filename), "cache-control": "private, no-store" } });
});
