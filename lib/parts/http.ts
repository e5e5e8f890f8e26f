/** Request and response helpers of the parts CSV routes. */
import { z } from "zod";
import { AppError, fromZod } from "@/lib/errors";
import { parseJson } from "@/lib/http";
import { contentDisposition } from "@/lib/attachments/detect";
import { isMultipart, readUpload } from "@/lib/attachments/multipart";
import { CSV_MAX_BYTES, decodeCsv } from "./csv";
import { partKindSchema } from "./index";
import type { PartKind } from "./fields";

/** A CSV download: UTF-8, as an attachment, never sniffed. */
export function csvResponse(text: string, filename: string): Response {
  return new Response(text, {
    headers: {
      "content-type": "text/csv; charset=utf-8",
      "content-disposition": contentDisposition(filename),
      "x-content-type-options": "nosniff",
      "cache-control": "private, no-store",
    },
  });
}

const previewHash = z.string().regex(/^[0-9a-f]{64}$/, "confirm must be the previewHash of the preview (64 hex digits)");

const jsonImport = z.object({
  kind: partKindSchema,
  csv: z.string({ error: "csv is required (the file's text)" }),
  confirm: previewHash.optional(),
});

const formImport = z.object({ kind: partKindSchema, confirm: previewHash.optional() });

/** The import request: kind, the CSV text and the preview hash when confirming. */
export async function readImportRequest(req: Request): Promise<{ kind: PartKind; text: string; confirm?: string }> {
  if (isMultipart(req)) {
    const { file, fields } = await readUpload(req, { maxBytes: CSV_MAX_BYTES, what: "A parts CSV file" });
    const parsed = formImport.safeParse({ kind: fields.kind, confirm: fields.confirm || undefined });
    if (!parsed.success) throw fromZod(parsed.error);
    return { kind: parsed.data.kind, text: decodeCsv(file.bytes), confirm: parsed.data.confirm };
  }
  if (!(req.headers.get("content-type") ?? "").toLowerCase().includes("json")) {
    throw new AppError("unsupported_media_type", 'Upload the CSV as a multipart form (fields "kind" and "file") or send JSON { kind, csv }.');
  }
  // JSON escapes can double the size of the text; refuse clearly larger bodies before reading.
  const declared = Number(req.headers.get("content-length") ?? NaN);
  if (Number.isFinite(declared) && declared > 2 * CSV_MAX_BYTES + 4096) {
    throw new AppError("payload_too_large", `A parts CSV file may be at most ${CSV_MAX_BYTES / 1024 / 1024} MB.`, { fields: { file: `must be at most ${CSV_MAX_BYTES / 1024 / 1024} MB` } });
  }
  const body = await parseJson(req, jsonImport);
  return { kind: body.kind, text: body.csv, confirm: body.confirm };
}
