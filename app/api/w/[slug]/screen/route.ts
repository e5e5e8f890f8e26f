import { z } from "zod";
import { workspaceRoute } from "@/lib/auth/guard";
import { screenParts } from "@/lib/calculations/screening";
import { parseJson } from "@/lib/http";
import type { RawInputs } from "@/lib/calc/core/types";

const body = z.object({
  typeId: z.string({ error: "typeId is required" }).min(1, "typeId is required").max(100),
  inputs: z.record(z.string(), z.unknown(), { error: "inputs must be an object of field values" }),
});

// POST /api/w/:slug/screen – run the calculation with every library part of its kind, ranked by worst margin
export const POST = workspaceRoute("calc.view", async ({ req, ctx }) => {
  const { typeId, inputs } = await parseJson(req, body);
  return screenParts(ctx, typeId, inputs as RawInputs);
});
