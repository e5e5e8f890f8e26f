import { workspaceRoute } from "@/lib/auth/guard";
import { parseQuery } from "@/lib/http";
import { exportNetlist, exportResponse, netlistQuerySchema } from "@/lib/reports/exports";

type P = { slug: string; calcId: string };

// GET /api/w/:slug/calculations/:calcId/export/netlist?model=ideal|single-pole – the SPICE netlist (404 for types without one)
export const GET = workspaceRoute<P>("calc.view", async ({ req, params, ctx }) => exportResponse(await exportNetlist(ctx, params.calcId, parseQuery(req, netlistQuerySchema).model)));
