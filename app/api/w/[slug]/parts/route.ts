/**
 * The parts library of a workspace (op-amps and references), as the calculation sheet's part
 * picker reads it.
 *
 * GET /api/w/:slug/parts?kind=opamp|reference (kind optional: both) →
 *   200 { parts: Array<{
 *     id: string;                 // library id: the RawPart's partId
 *     kind: "opamp" | "reference";
 *     name: string;               // the RawPart's name
 *     values: Record<string, number | string>;
 *                                 // the full parameter set in SI base units, keys as in
 *                                 // lib/calc/core/parts.ts (OPAMP_FIELDS / REFERENCE_FIELDS;
 *                                 // references also `topology`); %/ppm fields as fractions.
 *                                 // The sheet snapshots it as RawPart { partId: id, name, values }.
 *     notes: string;
 *     createdAt: number; updatedAt: number;   // ms since the epoch
 *   }> }   sorted by kind, then name.
 *
 * POST /api/w/:slug/parts { kind, name, values: { gbw: "10M", slewRate: "0.5 V/µs", … }, notes? }
 *   Values are text in engineering notation (parsed like the form) or numbers in SI units.
 *   → 201 { part } | 422 { error: { fields: { gbw: "gbw (Gain-bandwidth product): …" } } }
 *   | 409 when the name is already used for that kind (compared without regard to case).
 */
import { workspaceRoute } from "@/lib/auth/guard";
import { createPart, createPartSchema, listParts, partListQuery } from "@/lib/parts";
import { created, parseJson, parseQuery } from "@/lib/http";

// GET /api/w/:slug/parts – the library (?kind=opamp|reference), each part with its SI parameters
export const GET = workspaceRoute("parts.view", async ({ req, ctx }) => ({ parts: await listParts(ctx, parseQuery(req, partListQuery).kind) }));

// POST /api/w/:slug/parts – add a part (values in engineering notation or SI numbers)
export const POST = workspaceRoute("parts.manage", async ({ req, ctx }) => created({ part: await createPart(ctx, await parseJson(req, createPartSchema)) }));
