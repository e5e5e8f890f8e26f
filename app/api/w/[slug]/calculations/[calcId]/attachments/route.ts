/**
 * Attachments of one calculation (staff only: calc.view / calc.edit).
 *
 * GET  → 200 { attachments: Array<{ id, calculationId, filename, mime, size (bytes), sha256 (hex),
 *        uploadedBy: { id, name }, at (ms) }> } newest first.
 * POST multipart/form-data { file } → 201 { attachment } | 413 over 10 MB | 415 type not accepted
 *        or extension not matching the contents | 409 while the calculation is issued.
 */
import { workspaceRoute } from "@/lib/auth/guard";
import { ATTACHMENT_MAX_BYTES, addAttachment, listAttachments } from "@/lib/attachments";
import { readUpload } from "@/lib/attachments/multipart";
import { created } from "@/lib/http";

type P = { slug: string; calcId: string };

// GET /api/w/:slug/calculations/:calcId/attachments – list (no bytes)
export const GET = workspaceRoute<P>("calc.view", async ({ params, ctx }) => ({ attachments: await listAttachments(ctx, params.calcId) }));

// POST /api/w/:slug/calculations/:calcId/attachments – upload one file (type checked from its bytes)
export const POST = workspaceRoute<P>("calc.edit", async ({ req, params, ctx }) => {
  const { file } = await readUpload(req, { maxBytes: ATTACHMENT_MAX_BYTES, what: "An attachment" });
  return created({ attachment: await addAttachment(ctx, params.calcId, file) });
});
