/**
 * POST /api/w/:slug/parts/import – CSV import in two steps (see lib/parts/import.ts).
 *
 * Body: multipart/form-data { kind, file, confirm? } or JSON { kind, csv, confirm? }.
 * - without `confirm`: preview, nothing written → 200 { preview: ImportPreview }
 *   (lib/parts/csv.ts: total / valid / invalid counts, rows with per-field errors, previewHash)
 * - with `confirm` = the preview's previewHash and the same file: imports exactly the valid rows
 *   in one atomic batch → 201 { result: { kind, imported, skipped } }; 409 if the file or the
 *   library changed since the preview (nothing imported).
 * File-level problems: 413 (over 2 MB or 20,000 rows), 422 (header unusable, not UTF-8, empty).
 */
import { workspaceRoute } from "@/lib/auth/guard";
import { readImportRequest } from "@/lib/parts/http";
import { confirmImport, previewImport } from "@/lib/parts/import";
import { created } from "@/lib/http";

// POST /api/w/:slug/parts/import – preview a CSV (no write), or confirm it with the preview's hash
export const POST = workspaceRoute("parts.manage", async ({ req, ctx }) => {
  const { kind, text, confirm } = await readImportRequest(req);
  if (confirm === undefined) return { preview: await previewImport(ctx, kind, text) };
  return created({ result: await confirmImport(ctx, kind, text, confirm) });
});
