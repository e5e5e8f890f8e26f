/**
 * Attachments of a calculation through the route handlers: real PNG, JPEG, PDF and SVG uploads
 * (made byte by byte in ./files.ts), types decided from the bytes and not from the name or the
 * browser, 10 MB limit (413), download with the same bytes and SHA-256, safe headers, delete,
 * read-only while issued (409), another workspace 404, clients 403.
 *
 * Outside checks: the generated PDF is accepted by poppler's pdfinfo (Debian poppler-utils);
 * the PNG chunk checksums agree with zlib's CRC-32; the SHA-256 of the downloaded bytes is recomputed with Node's crypto and compared with the
 * FIPS 180-4 "abc" test vector first, so the hash function itself is known good.
 */
import { execFileSync } from "node:child_process";
import crypto from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import zlib from "node:zlib";
import { beforeAll, describe, expect, it } from "vitest";
import { call, makeWorld, setupDb, type World } from "../helpers";
import { makeJpeg, makePdf, makePng, setCalcStatus, uploadRequest } from "./files";
import * as listRoute from "@/app/api/w/[slug]/calculations/[calcId]/attachments/route";
import * as itemRoute from "@/app/api/w/[slug]/calculations/[calcId]/attachments/[attachmentId]/route";

beforeAll(setupDb);

const MB10 = 10 * 1024 * 1024;

interface Att {
  id: string;
  filename: string;
  mime: string;
  size: number;
  sha256: string;
  uploadedBy: { id: string; name: string };
  at: number;
}

async function upload(w: World, name: string, bytes: Uint8Array, opts: { cookie?: string; calcId?: string; browserType?: string } = {}) {
  const req = uploadRequest({ name, bytes, cookie: opts.cookie ?? w.engineer.cookie, browserType: opts.browserType });
  const res = await listRoute.POST(req, { params: Promise.resolve({ slug: w.slug, calcId: opts.calcId ?? w.calcId }) });
  return { status: res.status, body: (await res.json()) as { attachment?: Att; error?: { code: string; message: string; fields?: Record<string, string> } } };
}

async function download(w: World, id: string, cookie = w.checker.cookie, calcId = w.calcId) {
  const res = await itemRoute.GET(new Request("http://localhost:3999/x", { headers: { cookie } }), { params: Promise.resolve({ slug: w.slug, calcId, attachmentId: id }) });
  return { status: res.status, headers: res.headers, bytes: new Uint8Array(await res.arrayBuffer()) };
}

const sha = (b: Uint8Array) => crypto.createHash("sha256").update(b).digest("hex");

describe("attachments", () => {
  it("stores a real PNG and PDF with their SHA-256 and gives back the same bytes", async () => {
    // FIPS 180-4 / NIST example: SHA-256("abc").
    expect(sha(Buffer.from("abc"))).toBe("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    const w = await makeWorld();
    const png = makePng(4, 3);
    const pdf = makePdf();
    const tmp = path.join(os.tmpdir(), `lw-att-${process.pid}.pdf`);
    fs.writeFileSync(tmp, pdf);
    expect(execFileSync("pdfinfo", [tmp]).toString()).toMatch(/Pages:\s+1/);
    fs.rmSync(tmp);
    // Each PNG chunk's CRC-32 agrees with zlib's own implementation (node:zlib crc32).
    for (let at = 8; at < png.length; ) {
      const len = png.readUInt32BE(at);
      expect(png.readUInt32BE(at + 8 + len)).toBe(zlib.crc32(png.subarray(at + 4, at + 8 + len)));
      at += 12 + len;
    }

    const a = await upload(w, "front-end schematic.png", png, { browserType: "image/png" });
    expect(a.status).toBe(201);
    expect(a.body.attachment).toMatchObject({ filename: "front-end schematic.png", mime: "image/png", size: png.length, sha256: sha(png), uploadedBy: { name: "Engineer" } });
    const b = await upload(w, "Bode plot (measured).pdf", pdf, { cookie: w.owner.cookie, browserType: "text/plain" });
    expect(b.status).toBe(201);
    expect(b.body.attachment).toMatchObject({ mime: "application/pdf", size: pdf.length, sha256: sha(pdf) });
    const j = await upload(w, "photo.JPG", makeJpeg());
    expect(j.body.attachment).toMatchObject({ mime: "image/jpeg", filename: "photo.JPG" });

    const list = await call(listRoute.GET, { params: { slug: w.slug, calcId: w.calcId }, cookie: w.checker.cookie });
    expect(list.status).toBe(200);
    const items = list.body.attachments as Att[];
    expect(items.map((x) => x.filename).sort()).toEqual(["Bode plot (measured).pdf", "front-end schematic.png", "photo.JPG"]);
    expect(items.every((x) => !("data" in x))).toBe(true);

    for (const [att, bytes, type] of [[a.body.attachment!, png, "image/png"], [b.body.attachment!, pdf, "application/pdf"]] as const) {
      const d = await download(w, att.id);
      expect(d.status).toBe(200);
      expect(Buffer.from(d.bytes).equals(Buffer.from(bytes))).toBe(true);
      expect(sha(d.bytes)).toBe(att.sha256);
      expect(d.headers.get("content-type")).toBe(type);
      expect(d.headers.get("x-content-type-options")).toBe("nosniff");
      expect(d.headers.get("content-disposition")).toMatch(/^attachment; filename="/);
      expect(d.headers.get("content-security-policy")).toMatch(/sandbox/);
    }
    expect((await download(w, b.body.attachment!.id)).headers.get("content-disposition")).toBe(`attachment; filename="Bode plot _measured_.pdf"; filename*=UTF-8''Bode%20plot%20%28measured%29.pdf`.replace("_measured_", "(measured)"));
  });

  it("decides the type from the bytes: a lying extension or an unaccepted type is refused with a clear message", async () => {
    const w = await makeWorld();
    const pdfAsPng = await upload(w, "schematic.png", makePdf(), { browserType: "image/png" });
    expect(pdfAsPng.status).toBe(415);
    expect(pdfAsPng.body.error!.message).toMatch(/"schematic.png" is named .png, but its contents are a PDF document/);
    const textAsPdf = await upload(w, "report.pdf", new TextEncoder().encode("Just some notes, not a PDF at all.\n"), { browserType: "application/pdf" });
    expect(textAsPdf.status).toBe(415);
    expect(textAsPdf.body.error!.message).toMatch(/the name ends in .pdf, but the contents are plain text/);
    const pngAsTxt = await upload(w, "notes.txt", makePng());
    expect(pngAsTxt.status).toBe(415);
    expect(pngAsTxt.body.error!.message).toMatch(/named .txt, but its contents are a PNG image/);
    const gif = await upload(w, "anim.gif", Buffer.from("GIF89a\x01\x00\x01\x00\x00\x00\x00;", "latin1"));
    expect(gif.status).toBe(415);
    expect(gif.body.error!.message).toMatch(/GIF/);
    // The browser's content type is ignored: PNG bytes sent as "application/pdf" are a PNG.
    const png = await upload(w, "scope", makePng(), { browserType: "application/pdf" });
    expect(png.status).toBe(201);
    expect(png.body.attachment).toMatchObject({ mime: "image/png", filename: "scope.png" });
    const names = ((await call(listRoute.GET, { params: { slug: w.slug, calcId: w.calcId }, cookie: w.engineer.cookie })).body.attachments as Att[]).map((x) => x.filename);
    expect(names).toEqual(["scope.png"]);
  });

  it("accepts a plain SVG drawing but refuses one that carries a script, and never serves SVG inline", async () => {
    const w = await makeWorld();
    const plain = `<?xml version="1.0"?>\n<!-- drawn by hand -->\n<svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"><path d="M0 0 L10 10"/></svg>`;
    const ok = await upload(w, "divider.svg", new TextEncoder().encode(plain));
    expect(ok.status).toBe(201);
    expect(ok.body.attachment!.mime).toBe("image/svg+xml");
    const d = await download(w, ok.body.attachment!.id);
    expect(d.headers.get("content-disposition")).toMatch(/^attachment;/);
    expect(d.headers.get("content-security-policy")).toBe("default-src 'none'; style-src 'unsafe-inline'; sandbox; frame-ancestors 'none'");
    for (const bad of [
      `<svg xmlns="http://www.w3.org/2000/svg"><script>alert(1)</script></svg>`,
      `<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"></svg>`,
      `<svg xmlns="http://www.w3.org/2000/svg"><a href="javascript:alert(1)"><text>x</text></a></svg>`,
    ]) {
      const r = await upload(w, "evil.svg", new TextEncoder().encode(bad));
      expect(r.status, bad).toBe(422);
      expect(r.body.error!.message).toMatch(/may not carry active content/);
    }
    const htmlAsSvg = await upload(w, "page.svg", new TextEncoder().encode("<html><body>hi</body></html>"));
    expect(htmlAsSvg.status).toBe(415);
  });

  it("refuses 10 MB + 1 byte with 413 and accepts exactly 10 MB", async () => {
    const w = await makeWorld();
    const png = makePng();
    const big = Buffer.alloc(MB10 + 1);
    png.copy(big);
    const r = await upload(w, "huge.png", big);
    expect(r.status).toBe(413);
    expect(r.body.error!.message).toMatch(/at most 10 MB \(10,485,760 bytes\)/);
    const exact = big.subarray(0, MB10);
    const ok = await upload(w, "exact.png", exact);
    expect(ok.status).toBe(201);
    expect(ok.body.attachment!.size).toBe(MB10);
    const d = await download(w, ok.body.attachment!.id);
    expect(sha(d.bytes)).toBe(sha(exact));
    // A declared length far over the limit is refused before the body is read.
    const declared = await listRoute.POST(
      new Request("http://localhost:3999/x", { method: "POST", headers: { cookie: w.engineer.cookie, "content-type": "multipart/form-data; boundary=x", "content-length": String(50 * MB10) }, body: "--x--" }),
      { params: Promise.resolve({ slug: w.slug, calcId: w.calcId }) },
    );
    expect(declared.status).toBe(413);
  });

  it("refuses a request without a file or not sent as a form", async () => {
    const w = await makeWorld();
    const json = await call(listRoute.POST, { params: { slug: w.slug, calcId: w.calcId }, cookie: w.engineer.cookie, body: { file: "x" } });
    expect(json.status).toBe(415);
    const form = new FormData();
    form.set("other", "value");
    const res = await listRoute.POST(new Request("http://localhost:3999/x", { method: "POST", body: form, headers: { cookie: w.engineer.cookie } }), { params: Promise.resolve({ slug: w.slug, calcId: w.calcId }) });
    expect(res.status).toBe(422);
    expect((await upload(w, "empty.png", new Uint8Array(0))).status).toBe(422);
  });

  it("makes file names safe for storage and for the download header", async () => {
    const w = await makeWorld();
    const r = await upload(w, '..\\..\\etc/pass"wd\r\n<Ωmega>.png', makePng());
    expect(r.status).toBe(201);
    expect(r.body.attachment!.filename).toBe("passwdΩmega.png");
    const d = await download(w, r.body.attachment!.id);
    expect(d.headers.get("content-disposition")).toBe(`attachment; filename="passwd_mega.png"; filename*=UTF-8''passwd%CE%A9mega.png`);
  });

  it("deletes an attachment (calc.edit); the download is then 404", async () => {
    const w = await makeWorld();
    const a = (await upload(w, "a.png", makePng())).body.attachment!;
    const p = { slug: w.slug, calcId: w.calcId, attachmentId: a.id };
    expect((await call(itemRoute.DELETE, { params: p, cookie: w.client.cookie })).status).toBe(403);
    const del = await call(itemRoute.DELETE, { params: p, cookie: w.checker.cookie });
    expect(del.status).toBe(200);
    expect((await download(w, a.id)).status).toBe(404);
    expect((await call(listRoute.GET, { params: { slug: w.slug, calcId: w.calcId }, cookie: w.checker.cookie })).body.attachments).toEqual([]);
  });

  it("keeps attachments read-only while the calculation is issued (409), still listed and downloadable", async () => {
    const w = await makeWorld();
    const a = (await upload(w, "before-issue.png", makePng())).body.attachment!;
    await setCalcStatus(w.calcId, "issued");
    const up = await upload(w, "after-issue.png", makePng());
    expect(up.status).toBe(409);
    expect(up.body.error!.message).toMatch(/Revision A of this calculation is issued, so its attachments are read-only/);
    const del = await call(itemRoute.DELETE, { params: { slug: w.slug, calcId: w.calcId, attachmentId: a.id }, cookie: w.owner.cookie });
    expect(del.status).toBe(409);
    expect((await download(w, a.id)).status).toBe(200);
    const list = (await call(listRoute.GET, { params: { slug: w.slug, calcId: w.calcId }, cookie: w.owner.cookie })).body.attachments as Att[];
    expect(list.map((x) => x.filename)).toEqual(["before-issue.png"]);
    await setCalcStatus(w.calcId, "approved");
    expect((await upload(w, "approved-is-editable.png", makePng())).status).toBe(201);
  });

  it("answers 404 for another workspace's calculation or attachment, and 403 to clients", async () => {
    const w = await makeWorld();
    const theirs = await upload(w, "theirs.png", makePng(), { cookie: w.outsider.cookie, calcId: w.otherCalcId });
    expect(theirs.status).toBe(404); // the outsider posts to this workspace's slug: not a member
    const mine = (await upload(w, "mine.png", makePng())).body.attachment!;
    // Their own workspace, through their own slug: fine.
    const req = uploadRequest({ name: "theirs.png", bytes: makePng(), cookie: w.outsider.cookie });
    const own = await listRoute.POST(req, { params: Promise.resolve({ slug: w.otherSlug, calcId: w.otherCalcId }) });
    expect(own.status).toBe(201);
    const theirId = ((await own.json()) as { attachment: Att }).attachment.id;
    // This workspace's owner cannot reach it, neither through the other calc nor through our calc.
    expect((await upload(w, "x.png", makePng(), { cookie: w.owner.cookie, calcId: w.otherCalcId })).status).toBe(404);
    expect((await call(listRoute.GET, { params: { slug: w.slug, calcId: w.otherCalcId }, cookie: w.owner.cookie })).status).toBe(404);
    expect((await download(w, theirId, w.owner.cookie)).status).toBe(404);
    expect((await download(w, theirId, w.owner.cookie, w.otherCalcId)).status).toBe(404);
    expect((await call(itemRoute.DELETE, { params: { slug: w.slug, calcId: w.calcId, attachmentId: theirId }, cookie: w.owner.cookie })).status).toBe(404);
    // The outsider cannot read ours through their slug either.
    const viaOther = await itemRoute.GET(new Request("http://localhost:3999/x", { headers: { cookie: w.outsider.cookie } }), { params: Promise.resolve({ slug: w.otherSlug, calcId: w.calcId, attachmentId: mine.id }) });
    expect(viaOther.status).toBe(404);
    // Clients do not see calculations at all.
    expect((await download(w, mine.id, w.client.cookie)).status).toBe(403);
    expect((await upload(w, "c.png", makePng(), { cookie: w.client.cookie })).status).toBe(403);
  });
});
