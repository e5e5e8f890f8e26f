import { workspaceRoute } from "@/lib/auth/guard";
import { getReport } from "@/lib/reports/queries";

type P = { slug: string; reportId: string };

// GET /api/w/:slug/reports/:reportId – one issued report (who signed off, code, hash, superseded); clients: shared projects only
export const GET = workspaceRoute<P>("report.view", async ({ params, ctx }) => ({ report: await getReport(ctx, params.reportId) }));
