// The parts of pdfkit 0.20 (a dependency of @react-pdf/renderer, no type package installed)
// that lib/reports/render.ts uses: a PDF document that react-pdf's renderer draws into and that
// streams out the file's bytes.
declare module "pdfkit" {
  import type { Readable } from "node:stream";
  interface PDFKitDocument extends Readable {
    _root: { data: Record<string, unknown> };
  }
  const PDFDocument: new (options: Record<string, unknown>) => PDFKitDocument;
  export default PDFDocument;
}
