/**
 * What an uploaded file really is, from its bytes: PNG, JPEG and PDF by their signatures (the
 * `file-type` package), SVG by its XML text. The name's extension must agree with the contents
 * and the browser's content type is ignored, so a PDF renamed .png or a text file renamed .pdf is
 * refused with a message that says what the file is.
 *
 * SVG is accepted because schematics are often drawn in it, but it is text that can carry
 * scripts: SVGs containing a script element, event-handler attributes, javascript: URLs or
 * entity declarations are refused, and every attachment is served as a download with a
 * sandboxing Content-Security-Policy and nosniff, never inline (see the download route).
 */
import { fileTypeFromBuffer } from "file-type";
import { AppError } from "@/lib/errors";
import { ACCEPTED_LABEL, ACCEPTED_TYPES, type AcceptedMime } from "./limits";

export { ACCEPTED_LABEL, ACCEPTED_TYPES, type AcceptedMime } from "./limits";

/** The type detected from the bytes. */
export interface DetectedType {
  mime: AcceptedMime;
  ext: string;
  label: string;
}

function extOf(name: string): string | undefined {
  const base = name.split(/[\\/]/).pop() ?? name;
  const i = base.lastIndexOf(".");
  return i > 0 && i < base.length - 1 ? base.slice(i + 1).toLowerCase() : undefined;
}

function utf8(bytes: Uint8Array): string | undefined {
  if (bytes.includes(0)) return undefined;
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    return undefined;
  }
}

/**
 * Whether the text is an SVG document: an optional BOM, XML declaration, comments and doctype,
 * then an `<svg` root element.
 */
export function looksLikeSvg(text: string): boolean {
  let s = text.replace(/^\ufeff/, "");
  for (;;) {
    const before = s;
    s = s.replace(/^\s+/, "");
    if (s.startsWith("<?xml")) s = s.slice(Math.max(s.indexOf("?>") + 2, 5));
    else if (s.startsWith("<!--")) {
      const end = s.indexOf("-->");
      if (end < 0) return false;
      s = s.slice(end + 3);
    } else if (/^<!DOCTYPE\s+svg\b/i.test(s)) {
      const end = s.indexOf(">");
      if (end < 0) return false;
      s = s.slice(end + 1);
    }
    if (s === before) break;
  }
  return /^<svg[\s>/]/.test(s);
}

/** Why an SVG is refused (active content), or undefined when it is plain drawing markup. */
export function svgProblem(text: string): string | undefined {
  if (/<script[\s>/]/i.test(text)) return "it contains a script";
  if (/<!ENTITY/i.test(text)) return "it declares XML entities";
  if (/\son[a-z]+\s*=/i.test(text)) return "it contains event-handler attributes (onload=…)";
  if (/(?:href|src)\s*=\s*["']?\s*(?:javascript|data:text\/html)/i.test(text)) return "it contains a javascript: link";
  if (/<foreignObject[\s>/]/i.test(text)) return "it embeds HTML (foreignObject)";
  return undefined;
}

/** A plain-words description of what the bytes are, for the refusal message. */
async function describe(bytes: Uint8Array): Promise<string> {
  const ft = await fileTypeFromBuffer(bytes);
  if (ft) return `a ${ft.ext.toUpperCase()} file (${ft.mime})`;
  return utf8(bytes) !== undefined ? "plain text" : "of a type we cannot recognise";
}

/**
 * The accepted type of `bytes`, checked against the extension of `filename`.
 * @throws 415 for a type we do not accept, or when the extension names another type than the
 *   contents; 422 for an SVG with active content
 */
export async function detectType(filename: string, bytes: Uint8Array): Promise<DetectedType> {
  const ext = extOf(filename);
  let mime: AcceptedMime | undefined;
  const ft = await fileTypeFromBuffer(bytes);
  if (ft && ft.mime in ACCEPTED_TYPES) mime = ft.mime as AcceptedMime;
  else if (!ft || ft.ext === "xml") {
    const text = utf8(bytes);
    if (text !== undefined && looksLikeSvg(text)) {
      const problem = svgProblem(text);
      if (problem) {
        throw new AppError("invalid_input", `"${filename}" is an SVG drawing, but ${problem}; attachments may not carry active content. Export the drawing without it, or as PNG or PDF.`, {
          fields: { file: `SVG with active content (${problem})` },
        });
      }
      mime = "image/svg+xml";
    }
  }
  if (!mime) {
    const what = await describe(bytes);
    const named = ext ? ` (the name ends in .${ext}, but the contents are ${what})` : ` (the contents are ${what})`;
    throw new AppError("unsupported_media_type", `"${filename}" is not one of the accepted types${named}. Attach ${ACCEPTED_LABEL}.`, {
      fields: { file: `contents are ${what}, not ${ACCEPTED_LABEL}` },
    });
  }
  const t = ACCEPTED_TYPES[mime];
  if (ext !== undefined && !(t.exts as readonly string[]).includes(ext)) {
    throw new AppError("unsupported_media_type", `"${filename}" is named .${ext}, but its contents are a ${t.label}. Rename it to .${t.exts[0]} (or upload the file the name promises) and try again.`, {
      fields: { file: `extension .${ext} does not match the contents (${t.label})` },
    });
  }
  return { mime, ext: ext ?? t.exts[0], label: t.label };
}

/**
 * A file name safe to store and to send in Content-Disposition: the last path segment, without
 * control characters, quotes or characters that file systems refuse, at most 120 characters,
 * ending in `ext`.
 */
export function safeFilename(name: string, ext: string): string {
  let base = (name.split(/[\\/]/).pop() ?? "")
    .normalize("NFC")
    .replace(/[\u0000-\u001f\u007f-\u009f"<>:*?|\\/]/g, "")
    .replace(/\s+/g, " ")
    .replace(/^[\s.]+|[\s.]+$/g, "");
  const current = extOf(base);
  if (current === undefined) base = `${base || "attachment"}.${ext}`;
  if (base.length > 120) {
    const e = `.${extOf(base) ?? ext}`;
    base = base.slice(0, 120 - e.length).replace(/[\s.]+$/, "") + e;
  }
  return base;
}

/** Content-Disposition for a download: an ASCII fallback name and the UTF-8 name (RFC 6266). */
export function contentDisposition(filename: string): string {
  const ascii = filename.replace(/[^\x20-\x7e]/g, "_").replace(/["\\%;]/g, "_");
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(filename).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`)}`;
}
