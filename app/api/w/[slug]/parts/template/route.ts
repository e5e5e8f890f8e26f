import { z } from "zod";
import { workspaceRoute } from "@/lib/auth/guard";
import { partKindSchema } from "@/lib/parts";
import { csvResponse } from "@/lib/parts/http";
import { templateCsv } from "@/lib/parts/csv";
import { parseQuery } from "@/lib/http";

const query = z.object({ kind: partKindSchema });

// GET /api/w/:slug/parts/template?kind=opamp|reference – the CSV template (header + one example row)
export const GET = workspaceRoute("parts.view", async ({ req }) => {
  const { kind } = parseQuery(req, query);
  return csvResponse(templateCsv(kind), `loopwright-${kind === "opamp" ? "opamps" : "references"}-template.csv`);
});
