import { workspaceRoute } from "@/lib/auth/guard";
import { parseJson } from "@/lib/http";
import { monteCarloBody, monteCarloStream, prepareMonteCarlo } from "./run";

// POST /api/w/:slug/monte-carlo – a filter's Monte Carlo with up to 100,000 trials, streamed as NDJSON progress lines and a result line
export const POST = workspaceRoute("calc.view", async ({ req, ctx }) => monteCarloStream(prepareMonteCarlo(ctx, await parseJson(req, monteCarloBody)), req.signal));
