import { workspaceRoute } from "@/lib/auth/guard";
import { getReportPdf, pdfResponse } from "@/lib/reports/queries";

type P = { slug: string; reportId: string };

// GET /api/w/:slug/reports/:reportId/pdf – the signed PDF, bytes exactly as stored; clients: shared projects only
export const GET = workspaceRoute<P>("report.view", async ({ params, ctx }) => pdfResponse(await getReportPdf(ctx, params.reportId)));
