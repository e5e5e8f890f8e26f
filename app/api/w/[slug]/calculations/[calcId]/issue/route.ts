import { workspaceRoute } from "@/lib/auth/guard";
import { created, parseJson } from "@/lib/http";
import { getCalculation } from "@/lib/calculations";
import { issueReport, issueSchema } from "@/lib/reports/issue";

type P = { slug: string; calcId: string };

// POST /api/w/:slug/calculations/:calcId/issue – issue the approved calculation ({ version }): signed PDF + status issued, atomically
export const POST = workspaceRoute<P>("calc.issue", async ({ req, params, ctx }) => {
  const report = await issueReport(ctx, params.calcId, await parseJson(req, issueSchema));
  return created({ report, calculation: await getCalculation(ctx, params.calcId) });
});
