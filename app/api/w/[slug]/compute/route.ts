import { z } from "zod";
import { workspaceRoute } from "@/lib/auth/guard";
import { assertPackUnlocked } from "@/lib/billing/access";
import { fieldMap, requireCalcType, runCompute } from "@/lib/calculations/compute";
import { AppError } from "@/lib/errors";
import { parseJson } from "@/lib/http";
import type { RawInputs } from "@/lib/calc/core/types";

const body = z.object({
  typeId: z.string({ error: "typeId is required" }).min(1, "typeId is required").max(100),
  inputs: z.record(z.string(), z.unknown(), { error: "inputs must be an object of field values" }),
});

// POST /api/w/:slug/compute – run a calculation type on raw inputs (402 when its pack is locked, 422 naming bad fields)
export const POST = workspaceRoute("calc.view", async ({ req, ctx }) => {
  const { typeId, inputs } = await parseJson(req, body);
  const type = requireCalcType(typeId);
  assertPackUnlocked(ctx.workspace, type.pack);
  const r = runCompute(type, inputs as RawInputs);
  if (!r.ok) throw new AppError("invalid_input", r.errors.map((e) => e.message).slice(0, 3).join(" "), { fields: fieldMap(r.errors) });
  return { typeId: type.id, engineVersion: type.version, output: r.output, summary: r.summary };
});
