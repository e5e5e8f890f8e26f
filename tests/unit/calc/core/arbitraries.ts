/**
 * fast-check generators of schema-valid inputs for the amplifier and reference packs, and a
 * walker that asserts a compute output holds only finite numbers. Shared by the property tests.
 */
import fc from "fast-check";
import { expect } from "vitest";
import type { CalcOutput, CalcType } from "@/lib/calc/core/types";
import { parseRawInputs } from "@/lib/calc/core/inputs";
import type { OpAmpParams, ReferenceParams } from "@/lib/calc/core/parts";

/** Log-uniform double in [min, max] (both > 0). */
export function logDouble(min: number, max: number): fc.Arbitrary<number> {
  return fc.double({ min: Math.log10(min), max: Math.log10(max), noNaN: true }).map((x) => Math.min(max, Math.max(min, 10 ** x)));
}

/** 0 or a log-uniform value in [min, max]. */
export function zeroOr(min: number, max: number): fc.Arbitrary<number> {
  return fc.oneof(fc.constant(0), logDouble(min, max));
}

/** Uniform double in [min, max]. */
export function uniform(min: number, max: number): fc.Arbitrary<number> {
  return fc.double({ min, max, noNaN: true, noDefaultInfinity: true });
}

/** A sorted pair (a ≤ b) from one arbitrary. */
export function sortedPair(a: fc.Arbitrary<number>): fc.Arbitrary<[number, number]> {
  return fc.tuple(a, a).map(([x, y]) => (x <= y ? [x, y] : [y, x]));
}

/** Any op-amp parameter set the part schema accepts (wide but physical ranges). */
export const opAmpArb: fc.Arbitrary<OpAmpParams> = fc
  .record({
    supplyMin: logDouble(0.5, 30),
    span: zeroOr(0.01, 100),
    gbw: logDouble(1e2, 5e9),
    slewRate: logDouble(1e2, 1e10),
    aolDb: uniform(40, 200),
    vos: zeroOr(1e-9, 0.05),
    vosDrift: zeroOr(1e-10, 1e-4),
    ib: zeroOr(1e-15, 1e-4),
    iosFrac: uniform(0, 1),
    en: zeroOr(1e-10, 1e-5),
    in: zeroOr(1e-16, 1e-9),
    enCorner: zeroOr(1e-2, 1e5),
    vicmNeg: uniform(-0.99, 9.99),
    vicmPos: uniform(-0.99, 9.99),
    swingNeg: uniform(-0.99, 9.99),
    swingPos: uniform(-0.99, 9.99),
    swingLoad: logDouble(1, 1e7),
    ioutMax: logDouble(1e-6, 10),
    rout: zeroOr(1e-3, 1e5),
  })
  .map((r) => ({
    name: "LW-TEST",
    supplyMin: r.supplyMin,
    supplyMax: r.supplyMin + r.span,
    gbw: r.gbw,
    slewRate: r.slewRate,
    aolDb: r.aolDb,
    vos: r.vos,
    vosDrift: r.vosDrift,
    ib: r.ib,
    ios: r.ib * r.iosFrac,
    en: r.en,
    in: r.in,
    enCorner: r.enCorner,
    vicmNeg: r.vicmNeg,
    vicmPos: r.vicmPos,
    swingNeg: r.swingNeg,
    swingPos: r.swingPos,
    swingLoad: r.swingLoad,
    ioutMax: r.ioutMax,
    rout: r.rout,
  }));

/** Any reference parameter set the part schema accepts, of the given topologies. */
export function referenceArb(topologies: Array<ReferenceParams["topology"]> = ["shunt", "series", "adjustable"]): fc.Arbitrary<ReferenceParams> {
  return fc
    .record({
      topology: fc.constantFrom(...topologies),
      vNom: logDouble(0.5, 200),
      accuracy: zeroOr(1e-6, 0.19),
      tempco: zeroOr(1e-8, 1e-3),
      iMin: zeroOr(1e-7, 0.01),
      iRange: logDouble(1e-5, 1),
      pMax: logDouble(1e-3, 50),
      zDyn: zeroOr(1e-3, 1e3),
      noisePp: zeroOr(1e-7, 1e-2),
      longTermDrift: zeroOr(1e-7, 1e-2),
      iAdj: zeroOr(1e-10, 1e-4),
    })
    .map((r) => ({
      name: "LW-TESTREF",
      topology: r.topology,
      vNom: r.vNom,
      accuracy: r.accuracy,
      tempco: r.tempco,
      iMin: r.iMin,
      iMax: r.iMin + r.iRange,
      pMax: r.pMax,
      zDyn: r.zDyn,
      noisePp: r.noisePp,
      longTermDrift: r.longTermDrift,
      iAdj: r.topology === "adjustable" ? r.iAdj : 0,
    }));
}

/** Temperature range pair in °C. */
export const tempRange = sortedPair(uniform(-273, 300));

/** Assert every number in a compute output is finite and every sentence is free of NaN/∞. */
export function expectWellFormed(out: CalcOutput): void {
  const walk = (v: unknown, path: string): void => {
    if (typeof v === "number") {
      if (!Number.isFinite(v)) throw new Error(`non-finite number at ${path}: ${v}`);
    } else if (Array.isArray(v)) v.forEach((x, i) => walk(x, `${path}[${i}]`));
    else if (v && typeof v === "object") for (const [k, x] of Object.entries(v)) walk(x, `${path}.${k}`);
    else if (typeof v === "string" && /NaN|∞|undefined|Infinity/.test(v)) throw new Error(`bad text at ${path}: ${v}`);
  };
  walk(out, "out");
  for (const c of out.checks) {
    expect(c.message.length).toBeGreaterThan(10);
    expect(["pass", "warning", "fail"]).toContain(c.severity);
  }
  // Survives JSON: nothing turns into null (NaN and ±Infinity would).
  expect(JSON.stringify(out)).not.toMatch(/:null\b|\[null|,null/);
}

/** Every numeric top-level field of a type, as shown with its defaults. */
function numericKeys(type: CalcType, input: Record<string, unknown>): string[] {
  return type.fields.filter((f) => (f.kind === "quantity" || f.kind === "integer") && typeof input[f.key] === "number").map((f) => f.key);
}

/** Property: one bad value in any numeric field of the defaults → an issue naming that field. */
export function invalidFieldProperty(type: CalcType) {
  const parsed = parseRawInputs(type, type.defaults);
  if (!parsed.ok) throw new Error(`defaults of ${type.id} do not parse: ${JSON.stringify(parsed.errors)}`);
  const base = parsed.input as Record<string, unknown>;
  const keys = numericKeys(type, base);
  expect(keys.length).toBeGreaterThan(3);
  fc.assert(
    fc.property(fc.constantFrom(...keys), fc.constantFrom<unknown>(NaN, Infinity, -Infinity, 1e15, -1e15, "12", null, 2.5e300), (key, bad) => {
      const r = type.schema.safeParse({ ...base, [key]: bad });
      expect(r.success).toBe(false);
      if (!r.success) {
        const issue = r.error.issues.find((i) => i.path[0] === key);
        expect(issue, `no issue names ${key} for ${String(bad)}`).toBeDefined();
        expect(issue!.message.length).toBeGreaterThan(5);
      }
    }),
    { numRuns: 200 },
  );
}

