/**
 * CSV import and export of the parts library through the route handlers: template, preview of
 * good, bad and hostile rows (nothing imported before confirm), confirm importing exactly the
 * valid rows in one atomic batch, confirm refused when the file or the library changed, file
 * limits, export escaping of formula cells, and an export → import round trip.
 *
 * The formula characters = + - @ TAB CR and the single-quote escape are the usual CSV-injection
 * guidance (common practice, no source). SI prefixes as in parts.test.ts (BIPM SI Brochure,
 * 9th ed., Table 7).
 */
import { beforeAll, describe, expect, it } from "vitest";
import Papa from "papaparse";
import { sql } from "drizzle-orm";
import { call, makeWorld, setupDb, type World } from "../helpers";
import { uploadRequest } from "../attachments/files";
import { write } from "@/db/write";
import { parts } from "@/db/schema";
import { newId } from "@/lib/ids";
import { DEMO_OPAMPS, DEMO_REFERENCES } from "@/lib/calc/core/demo-parts";
import * as partsRoute from "@/app/api/w/[slug]/parts/route";
import * as templateRoute from "@/app/api/w/[slug]/parts/template/route";
import * as exportRoute from "@/app/api/w/[slug]/parts/export/route";
import * as importRoute from "@/app/api/w/[slug]/parts/import/route";

beforeAll(setupDb);

interface Row {
  row: number;
  name: string;
  ok: boolean;
  errors: Record<string, string>;
  notes: string[];
}
interface Preview {
  total: number;
  valid: number;
  invalid: number;
  rows: Row[];
  truncated: boolean;
  fileNotes: string[];
  previewHash: string;
}

const OPAMP_HEADER = ["name", "supplyMin [V]", "supplyMax [V]", "gbw [Hz]", "slewRate [V/s]", "aolDb [dB]", "vos [V]", "vosDrift [V/°C]", "ib [A]", "ios [A]", "en [V/√Hz]", "in [A/√Hz]", "enCorner [Hz]", "vicmNeg [V]", "vicmPos [V]", "swingNeg [V]", "swingPos [V]", "swingLoad [Ω]", "ioutMax [A]", "rout [Ω]", "notes"];

/** A row of good op-amp values (engineering notation), with overrides by column key. */
function opRow(name: string, over: Record<string, string> = {}): string[] {
  const base: Record<string, string> = {
    name, supplyMin: "2.7", supplyMax: "5.5", gbw: "10M", slewRate: "8 V/µs", aolDb: "110", vos: "1.5m", vosDrift: "2u", ib: "10p", ios: "5p",
    en: "12n", in: "3f", enCorner: "1k", vicmNeg: "-0.1", vicmPos: "-0.1", swingNeg: "50m", swingPos: "50m", swingLoad: "2k", ioutMax: "40m", rout: "100", notes: "",
    ...over,
  };
  return OPAMP_HEADER.map((h) => base[h.split(" ")[0]]);
}

const csv = (rows: string[][], header = OPAMP_HEADER) => Papa.unparse({ fields: header, data: rows }, { newline: "\r\n" });

async function preview(w: World, text: string, kind = "opamp") {
  return call(importRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: { kind, csv: text } });
}
async function confirm(w: World, text: string, hash: string, kind = "opamp") {
  return call(importRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: { kind, csv: text, confirm: hash } });
}
const names = async (w: World, kind = "opamp") =>
  ((await call(partsRoute.GET, { params: { slug: w.slug }, cookie: w.engineer.cookie, url: `http://localhost:3999/x?kind=${kind}` })).body.parts as Array<{ name: string }>).map((p) => p.name).sort();
const byRow = (p: Preview, row: number) => p.rows.find((r) => r.row === row) as Row;

describe("CSV template", () => {
  it("has the parameter keys with units in the header and an example row that imports", async () => {
    const w = await makeWorld();
    for (const kind of ["opamp", "reference"]) {
      const r = await call(templateRoute.GET, { params: { slug: w.slug }, cookie: w.engineer.cookie, url: `http://localhost:3999/x?kind=${kind}` });
      expect(r.status).toBe(200);
      expect(r.headers.get("content-type")).toBe("text/csv; charset=utf-8");
      expect(r.headers.get("content-disposition")).toMatch(/^attachment; filename="loopwright-(opamps|references)-template.csv"/);
      const text = String(r.body._text);
      const [header, example, ...rest] = Papa.parse<string[]>(text.replace(/^\ufeff/, ""), { skipEmptyLines: true }).data;
      expect(rest).toEqual([]);
      if (kind === "opamp") {
        expect(header).toEqual(OPAMP_HEADER);
        expect(example[3]).toBe("10 MHz");
      } else {
        expect(header.slice(0, 5)).toEqual(["name", "topology", "vNom [V]", "accuracy [%]", "tempco [ppm/°C]"]);
      }
      const p = (await preview(w, text, kind)).body.preview as Preview;
      expect(p).toMatchObject({ total: 1, valid: 1, invalid: 0 });
    }
    expect((await call(templateRoute.GET, { params: { slug: w.slug }, cookie: w.engineer.cookie, url: "http://localhost:3999/x?kind=zener" })).status).toBe(422);
  });
});

describe("CSV import", () => {
  it("previews good, bad and hostile rows without importing, then confirm imports exactly the valid rows", async () => {
    const w = await makeWorld();
    await call(partsRoute.POST, {
      params: { slug: w.slug },
      cookie: w.engineer.cookie,
      body: { kind: "opamp", name: "LW-OA100 in library", values: Object.fromEntries(OPAMP_HEADER.slice(1, -1).map((h, i) => [h.split(" ")[0], opRow("x")[i + 1]])) },
    });
    const rows = [
      opRow("LW-OA201 good, prefixes"), // row 2
      opRow("LW-OA202 good, SI numbers", { gbw: "1e7", slewRate: "8000000", vos: "0.0015", en: "1.2e-8" }), // 3
      opRow("LW-OA203 wrong type", { gbw: "fast" }), // 4
      opRow("LW-OA204 missing value", { aolDb: "" }), // 5
      opRow("=HYPERLINK(\"http://evil.test\",\"x\")"), // 6
      opRow("@SUM(A1:A9)"), // 7
      opRow("+cmd|' /C calc'!A0"), // 8
      opRow("-2+3"), // 9
      opRow("\tLW-OA210 tab"), // 10
      opRow("LW-OA211 formula in notes", { notes: "=1+1" }), // 11
      opRow("LW-OA212 formula in a number", { gbw: "=10*1e6" }), // 12
      opRow("LW-OA213 escaped notes", { notes: "'- single supply only" }), // 13
      opRow("LW-OA214 twice"), // 14
      opRow("lw-oa214 TWICE"), // 15
      opRow("LW-OA100 in library"), // 16
      opRow("LW-OA217 out of range", { aolDb: "20", swingLoad: "-2k" }), // 17
      opRow("LW-OA218 supplies swapped", { supplyMin: "12", supplyMax: "5" }), // 18
      opRow("LW-OA219 decimal comma", { vos: "1,5m" }), // 19
    ];
    const text = csv(rows);
    const r = await preview(w, text);
    expect(r.status).toBe(200);
    const p = r.body.preview as Preview;
    expect(p).toMatchObject({ total: 18, valid: 3, invalid: 15, truncated: false });
    expect(p.rows.filter((x) => x.ok).map((x) => x.row)).toEqual([2, 3, 13]);
    expect(byRow(p, 4).errors.gbw).toMatch(/^gbw .*"fast"/);
    expect(byRow(p, 5).errors.aolDb).toMatch(/aolDb .* is required/);
    for (const [row, ch] of [[6, "="], [7, "@"], [8, "+"], [9, "-"], [10, "\t"]] as const) {
      expect(byRow(p, row).errors.name, `row ${row}`).toContain(`starts with ${JSON.stringify(ch)}`);
      expect(byRow(p, row).errors.name).toMatch(/formula/);
    }
    expect(byRow(p, 11).errors.notes).toMatch(/notes starts with "=".*formula/);
    expect(byRow(p, 12).errors.gbw).toMatch(/gbw .*looks like a spreadsheet formula/);
    expect(byRow(p, 13).notes.join()).toMatch(/apostrophe .* removed/);
    expect(byRow(p, 14).errors.name).toMatch(/appears 2 times in this file \(rows 14, 15\)/);
    expect(byRow(p, 15).errors.name).toMatch(/appears 2 times/);
    expect(byRow(p, 16).errors.name).toMatch(/already in the library/);
    expect(byRow(p, 17).errors.aolDb).toMatch(/between 40 dB and 200 dB/);
    expect(byRow(p, 17).errors.swingLoad).toMatch(/greater than 0/);
    expect(byRow(p, 18).errors.supplyMax).toMatch(/supplyMax must be at least supplyMin/);
    expect(byRow(p, 19).errors.vos).toMatch(/comma/);
    // Nothing is imported by a preview.
    expect(await names(w)).toEqual(["LW-OA100 in library"]);

    const c = await confirm(w, text, p.previewHash);
    expect(c.status).toBe(201);
    expect(c.body.result).toEqual({ kind: "opamp", imported: 3, skipped: 15 });
    expect(await names(w)).toEqual(["LW-OA100 in library", "LW-OA201 good, prefixes", "LW-OA202 good, SI numbers", "LW-OA213 escaped notes"].sort());
    const all = (await call(partsRoute.GET, { params: { slug: w.slug }, cookie: w.engineer.cookie })).body.parts as Array<{ name: string; values: Record<string, number>; notes: string }>;
    const a = all.find((x) => x.name.startsWith("LW-OA201"))!;
    const b = all.find((x) => x.name.startsWith("LW-OA202"))!;
    expect(a.values).toEqual(b.values); // prefixes and plain SI numbers read alike
    expect(a.values).toMatchObject({ gbw: 10e6, slewRate: 8e6, vos: 1.5e-3, en: 12e-9, in: 3e-15, vicmNeg: -0.1 });
    expect(all.find((x) => x.name.startsWith("LW-OA213"))!.notes).toBe("- single supply only");
    // The same confirm again: the rows are now in the library, the hash no longer matches.
    const again = await confirm(w, text, p.previewHash);
    expect(again.status).toBe(409);
    expect(await names(w)).toHaveLength(4);
  });

  it("reads plain numbers in the unit of a prefixed header, semicolon-separated files, and the multipart upload", async () => {
    const w = await makeWorld();
    const header = OPAMP_HEADER.map((h) => (h === "gbw [Hz]" ? "GBW [MHz]" : h === "slewRate [V/s]" ? "slewRate [V/µs]" : h));
    const text = Papa.unparse({ fields: header, data: [opRow("LW-OA301", { gbw: "4", slewRate: "13" })] }, { delimiter: ";" });
    const form = uploadRequest({ name: "parts.csv", bytes: new TextEncoder().encode(text), cookie: w.engineer.cookie, fields: { kind: "opamp" }, browserType: "text/csv" });
    const res = await importRoute.POST(form, { params: Promise.resolve({ slug: w.slug }) });
    expect(res.status).toBe(200);
    const p = ((await res.json()) as { preview: Preview }).preview;
    expect(p).toMatchObject({ valid: 1, invalid: 0 });
    expect(p.fileNotes.join()).toMatch(/";"-separated/);
    const conf = uploadRequest({ name: "parts.csv", bytes: new TextEncoder().encode(text), cookie: w.engineer.cookie, fields: { kind: "opamp", confirm: p.previewHash } });
    expect((await importRoute.POST(conf, { params: Promise.resolve({ slug: w.slug }) })).status).toBe(201);
    const part = ((await call(partsRoute.GET, { params: { slug: w.slug }, cookie: w.engineer.cookie })).body.parts as Array<{ values: Record<string, number> }>)[0];
    expect(part.values.gbw).toBe(4e6);
    expect(part.values.slewRate).toBe(13e6);
  });

  it("refuses a confirm whose file or library changed since the preview, importing nothing", async () => {
    const w = await makeWorld();
    const text = csv([opRow("LW-OA401"), opRow("LW-OA402")]);
    const p = (await preview(w, text)).body.preview as Preview;
    expect(p.valid).toBe(2);
    // A different file with the old hash.
    const edited = csv([opRow("LW-OA401"), opRow("LW-OA402", { gbw: "20M" })]);
    const e = await confirm(w, edited, p.previewHash);
    expect(e.status).toBe(409);
    expect((e.body.error as { message: string }).message).toMatch(/Nothing was imported/);
    // A hash that is not a preview's.
    expect((await confirm(w, text, "0".repeat(64))).status).toBe(409);
    expect((await confirm(w, text, "not-a-hash")).status).toBe(422);
    // The library gains one of the names between preview and confirm.
    await call(partsRoute.POST, { params: { slug: w.slug }, cookie: w.checker.cookie, body: { kind: "opamp", name: "LW-OA402", values: Object.fromEntries(OPAMP_HEADER.slice(1, -1).map((h, i) => [h.split(" ")[0], opRow("x")[i + 1]])) } });
    expect((await confirm(w, text, p.previewHash)).status).toBe(409);
    expect(await names(w)).toEqual(["LW-OA402"]);
  });

  it("imports all or nothing: a failure in the last statement of the batch leaves the library unchanged", async () => {
    const w = await makeWorld();
    // 1,000 valid rows; the database refuses the last one (a trigger stands in for any failure).
    const rows = Array.from({ length: 1000 }, (_, i) => opRow(`LW-ATOM-${String(i).padStart(4, "0")}`));
    rows[999] = opRow("LW-ATOM-FAIL");
    const text = csv(rows);
    const p = (await preview(w, text)).body.preview as Preview;
    expect(p.valid).toBe(1000);
    await write((db) => db.run(sql.raw("CREATE TRIGGER test_refuse_part BEFORE INSERT ON parts WHEN NEW.name = 'LW-ATOM-FAIL' BEGIN SELECT RAISE(ABORT, 'refused by test trigger'); END")));
    try {
      const c = await confirm(w, text, p.previewHash);
      expect(c.status).toBe(500);
    } finally {
      await write((db) => db.run(sql.raw("DROP TRIGGER test_refuse_part")));
    }
    expect(await names(w)).toEqual([]);
    // The same file now imports whole.
    const ok = await confirm(w, text, p.previewHash);
    expect(ok.status).toBe(201);
    expect(await names(w)).toHaveLength(1000);
  });

  it("imports a 10,000-row file", async () => {
    const w = await makeWorld();
    const rows = Array.from({ length: 10_000 }, (_, i) => opRow(`LW-BULK-${String(i).padStart(5, "0")}`, { gbw: `${1 + (i % 97)}M` }));
    rows[4321] = opRow("LW-BULK-bad", { rout: "lots" });
    const text = csv(rows);
    const t0 = performance.now();
    const p = (await preview(w, text)).body.preview as Preview;
    const t1 = performance.now();
    expect(p).toMatchObject({ total: 10_000, valid: 9_999, invalid: 1, truncated: true });
    expect(p.rows.find((r) => !r.ok)).toMatchObject({ row: 4323, name: "LW-BULK-bad" });
    const c = await confirm(w, text, p.previewHash);
    const t2 = performance.now();
    expect(c.status).toBe(201);
    expect((c.body.result as { imported: number }).imported).toBe(9_999);
    expect(await names(w)).toHaveLength(9_999);
    // For the report only (no timing assertion here): preview and confirm durations.
    console.info(`10,000-row CSV (${(text.length / 1024).toFixed(0)} kB): preview ${(t1 - t0).toFixed(0)} ms, confirm ${(t2 - t1).toFixed(0)} ms`);
  });

  it("refuses files that are too large, have too many rows, miss columns, or are not UTF-8 text", async () => {
    const w = await makeWorld();
    const big = `${OPAMP_HEADER.join(",")}\r\n${"x".repeat(2 * 1024 * 1024)}`;
    const r1 = await preview(w, big);
    expect(r1.status).toBe(413);
    expect((r1.body.error as { message: string }).message).toMatch(/at most 2 MB/);
    const short = Array.from({ length: 20_001 }, (_, i) => `P${i},1,1,1,1,1,1,1,1,1,1,1,1,1,1,1,1,1,1,1,`).join("\n");
    const r2 = await preview(w, `${OPAMP_HEADER.join(",")}\n${short}`);
    expect(r2.status).toBe(413);
    expect((r2.body.error as { message: string }).message).toMatch(/20,001 data rows; at most 20,000/);
    const missing = csv([opRow("LW-OA1").slice(0, 5)], OPAMP_HEADER.slice(0, 5));
    const r3 = await preview(w, missing);
    expect(r3.status).toBe(422);
    expect((r3.body.error as { message: string }).message).toMatch(/missing columns: aolDb \[dB\], vos \[V\], vosDrift \[V\/°C\], ib \[A\]/);
    const badUnit = csv([opRow("LW-OA1")], OPAMP_HEADER.map((h) => (h === "gbw [Hz]" ? "gbw [furlongs]" : h)));
    expect(((await preview(w, badUnit)).body.error as { message: string }).message).toMatch(/"furlongs" is not a unit of gbw/);
    const extra = csv([[...opRow("LW-OA1"), "blue"]], [...OPAMP_HEADER, "colour"]);
    expect(((await preview(w, extra)).body.preview as Preview).fileNotes.join()).toMatch(/Column 22 "colour" is not an op-amp parameter and was ignored/);
    const asReference = await preview(w, csv([opRow("LW-OA1")]), "reference");
    expect((asReference.body.error as { message: string }).message).toMatch(/missing columns: topology/);
    const latin1 = uploadRequest({ name: "p.csv", bytes: Buffer.from(`${OPAMP_HEADER.slice(0, 1).join(",")}\nR\xe9f`, "latin1"), cookie: w.engineer.cookie, fields: { kind: "opamp" } });
    const r4 = await importRoute.POST(latin1, { params: Promise.resolve({ slug: w.slug }) });
    expect(r4.status).toBe(422);
    expect(((await r4.json()) as { error: { message: string } }).error.message).toMatch(/not UTF-8/);
    expect((await preview(w, "")).status).toBe(422);
    expect(await names(w)).toEqual([]);
  });
});

describe("CSV export", () => {
  it("escapes text cells that start like a formula, and writes numbers plainly", async () => {
    const w = await makeWorld();
    const { name: _n, ...params } = DEMO_OPAMPS[2] as unknown as { name: string } & Record<string, number>;
    // Names like these cannot be entered (the form and the import refuse them); data from
    // elsewhere might still hold them, so the export must escape whatever it finds.
    const hostile = ["=HYPERLINK(\"http://evil.test\")", "+SUM(1)", "-2+3", "@cmd", "\tTAB"];
    await write((db) => db.batch([
      db.insert(parts).values(hostile.map((name) => ({ id: newId(), workspaceId: w.workspaceId, kind: "opamp" as const, name, params, notes: "=1+1", createdAt: Date.now(), updatedAt: Date.now() }))),
      db.insert(parts).values({ id: newId(), workspaceId: w.workspaceId, kind: "opamp" as const, name: "LW-OA plain", params, notes: "plain note", createdAt: Date.now(), updatedAt: Date.now() }),
    ]));
    const r = await call(exportRoute.GET, { params: { slug: w.slug }, cookie: w.checker.cookie, url: "http://localhost:3999/x?kind=opamp" });
    expect(r.status).toBe(200);
    expect(r.headers.get("content-disposition")).toMatch(new RegExp(`filename="${w.slug}-opamps-\\d{4}-\\d{2}-\\d{2}\\.csv"`));
    const rows = Papa.parse<string[]>(String(r.body._text).replace(/^\ufeff/, ""), { skipEmptyLines: true }).data;
    expect(rows[0]).toEqual(OPAMP_HEADER);
    const nameCells = rows.slice(1).map((x) => x[0]).sort();
    expect(nameCells).toEqual(["'+SUM(1)", "'-2+3", "'=HYPERLINK(\"http://evil.test\")", "'@cmd", "'\tTAB", "LW-OA plain"].sort());
    for (const row of rows.slice(1)) {
      for (const cell of row) expect(cell, `cell ${JSON.stringify(cell)}`).not.toMatch(/^[=+@\t\r]/);
      expect(row[20]).toMatch(/^('=1\+1|plain note)$/);
      // Numbers are plain numbers (the negative headroom -0.1 V stays a number).
      expect(row[13]).toBe("-0.1");
      expect(row[3]).toBe("10000000");
    }
  });

  it("round-trips: an export imports into another workspace with the same values and notes", async () => {
    const w = await makeWorld();
    const demo = [...DEMO_OPAMPS.map((p) => ["opamp", p] as const), ...DEMO_REFERENCES.map((p) => ["reference", p] as const)];
    const rows = demo.map(([kind, p], i) => {
      const { name, ...params } = p as unknown as { name: string } & Record<string, number | string>;
      return { id: newId(), workspaceId: w.workspaceId, kind, name, params, notes: i % 2 ? "- bench-tested, see lab book" : "@ 25 °C", createdAt: Date.now(), updatedAt: Date.now() };
    });
    await write((db) => db.insert(parts).values(rows));
    for (const kind of ["opamp", "reference"]) {
      const exp = await call(exportRoute.GET, { params: { slug: w.slug }, cookie: w.owner.cookie, url: `http://localhost:3999/x?kind=${kind}` });
      const text = String(exp.body._text);
      const other = { slug: w.otherSlug };
      const pv = await call(importRoute.POST, { params: other, cookie: w.outsider.cookie, body: { kind, csv: text } });
      const p = pv.body.preview as Preview;
      expect(p.invalid, JSON.stringify(p.rows.filter((x) => !x.ok))).toBe(0);
      expect((await call(importRoute.POST, { params: other, cookie: w.outsider.cookie, body: { kind, csv: text, confirm: p.previewHash } })).status).toBe(201);
      const url = `http://localhost:3999/x?kind=${kind}`;
      const strip = (list: unknown) => (list as Array<{ name: string; values: object; notes: string }>).map(({ name, values, notes }) => ({ name, values, notes }));
      const mine = strip((await call(partsRoute.GET, { params: { slug: w.slug }, cookie: w.owner.cookie, url })).body.parts);
      const theirs = strip((await call(partsRoute.GET, { params: other, cookie: w.outsider.cookie, url })).body.parts);
      expect(theirs).toEqual(mine);
      expect(mine.length).toBe(kind === "opamp" ? DEMO_OPAMPS.length : DEMO_REFERENCES.length);
    }
  });
});
