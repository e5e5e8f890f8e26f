import { workspaceRoute } from "@/lib/auth/guard";
import { deletePart, getPart, updatePart, updatePartSchema } from "@/lib/parts";
import { parseJson } from "@/lib/http";

type P = { slug: string; partId: string };

// GET /api/w/:slug/parts/:partId – one part with its SI parameters
export const GET = workspaceRoute<P>("parts.view", async ({ params, ctx }) => ({ part: await getPart(ctx, params.partId) }));

// PATCH /api/w/:slug/parts/:partId – rename, change values (merged, then validated whole) or notes
export const PATCH = workspaceRoute<P>("parts.manage", async ({ req, params, ctx }) => ({ part: await updatePart(ctx, params.partId, await parseJson(req, updatePartSchema)) }));

// DELETE /api/w/:slug/parts/:partId – remove from the library (calculations keep their snapshots)
export const DELETE = workspaceRoute<P>("parts.manage", async ({ params, ctx }) => deletePart(ctx, params.partId));
