import { z } from "zod";
import { workspaceRoute } from "@/lib/auth/guard";
import { listParts, partKindSchema } from "@/lib/parts";
import { csvResponse } from "@/lib/parts/http";
import { exportCsv } from "@/lib/parts/csv";
import { parseQuery } from "@/lib/http";

const query = z.object({ kind: partKindSchema });

// GET /api/w/:slug/parts/export?kind=opamp|reference – the library as CSV (formula-escaped, re-importable)
export const GET = workspaceRoute("parts.view", async ({ req, ctx }) => {
  const { kind } = parseQuery(req, query);
  const day = new Date().toISOString().slice(0, 10);
  return csvResponse(exportCsv(kind, await listParts(ctx, kind)), `${ctx.workspace.slug}-${kind === "opamp" ? "opamps" : "references"}-${day}.csv`);
});
