/**
 * Exports for engineers: the component list as CSV (formula-injection safe, SI values that
 * re-read to the engine's numbers), the SPICE netlist (run through Debian's ngspice as an
 * independent parser), and inputs and results as JSON.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import Papa from "papaparse";
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { read, write } from "@/db/write";
import { calculationHistory, calculations } from "@/db/schema";
import { calcTypes } from "@/lib/calc/registry";
import type { CalcOutput, Component } from "@/lib/calc/core/types";
import { componentsCsvText, COMPONENT_CSV_HEADER } from "@/lib/reports/exports";
import { newId } from "@/lib/ids";
import { call, draftCalculation, makeWorld, setupDb, type TestUser, type World } from "./helpers";
import { calcVersion } from "./reports-support";
import * as componentsRoute from "@/app/api/w/[slug]/calculations/[calcId]/export/components/route";
import * as netlistRoute from "@/app/api/w/[slug]/calculations/[calcId]/export/netlist/route";
import * as jsonRoute from "@/app/api/w/[slug]/calculations/[calcId]/export/json/route";
import * as calcRoute from "@/app/api/w/[slug]/calculations/[calcId]/route";

type Handler<P> = (req: Request, ctx: { params: Promise<P> }) => Promise<Response>;
type P = { slug: string; calcId: string };

beforeAll(async () => {
  await setupDb();
});

async function get(handler: unknown, w: World, who: TestUser, calcId: string, query = "") {
  const res = await (handler as Handler<P>)(new Request(`http://localhost:3999/api/x${query}`, { headers: { cookie: who.cookie } }), { params: Promise.resolve({ slug: w.slug, calcId }) });
  // Decoded keeping a byte order mark (Response.text() would drop it).
  return { status: res.status, headers: res.headers, text: new TextDecoder("utf-8", { ignoreBOM: true }).decode(await res.arrayBuffer()) };
}

async function addCalc(w: World, typeId: string, number: string): Promise<string> {
  const id = newId();
  const row = draftCalculation({ id, workspaceId: w.workspaceId, projectId: w.projectP, preparedBy: w.engineer.id, number, typeId, now: Date.now() });
  await write((db) =>
    db.batch([
      db.insert(calculations).values(row),
      db.insert(calculationHistory).values({ id: newId(), workspaceId: w.workspaceId, calculationId: id, revision: "A", version: 1, event: "create", status: "draft", title: row.title, inputs: row.inputs, results: row.results, engineVersion: row.engineVersion, actorId: w.engineer.id, at: Date.now() }),
    ]),
  );
  return id;
}

async function stored(calcId: string) {
  const db = await read();
  return (await db.query.calculations.findFirst({ where: eq(calculations.id, calcId) }))!;
}

/** Parse a CSV export (BOM removed) into rows of cells. */
function parseCsv(text: string): string[][] {
  expect(text.charCodeAt(0)).toBe(0xfeff);
  const r = Papa.parse<string[]>(text.slice(1), { skipEmptyLines: true });
  expect(r.errors).toEqual([]);
  return r.data;
}

/** Run ngspice in batch mode with a raw output file; returns its log and whether it produced results. */
function ngspice(netlist: string): { ok: boolean; log: string } {
  const bin = "/usr/bin/ngspice";
  if (!fs.existsSync(bin)) throw new Error("ngspice is missing (/usr/bin/ngspice). Install Debian's ngspice package: the export test runs the netlist through it.");
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "lw-netlist-"));
  try {
    fs.writeFileSync(path.join(dir, "circuit.cir"), netlist);
    const r = spawnSync(bin, ["-b", "-r", "out.raw", "circuit.cir"], { cwd: dir, encoding: "utf8", timeout: 30_000 });
    const log = `${r.stdout}\n${r.stderr}`;
    return { ok: r.status === 0 && fs.existsSync(path.join(dir, "out.raw")) && !/error/i.test(log), log };
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

/** The value of a top-level R or C card (outside .subckt … .ends), as our writer prints them ("1.130000e4"). */
function cardValue(netlist: string, ref: string): number | undefined {
  let depth = 0;
  const top: string[] = [];
  for (const l of netlist.split("\n")) {
    const head = l.trim().split(/\s+/)[0]?.toLowerCase() ?? "";
    if (head === ".subckt") depth++;
    else if (head === ".ends") depth--;
    else if (depth === 0) top.push(l);
  }
  const line = top.find((l) => l.trim().split(/\s+/)[0]?.toUpperCase() === ref.toUpperCase());
  if (!line) return undefined;
  return Number(line.trim().split(/\s+/)[3]);
}

describe("component list CSV", () => {
  it("escapes text that a spreadsheet would run as a formula, and keeps commas, quotes and new lines intact", () => {
    const parts: Component[] = [
      { ref: "R1", kind: "resistor", value: 4700, display: "4.7 kΩ", series: "E24", tolerance: 0.01, role: "=HYPERLINK(\"http://example.invalid\",\"click\")" },
      { ref: "C1", kind: "capacitor", value: 2.2e-9, display: "+2.2 nF", series: "E12", tolerance: 0.05, role: "-1+2" },
      { ref: "U1", kind: "opamp", value: 0, display: "@SUM(A1:A2)", role: "\tpart, \"quoted\"\nsecond line" },
      { ref: "X1", kind: "other", value: 0, display: "\rcarriage", role: "plain role" },
    ];
    const rows = parseCsv(componentsCsvText(parts));
    expect(rows[0]).toEqual([...COMPONENT_CSV_HEADER]);
    // Cells that start with = + - @ TAB or CR get a leading apostrophe (the usual CSV-injection
    // guidance; common practice, no source); everything else is written as it is.
    expect(rows[1]).toEqual(["R1", "resistor", "4700", "Ω", "4.7 kΩ", "E24", "1", "'=HYPERLINK(\"http://example.invalid\",\"click\")"]);
    expect(rows[2]).toEqual(["C1", "capacitor", "2.2e-9", "F", "'+2.2 nF", "E12", "5", "'-1+2"]);
    expect(rows[3]).toEqual(["U1", "opamp", "", "", "'@SUM(A1:A2)", "", "", "'\tpart, \"quoted\"\nsecond line"]);
    expect(rows[4]).toEqual(["X1", "other", "", "", "'\rcarriage", "", "", "plain role"]);
    for (const r of rows.slice(1)) for (const cell of r) expect(cell).not.toMatch(/^[=+\-@\t\r]/);
  });

  it("exports the calculation's components with SI values that read back to the engine's numbers", async () => {
    const w = await makeWorld();
    const r = await get(componentsRoute.GET, w, w.engineer, w.calcId);
    expect(r.status).toBe(200);
    expect(r.headers.get("content-type")).toBe("text/csv; charset=utf-8");
    expect(r.headers.get("content-disposition")).toContain('filename="C-001 rev A - Active low-pass filter test (components).csv"');
    const rows = parseCsv(r.text);
    const comps = ((await stored(w.calcId)).results as unknown as CalcOutput).components;
    expect(rows.length - 1).toBe(comps.length);
    comps.forEach((c, i) => {
      const row = rows[i + 1];
      expect(row[0]).toBe(c.ref);
      expect(row[1]).toBe(c.kind);
      if (c.kind === "resistor" || c.kind === "capacitor") expect(Number(row[2])).toBe(c.value);
      if (c.tolerance !== undefined) expect(Number(row[6]) / 100).toBeCloseTo(c.tolerance, 12);
      expect(row[4]).toBe(c.display);
    });
  });

  it("escapes a formula-like part name typed into the calculation", async () => {
    const w = await makeWorld();
    const c = await stored(w.calcId);
    const inputs = structuredClone(c.inputs) as Record<string, { name: string }>;
    inputs.opamp.name = "=cmd|' /C calc'!A0";
    const save = await call(calcRoute.PATCH as Handler<P>, { method: "PATCH", params: { slug: w.slug, calcId: w.calcId }, cookie: w.engineer.cookie, body: { version: await calcVersion(w.calcId), inputs } });
    expect(save.status).toBe(200);
    const r = await get(componentsRoute.GET, w, w.engineer, w.calcId);
    expect(r.status, r.text).toBe(200);
    const rows = parseCsv(r.text);
    const u = rows.filter((x) => x[1] === "opamp");
    expect(u.length).toBeGreaterThan(0);
    for (const x of u) expect(x[4]).toBe("'=cmd|' /C calc'!A0");
    for (const x of rows) for (const cell of x) expect(cell).not.toMatch(/^[=+\-@\t\r]/);
  });
});

describe("SPICE netlist", () => {
  for (const typeId of ["filter.lowpass", "amplifier.gain-stage"]) {
    for (const model of ["ideal", "single-pole"] as const) {
      it(`is written for ${typeId} (${model}) with the designed values, and ngspice runs it`, async () => {
        const w = await makeWorld();
        const calcId = typeId === "filter.lowpass" ? w.calcId : await addCalc(w, typeId, "C-002");
        const r = await get(netlistRoute.GET, w, w.checker, calcId, `?model=${model}`);
        expect(r.status, r.text).toBe(200);
        expect(r.headers.get("content-type")).toBe("text/plain; charset=utf-8");
        expect(r.headers.get("content-disposition")).toContain(".cir");
        expect(r.text.trimEnd().endsWith(".end")).toBe(true);
        const comps = ((await stored(calcId)).results as unknown as CalcOutput).components.filter((c) => c.kind === "resistor" || c.kind === "capacitor");
        expect(comps.length).toBeGreaterThan(1);
        // Every resistor and capacitor of the design is a card with its value (7 significant figures printed).
        for (const c of comps) {
          const v = cardValue(r.text, c.ref);
          expect(v, `${c.ref} in the netlist`).toBeDefined();
          expect(Math.abs((v as number) / c.value - 1)).toBeLessThan(1e-6);
        }
        const run = ngspice(r.text);
        expect(run.ok, run.log.slice(-1500)).toBe(true);
      }, 60_000);
    }
  }

  it("answers 404 with a clear message for a type without a netlist, and 422 naming the fields when the inputs do not parse", async () => {
    const w = await makeWorld();
    const without = calcTypes.find((t) => !t.netlist);
    expect(without, "some calculation type has no netlist").toBeDefined();
    const other = await addCalc(w, without!.id, "C-003");
    const r = await get(netlistRoute.GET, w, w.engineer, other);
    expect(r.status).toBe(404);
    expect(JSON.parse(r.text).error.message).toContain("has no SPICE netlist");

    const c = await stored(w.calcId);
    const inputs = { ...(c.inputs as Record<string, unknown>), cutoff: "fast" };
    const save = await call(calcRoute.PATCH as Handler<P>, { method: "PATCH", params: { slug: w.slug, calcId: w.calcId }, cookie: w.engineer.cookie, body: { version: await calcVersion(w.calcId), inputs } });
    expect(save.status).toBe(200);
    const bad = await get(netlistRoute.GET, w, w.engineer, w.calcId);
    expect(bad.status).toBe(422);
    expect(Object.keys(JSON.parse(bad.text).error.fields)).toContain("cutoff");
    const csv = await get(componentsRoute.GET, w, w.engineer, w.calcId);
    expect(csv.status).toBe(422);
    const badModel = await get(netlistRoute.GET, w, w.engineer, other, "?model=perfect");
    expect(badModel.status).toBe(422);
  });
});

describe("inputs and results as JSON", () => {
  it("holds the raw inputs, the parsed SI inputs, the results snapshot and the engine version", async () => {
    const w = await makeWorld();
    const r = await get(jsonRoute.GET, w, w.owner, w.calcId);
    expect(r.status).toBe(200);
    expect(r.headers.get("content-disposition")).toContain(".json");
    const data = JSON.parse(r.text);
    const c = await stored(w.calcId);
    expect(Object.keys(data).sort()).toEqual(["calculation", "engine", "exportedAt", "format", "formatVersion", "inputErrors", "inputs", "rawInputs", "results"]);
    expect(data.format).toBe("loopwright.calculation");
    expect(data.calculation).toMatchObject({ id: c.id, number: "C-001", typeId: "filter.lowpass", revision: "A", status: "draft", version: c.version });
    expect(data.engine).toEqual({ typeId: "filter.lowpass", version: c.engineVersion, installedVersion: c.engineVersion });
    expect(data.rawInputs).toEqual(c.inputs);
    // Raw "1k" (as typed) is 1000 Hz parsed (SI); "1" % tolerance is the fraction 0.01.
    expect((c.inputs as Record<string, unknown>).cutoff).toBe("1k");
    expect(data.inputs.cutoff).toBe(1000);
    expect(data.inputs.resTolerance).toBe(0.01);
    expect(data.inputErrors).toEqual({});
    expect(data.results).toEqual(c.results);
  });

  it("keeps the raw inputs and names the fields when they do not parse", async () => {
    const w = await makeWorld();
    const c = await stored(w.calcId);
    const inputs = { ...(c.inputs as Record<string, unknown>), cutoff: "fast" };
    await call(calcRoute.PATCH as Handler<P>, { method: "PATCH", params: { slug: w.slug, calcId: w.calcId }, cookie: w.engineer.cookie, body: { version: await calcVersion(w.calcId), inputs } });
    const data = JSON.parse((await get(jsonRoute.GET, w, w.engineer, w.calcId)).text);
    expect(data.inputs).toBeNull();
    expect(data.rawInputs.cutoff).toBe("fast");
    expect(Object.keys(data.inputErrors)).toContain("cutoff");
    expect(data.results).toBeNull();
  });

  it("is for staff only: a client gets 403", async () => {
    const w = await makeWorld();
    for (const h of [jsonRoute.GET, componentsRoute.GET, netlistRoute.GET]) expect((await get(h, w, w.client, w.calcId)).status).toBe(403);
  });
});
