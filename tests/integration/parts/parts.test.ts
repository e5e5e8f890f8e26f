/**
 * Parts library through the route handlers: add with engineering notation, validation errors
 * naming the field and the rule, unique names per kind (409), edit, delete (calculations keep
 * their snapshot), another workspace's part 404, read-only workspaces.
 *
 * Expected SI values follow from the SI prefixes (BIPM, The International System of Units, 9th
 * ed. 2019, Table 7: M = 1e6, k = 1e3, m = 1e-3, µ = 1e-6, n = 1e-9, p = 1e-12, f = 1e-15) and
 * 1 % = 0.01, 1 ppm = 1e-6 (same brochure, 5.4.7); compared exactly, since the parser rounds to
 * 15 significant figures and each expected value is the nearest double to its decimal.
 */
import { beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { call, makeWorld, setupDb, type World } from "../helpers";
import { insertPart } from "./fixtures";
import { read, write } from "@/db/write";
import { calculations } from "@/db/schema";
import * as partsRoute from "@/app/api/w/[slug]/parts/route";
import * as partRoute from "@/app/api/w/[slug]/parts/[partId]/route";

beforeAll(setupDb);

type Body = Record<string, unknown>;
const fields = (b: Body) => (b.error as { fields?: Record<string, string> }).fields ?? {};
const errMsg = (b: Body) => (b.error as { message: string }).message;

/** An op-amp as typed into the form, in engineering notation. */
export function typedOpAmp(name: string, over: Record<string, string> = {}) {
  return {
    kind: "opamp",
    name,
    values: {
      supplyMin: "2.7", supplyMax: "5.5 V", gbw: "10M", slewRate: "0.5 V/µs", aolDb: "110 dB",
      vos: "1.5m", vosDrift: "2 µV/°C", ib: "10p", ios: "5 pA", en: "12 nV/√Hz", in: "3 fA/√Hz",
      enCorner: "1k", vicmNeg: "-0.1", vicmPos: "−100 mV", swingNeg: "50m", swingPos: "50 mV",
      swingLoad: "2k", ioutMax: "40 mA", rout: "100 Ω",
      ...over,
    },
  };
}

const list = async (w: World, kind = "opamp") =>
  (await call(partsRoute.GET, { params: { slug: w.slug }, cookie: w.engineer.cookie, url: `http://localhost:3999/api/parts?kind=${kind}` })).body.parts as Array<{ id: string; name: string; values: Record<string, number | string>; kind: string }>;

describe("parts library", () => {
  it("adds a part typed in engineering notation and returns it in SI units", async () => {
    const w = await makeWorld();
    const r = await call(partsRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: typedOpAmp("LW-OA321 test CMOS") });
    expect(r.status).toBe(201);
    const p = r.body.part as { id: string; name: string; values: Record<string, number> };
    expect(p.values).toEqual({
      supplyMin: 2.7, supplyMax: 5.5, gbw: 10e6, slewRate: 0.5e6, aolDb: 110, vos: 1.5e-3, vosDrift: 2e-6,
      ib: 10e-12, ios: 5e-12, en: 12e-9, in: 3e-15, enCorner: 1e3, vicmNeg: -0.1, vicmPos: -0.1,
      swingNeg: 0.05, swingPos: 0.05, swingLoad: 2e3, ioutMax: 0.04, rout: 100,
    });
    const all = await list(w);
    expect(all.map((x) => x.name)).toContain("LW-OA321 test CMOS");
    // The picker's shape: a RawPart is { partId: id, name, values }.
    const picked = all.find((x) => x.id === p.id)!;
    expect(picked.kind).toBe("opamp");
    expect(picked.values.gbw).toBe(10e6);
    expect((await list(w, "reference")).map((x) => x.id)).not.toContain(p.id);
  });

  it("adds a reference with % and ppm fields stored as fractions", async () => {
    const w = await makeWorld();
    const r = await call(partsRoute.POST, {
      params: { slug: w.slug },
      cookie: w.checker.cookie,
      body: {
        kind: "reference",
        name: "LW-SR30 3.0 V shunt",
        values: { topology: "shunt", vNom: "3", accuracy: "0.1 %", tempco: "10 ppm/°C", iMin: "60u", iMax: "15m", pMax: "300m", zDyn: "0.3", noisePp: "30 µV", longTermDrift: "100", iAdj: "0" },
      },
    });
    expect(r.status).toBe(201);
    expect((r.body.part as { values: object }).values).toEqual({
      topology: "shunt", vNom: 3, accuracy: 0.001, tempco: 1e-5, iMin: 60e-6, iMax: 0.015, pMax: 0.3, zDyn: 0.3, noisePp: 30e-6, longTermDrift: 100e-6, iAdj: 0,
    });
  });

  it("refuses wrong values with a message naming the field and the rule, and adds nothing", async () => {
    const w = await makeWorld();
    const bad = await call(partsRoute.POST, {
      params: { slug: w.slug },
      cookie: w.engineer.cookie,
      body: typedOpAmp("LW-OA bad", { gbw: "10Q", slewRate: "-5 V/µs", aolDb: "300", vos: "", en: "12 nV" }),
    });
    expect(bad.status).toBe(422);
    const f = fields(bad.body);
    expect(f.gbw).toMatch(/^gbw \(Gain-bandwidth product\): .*not understood.*"10Q"/);
    expect(f.slewRate).toMatch(/slewRate must be greater than 0/);
    expect(f.aolDb).toMatch(/aolDb must be between 40 dB and 200 dB/);
    expect(f.vos).toMatch(/vos .* is required/);
    expect(f.en).toMatch(/^en .*wrong unit/);
    expect(errMsg(bad.body)).toMatch(/gbw/);

    const cross = await call(partsRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: typedOpAmp("LW-OA cross", { supplyMin: "12", supplyMax: "5" }) });
    expect(cross.status).toBe(422);
    expect(fields(cross.body).supplyMax).toMatch(/supplyMax must be at least supplyMin/);

    const noName = await call(partsRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: typedOpAmp("   ") });
    expect(fields(noName.body).name).toMatch(/name is required/);
    const formula = await call(partsRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: typedOpAmp("=HYPERLINK(\"http://x\")") });
    expect(fields(formula.body).name).toMatch(/must not start with "="/);
    const wrongType = await call(partsRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: { ...typedOpAmp("LW-OA type"), values: { ...typedOpAmp("x").values, gbw: true } } });
    expect(wrongType.status).toBe(422);
    expect(Object.keys(fields(wrongType.body))).toContain("values.gbw");
    const wrongKind = await call(partsRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: { ...typedOpAmp("LW-OA kind"), kind: "diode" } });
    expect(fields(wrongKind.body).kind).toMatch(/opamp or reference/);
    expect((await call(partsRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, rawBody: "{not json", headers: { "content-type": "application/json" } })).status).toBe(400);
    expect(await list(w)).toEqual([]);
  });

  it("keeps names unique per kind (409, without regard to case) but allows the same name in the other kind", async () => {
    const w = await makeWorld();
    const a = await call(partsRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: typedOpAmp("LW-OA500 fast") });
    expect(a.status).toBe(201);
    const dup = await call(partsRoute.POST, { params: { slug: w.slug }, cookie: w.checker.cookie, body: typedOpAmp("  lw-oa500 FAST ") });
    expect(dup.status).toBe(409);
    expect(errMsg(dup.body)).toMatch(/already has an op-amp named "LW-OA500 fast"/);
    expect(fields(dup.body).name).toMatch(/already exists/);
    const ref = await call(partsRoute.POST, {
      params: { slug: w.slug },
      cookie: w.engineer.cookie,
      body: { kind: "reference", name: "LW-OA500 fast", values: { topology: "series", vNom: "2.5", accuracy: "0.05", tempco: "3", iMin: "0", iMax: "10m", pMax: "250m", zDyn: "80m", noisePp: "12u", longTermDrift: "50", iAdj: "0" } },
    });
    expect(ref.status).toBe(201);
    expect((await list(w)).length).toBe(1);
  });

  it("lets exactly one of ten concurrent adds of the same name through; the others get 409", async () => {
    const w = await makeWorld();
    const results = await Promise.all(
      Array.from({ length: 10 }, (_, i) => call(partsRoute.POST, { params: { slug: w.slug }, cookie: i % 2 ? w.engineer.cookie : w.checker.cookie, body: typedOpAmp(i % 3 ? "LW-OA777 race" : "lw-oa777 RACE") })),
    );
    expect(results.map((r) => r.status).sort()).toEqual([201, ...Array(9).fill(409)]);
    expect((await list(w)).length).toBe(1);
  });

  it("edits a part: partial values, rename, a clashing rename 409 and a bad value 422 change nothing", async () => {
    const w = await makeWorld();
    const a = (await call(partsRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: typedOpAmp("LW-OA1") })).body.part as { id: string };
    await call(partsRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: typedOpAmp("LW-OA2") });
    const p = { slug: w.slug, partId: a.id };
    const ok = await call(partRoute.PATCH, { params: p, cookie: w.checker.cookie, body: { name: "LW-OA1 rev", values: { gbw: "12 MHz" }, notes: "checked" } });
    expect(ok.status).toBe(200);
    expect(ok.body.part).toMatchObject({ name: "LW-OA1 rev", notes: "checked", values: { gbw: 12e6, slewRate: 0.5e6 } });
    const clash = await call(partRoute.PATCH, { params: p, cookie: w.checker.cookie, body: { name: "lw-oa2" } });
    expect(clash.status).toBe(409);
    const badVal = await call(partRoute.PATCH, { params: p, cookie: w.checker.cookie, body: { values: { swingLoad: "0" } } });
    expect(badVal.status).toBe(422);
    expect(fields(badVal.body).swingLoad).toMatch(/swingLoad must be greater than 0/);
    expect((await call(partRoute.PATCH, { params: p, cookie: w.checker.cookie, body: {} })).status).toBe(422);
    const now = await call(partRoute.GET, { params: p, cookie: w.owner.cookie });
    expect(now.body.part).toMatchObject({ name: "LW-OA1 rev", values: { gbw: 12e6, swingLoad: 2e3 } });
  });

  it("deletes a part from the library only: a calculation that used it keeps its snapshot", async () => {
    const w = await makeWorld();
    const made = (await call(partsRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: typedOpAmp("LW-OA used") })).body.part as { id: string; name: string; values: Record<string, number> };
    const snapshot = { partId: made.id, name: made.name, values: made.values };
    const db = await read();
    const calc = await db.query.calculations.findFirst({ where: eq(calculations.id, w.calcId) });
    const inputs = { ...(calc!.inputs as Record<string, unknown>), opamp: snapshot };
    await write((d) => d.update(calculations).set({ inputs }).where(eq(calculations.id, w.calcId)));

    const del = await call(partRoute.DELETE, { params: { slug: w.slug, partId: made.id }, cookie: w.engineer.cookie });
    expect(del.status).toBe(200);
    expect((await call(partRoute.GET, { params: { slug: w.slug, partId: made.id }, cookie: w.engineer.cookie })).status).toBe(404);
    expect(await list(w)).toEqual([]);
    const after = await (await read()).query.calculations.findFirst({ where: eq(calculations.id, w.calcId) });
    expect((after!.inputs as Record<string, unknown>).opamp).toEqual(snapshot);
  });

  it("answers 404 for another workspace's part, and changes nothing there", async () => {
    const w = await makeWorld();
    const foreign = `foreign-${w.otherWorkspaceId}`;
    await insertPart(foreign, w.otherWorkspaceId, { name: "LW-OA their part" });
    const p = { slug: w.slug, partId: foreign };
    expect((await call(partRoute.GET, { params: p, cookie: w.owner.cookie })).status).toBe(404);
    expect((await call(partRoute.PATCH, { params: p, cookie: w.owner.cookie, body: { name: "stolen" } })).status).toBe(404);
    expect((await call(partRoute.DELETE, { params: p, cookie: w.owner.cookie })).status).toBe(404);
    const theirs = await call(partsRoute.GET, { params: { slug: w.otherSlug }, cookie: w.outsider.cookie });
    expect((theirs.body.parts as Array<{ name: string }>).map((x) => x.name)).toEqual(["LW-OA their part"]);
    expect(await list(w)).toEqual([]);
  });

  it("refuses an unknown kind filter, and refuses changes while the workspace is read-only", async () => {
    const w = await makeWorld({ status: "canceled" });
    expect((await call(partsRoute.GET, { params: { slug: w.slug }, cookie: w.owner.cookie, url: "http://localhost:3999/api/parts?kind=diode" })).status).toBe(422);
    const r = await call(partsRoute.POST, { params: { slug: w.slug }, cookie: w.owner.cookie, body: typedOpAmp("LW-OA after cancel") });
    expect(r.status).toBe(403);
    expect((r.body.error as { code: string }).code).toBe("read_only");
    expect((await call(partsRoute.GET, { params: { slug: w.slug }, cookie: w.owner.cookie })).status).toBe(200);
  });
});
