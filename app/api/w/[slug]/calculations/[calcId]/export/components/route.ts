import { workspaceRoute } from "@/lib/auth/guard";
import { exportComponents, exportResponse } from "@/lib/reports/exports";

type P = { slug: string; calcId: string };

// GET /api/w/:slug/calculations/:calcId/export/components – the component list as CSV (formula-escaped, SI values)
export const GET = workspaceRoute<P>("calc.view", async ({ params, ctx }) => exportResponse(await exportComponents(ctx, params.calcId)));
