/**
 * Real small files made in the test, byte by byte from the formats' specifications, and direct
 * database fixtures for attachments.
 *
 * - PNG: signature, IHDR, one zlib-compressed IDAT, IEND, each chunk with its CRC-32
 *   (ISO/IEC 15948:2004 / W3C PNG specification, sections 5.2–5.6 and 11.2).
 * - PDF: one empty page with a correct cross-reference table (ISO 32000-1:2008, 7.5).
 * - JPEG: SOI, APP0 "JFIF" and EOI markers (enough for the signature check, not a picture).
 */
import zlib from "node:zlib";
import { eq } from "drizzle-orm";
import { write, read } from "@/db/write";
import { attachments, calculations } from "@/db/schema";
import { sha256Hex } from "@/lib/ids";

const CRC_TABLE = (() => {
  const t = new Uint32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    t[n] = c >>> 0;
  }
  return t;
})();

function crc32(buf: Buffer): number {
  let c = 0xffffffff;
  for (const b of buf) c = CRC_TABLE[(c ^ b) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

function chunk(type: string, data: Buffer): Buffer {
  const len = Buffer.alloc(4);
  len.writeUInt32BE(data.length);
  const td = Buffer.concat([Buffer.from(type, "ascii"), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(crc32(td));
  return Buffer.concat([len, td, crc]);
}

/** A real RGB PNG of `w` × `h` pixels (a copper-coloured square). */
export function makePng(w = 2, h = 2): Buffer {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(w, 0);
  ihdr.writeUInt32BE(h, 4);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 2; // colour type: truecolour
  const raw = Buffer.alloc((w * 3 + 1) * h);
  for (let y = 0; y < h; y++) for (let x = 0; x < w; x++) raw.set([0xb8, 0x73, 0x33], y * (w * 3 + 1) + 1 + x * 3);
  return Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), chunk("IHDR", ihdr), chunk("IDAT", zlib.deflateSync(raw)), chunk("IEND", Buffer.alloc(0))]);
}

/** A real one-page PDF with a correct xref table. */
export function makePdf(): Buffer {
  const objects = [
    "<< /Type /Catalog /Pages 2 0 R >>",
    "<< /Type /Pages /Kids [3 0 R] /Count 1 >>",
    "<< /Type /Page /Parent 2 0 R /MediaBox [0 0 200 100] /Contents 4 0 R /Resources << >> >>",
    "<< /Length 0 >>\nstream\n\nendstream",
  ];
  let out = "%PDF-1.4\n%\xe2\xe3\xcf\xd3\n";
  const offsets: number[] = [];
  objects.forEach((o, i) => {
    offsets.push(Buffer.byteLength(out, "latin1"));
    out += `${i + 1} 0 obj\n${o}\nendobj\n`;
  });
  const xref = Buffer.byteLength(out, "latin1");
  out += `xref\n0 ${objects.length + 1}\n0000000000 65535 f \n`;
  for (const off of offsets) out += `${String(off).padStart(10, "0")} 00000 n \n`;
  out += `trailer\n<< /Size ${objects.length + 1} /Root 1 0 R >>\nstartxref\n${xref}\n%%EOF\n`;
  return Buffer.from(out, "latin1");
}

/** The start of a JFIF JPEG (SOI, APP0, EOI). */
export function makeJpeg(): Buffer {
  const app0 = Buffer.from([0xff, 0xe0, 0x00, 0x10, 0x4a, 0x46, 0x49, 0x46, 0x00, 0x01, 0x01, 0x00, 0x00, 0x01, 0x00, 0x01, 0x00, 0x00]);
  return Buffer.concat([Buffer.from([0xff, 0xd8]), app0, Buffer.from([0xff, 0xd9])]);
}

/** A multipart request carrying one file, as a browser's form upload would. */
export function uploadRequest(opts: { name: string; bytes: Uint8Array; cookie?: string; browserType?: string; fields?: Record<string, string> }): Request {
  const form = new FormData();
  for (const [k, v] of Object.entries(opts.fields ?? {})) form.set(k, v);
  form.set("file", new File([new Uint8Array(opts.bytes)], opts.name, { type: opts.browserType ?? "application/octet-stream" }));
  const headers: Record<string, string> = {};
  if (opts.cookie) headers.cookie = opts.cookie;
  return new Request("http://localhost:3999/api/upload", { method: "POST", body: form, headers });
}

/** Set a calculation's status directly (e.g. "issued"). */
export async function setCalcStatus(calcId: string, status: "draft" | "in_check" | "approved" | "issued"): Promise<void> {
  await write((db) => db.update(calculations).set({ status }).where(eq(calculations.id, calcId)));
}

/** Insert an attachment row directly (a PNG) on a calculation of `workspaceId`; returns nothing if it exists. */
export async function insertAttachment(id: string, workspaceId: string): Promise<void> {
  const db = await read();
  if (await db.query.attachments.findFirst({ where: eq(attachments.id, id) })) return;
  const calc = await db.query.calculations.findFirst({ where: eq(calculations.workspaceId, workspaceId) });
  if (!calc) throw new Error(`no calculation in workspace ${workspaceId}`);
  const data = makePng();
  await write((w) =>
    w
      .insert(attachments)
      .values({ id, workspaceId, calculationId: calc.id, filename: "fixture.png", mime: "image/png", size: data.length, sha256: sha256Hex(data), data, uploadedBy: calc.preparedBy, at: Date.now() })
      .onConflictDoNothing(),
  );
}
