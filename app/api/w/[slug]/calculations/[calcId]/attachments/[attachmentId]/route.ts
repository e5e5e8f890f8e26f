import { workspaceRoute } from "@/lib/auth/guard";
import { deleteAttachment, getAttachmentFile } from "@/lib/attachments";
import { contentDisposition } from "@/lib/attachments/detect";

type P = { slug: string; calcId: string; attachmentId: string };

// GET /api/w/:slug/calculations/:calcId/attachments/:attachmentId – download the bytes (always as a file, never inline)
export const GET = workspaceRoute<P>("calc.view", async ({ params, ctx }) => {
  const a = await getAttachmentFile(ctx, params.calcId, params.attachmentId);
  return new Response(new Uint8Array(a.data), {
    headers: {
      "content-type": a.mime,
      "content-length": String(a.data.byteLength),
      "content-disposition": contentDisposition(a.filename),
      "x-content-type-options": "nosniff",
      // An SVG opened from here can run nothing: no sources, sandboxed, no framing.
      "content-security-policy": "default-src 'none'; style-src 'unsafe-inline'; sandbox; frame-ancestors 'none'",
      "cache-control": "private, no-store",
      etag: `"${a.sha256}"`,
      "x-checksum-sha256": a.sha256,
    },
  });
});

// DELETE /api/w/:slug/calculations/:calcId/attachments/:attachmentId – delete (409 while issued)
export const DELETE = workspaceRoute<P>("calc.edit", async ({ params, ctx }) => deleteAttachment(ctx, params.calcId, params.attachmentId));
