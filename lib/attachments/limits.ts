/** Attachment limits and accepted types, shared by the server and the upload control (no Node imports). */

/** Largest attachment, bytes: 10 MB = 10 × 1024 × 1024. */
export const ATTACHMENT_MAX_BYTES = 10 * 1024 * 1024;

/** The accepted types: MIME type → extensions (first is the canonical one) and a label. */
export const ACCEPTED_TYPES = {
  "image/png": { exts: ["png"], label: "PNG image" },
  "image/jpeg": { exts: ["jpg", "jpeg"], label: "JPEG image" },
  "image/svg+xml": { exts: ["svg"], label: "SVG drawing" },
  "application/pdf": { exts: ["pdf"], label: "PDF document" },
} as const;

export type AcceptedMime = keyof typeof ACCEPTED_TYPES;

/** The types in words, for messages and the upload control. */
export const ACCEPTED_LABEL = "PNG, JPEG or SVG images and PDF documents";

/** The `accept` attribute of a file input for these types. */
export const ACCEPT_ATTR = Object.values(ACCEPTED_TYPES)
  .flatMap((t) => t.exts.map((e) => `.${e}`))
  .join(",");
