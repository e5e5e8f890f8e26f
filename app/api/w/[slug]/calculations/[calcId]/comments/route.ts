import { workspaceRoute } from "@/lib/auth/guard";
import { addComment, commentSchema, listComments } from "@/lib/calculations/workflow";
import { created, parseJson } from "@/lib/http";

type P = { slug: string; calcId: string };

// GET /api/w/:slug/calculations/:calcId/comments – review comments, oldest first
export const GET = workspaceRoute<P>("calc.view", async ({ params, ctx }) => ({ comments: await listComments(ctx, params.calcId) }));

// POST /api/w/:slug/calculations/:calcId/comments – add a comment
export const POST = workspaceRoute<P>("calc.edit", async ({ req, params, ctx }) => {
  const { body } = await parseJson(req, commentSchema);
  return created({ id: await addComment(ctx, params.calcId, body) });
});
