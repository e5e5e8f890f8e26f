import { workspaceRoute } from "@/lib/auth/guard";
import { parseQuery } from "@/lib/http";
import { listReports, reportListQuerySchema } from "@/lib/reports/queries";

// GET /api/w/:slug/reports?projectId=…|calculationId=… – issued reports (every revision, superseded marked); clients: shared projects only
export const GET = workspaceRoute("report.view", async ({ req, ctx }) => ({ reports: await listReports(ctx, parseQuery(req, reportListQuerySchema)) }));
