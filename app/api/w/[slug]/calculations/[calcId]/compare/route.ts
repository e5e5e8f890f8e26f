import { z } from "zod";
import { workspaceRoute } from "@/lib/auth/guard";
import { compareEntries } from "@/lib/calculations/history";
import { parseQuery } from "@/lib/http";

type P = { slug: string; calcId: string };
const query = z.object({ a: z.string({ error: "a (a history entry id) is required" }).min(1).max(64), b: z.string({ error: "b (a history entry id) is required" }).min(1).max(64) });

// GET /api/w/:slug/calculations/:calcId/compare?a=…&b=… – changed inputs and results between two saved states
export const GET = workspaceRoute<P>("calc.view", async ({ req, params, ctx }) => {
  const { a, b } = parseQuery(req, query);
  return compareEntries(ctx, params.calcId, a, b);
});
