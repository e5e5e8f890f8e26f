import { z } from "zod";
import { workspaceRoute } from "@/lib/auth/guard";
import { partKindSchema } from "@/lib/parts";
import { addStarterParts } from "@/lib/parts/starter";
import { created, parseJson } from "@/lib/http";

const body = z.object({ kind: partKindSchema });

// POST /api/w/:slug/parts/starter – add the generic example parts of a kind (names already in the library are skipped)
export const POST = workspaceRoute("parts.manage", async ({ req, ctx }) => {
  const { kind } = await parseJson(req, body);
  return created(await addStarterParts(ctx, kind));
});
