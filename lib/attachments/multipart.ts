/**
 * Reading one uploaded file from a multipart/form-data request without trusting its size: the
 * declared Content-Length is checked first, then the body is read with a hard cap (so a chunked
 * upload without a length cannot fill the memory), then the file part's own size is checked.
 * The browser's content type and the file name are returned as given; callers decide the type
 * from the bytes.
 */
import { AppError } from "@/lib/errors";

/** Room for the multipart boundaries and the other form fields, bytes. */
const FORM_OVERHEAD = 64 * 1024;

/** One uploaded file and the form's other text fields. */
export interface UploadedForm {
  file: { name: string; bytes: Uint8Array };
  fields: Record<string, string>;
}

/** "10 MB" for 10 × 1024 × 1024 bytes. */
export function formatLimit(bytes: number): string {
  return bytes >= 1024 * 1024 ? `${+(bytes / 1024 / 1024).toFixed(2)} MB` : `${+(bytes / 1024).toFixed(1)} kB`;
}

/** Whether the request carries a multipart form. */
export function isMultipart(req: Request): boolean {
  return (req.headers.get("content-type") ?? "").toLowerCase().startsWith("multipart/form-data");
}

function tooLarge(what: string, maxBytes: number, size?: number): AppError {
  const got = size !== undefined ? ` (this one is ${formatLimit(size)}, ${size.toLocaleString("en")} bytes)` : "";
  return new AppError("payload_too_large", `${what} may be at most ${formatLimit(maxBytes)} (${maxBytes.toLocaleString("en")} bytes)${got}.`, {
    fields: { file: `must be at most ${formatLimit(maxBytes)}` },
  });
}

async function readCapped(req: Request, cap: number, what: string, maxBytes: number): Promise<Uint8Array> {
  if (!req.body) return new Uint8Array(0);
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > cap) {
      await reader.cancel().catch(() => undefined);
      throw tooLarge(what, maxBytes);
    }
    chunks.push(value);
  }
  const out = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}

/**
 * The file in form field `field` (default "file") and the other text fields.
 * @param maxBytes largest file accepted, bytes
 * @param what how the message names the file, e.g. "An attachment"
 * @throws 415 when the body is not multipart, 413 when too large, 400 when malformed, 422 when
 *   the file field is missing or empty
 */
export async function readUpload(req: Request, opts: { maxBytes: number; what: string; field?: string }): Promise<UploadedForm> {
  const field = opts.field ?? "file";
  const type = req.headers.get("content-type") ?? "";
  if (!isMultipart(req)) {
    throw new AppError("unsupported_media_type", `Send the file as a multipart form upload (form field "${field}").`, { fields: { [field]: "is required" } });
  }
  const cap = opts.maxBytes + FORM_OVERHEAD;
  const declared = Number(req.headers.get("content-length") ?? NaN);
  if (Number.isFinite(declared) && declared > cap) throw tooLarge(opts.what, opts.maxBytes);
  const body = await readCapped(req, cap, opts.what, opts.maxBytes);
  let form: FormData;
  try {
    form = await new Response(body as BodyInit, { headers: { "content-type": type } }).formData();
  } catch {
    throw new AppError("bad_request", "The upload is not a well-formed multipart form. Try again from the upload control.");
  }
  const entry = form.get(field);
  if (!entry || typeof entry === "string") throw new AppError("invalid_input", `Choose a file to upload (form field "${field}").`, { fields: { [field]: "is required" } });
  if (entry.size > opts.maxBytes) throw tooLarge(opts.what, opts.maxBytes, entry.size);
  if (entry.size === 0) throw new AppError("invalid_input", `The file "${entry.name}" is empty.`, { fields: { [field]: "is empty" } });
  const fields: Record<string, string> = {};
  for (const [k, v] of form.entries()) if (typeof v === "string") fields[k] = v;
  return { file: { name: entry.name, bytes: new Uint8Array(await entry.arrayBuffer()) }, fields };
}
