/**
 * Property tests of the reference pack: any schema-valid input gives a well-formed output (finite
 * numbers, sentences, no throw); an invalid value in any field gives a zod error naming it.
 */
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { shuntReference, shuntSchema } from "@/lib/calc/reference/shunt";
import { adjustableReference, adjustableSchema } from "@/lib/calc/reference/adjustable";
import { adcReferenceBudget, adcBudgetSchema } from "@/lib/calc/reference/adc-budget";
import type { CalcType } from "@/lib/calc/core/types";
import { expectWellFormed, invalidFieldProperty, logDouble, referenceArb, sortedPair, tempRange, uniform, zeroOr } from "../core/arbitraries";

// Half the cases draw the supply relative to the reference voltage (the design path: Vs,min
// above Vz), half anywhere in the schema's range (mostly the "supply below the reference" path).
const shuntArb = fc.record({
  reference: referenceArb(),
  supplyAbs: sortedPair(logDouble(1e-3, 10000)),
  relative: fc.boolean(),
  headroom: logDouble(1e-4, 50),
  spread: zeroOr(1e-4, 10),
  load: sortedPair(zeroOr(1e-9, 100)),
  series: fc.constantFrom("E6" as const, "E12" as const, "E24" as const, "E48" as const, "E96" as const, "E192" as const),
  tolerance: uniform(0, 0.2),
  resistorRating: logDouble(1e-3, 1000),
}).map((r) => ({
  reference: r.reference,
  vSupplyMin: r.relative ? Math.min(10000, r.reference.vNom * (1 + r.headroom)) : r.supplyAbs[0],
  vSupplyMax: r.relative ? Math.min(10000, r.reference.vNom * (1 + r.headroom) * (1 + r.spread)) : r.supplyAbs[1],
  iLoadMin: r.load[0],
  iLoadMax: r.load[1],
  series: r.series,
  tolerance: r.tolerance,
  resistorRating: r.resistorRating,
}));

const adjustableArb = fc.record({
  reference: referenceArb(["adjustable", "adjustable", "shunt"]),
  vOutTarget: logDouble(1e-3, 1000),
  series: fc.constantFrom("E24" as const, "E48" as const, "E96" as const, "E192" as const),
  tolerance: uniform(0, 0.2),
  r2Target: logDouble(10, 10e6),
  temps: tempRange,
  iCathode: logDouble(1e-9, 10),
  errorMax: logDouble(1e-6, 0.5),
}).map((r) => ({ ...r, tMin: r.temps[0], tMax: r.temps[1], temps: undefined }));

const adcArb = fc.record({
  reference: referenceArb(),
  bits: fc.integer({ min: 6, max: 32 }),
  fsRatio: logDouble(1e-3, 100),
  temps: tempRange,
  hours: zeroOr(1e-3, 1e6),
  loadStep: zeroOr(1e-12, 1),
  calibrated: fc.boolean(),
  errorMaxLsb: logDouble(1e-6, 1e9),
}).map((r) => ({ ...r, tMin: r.temps[0], tMax: r.temps[1], temps: undefined }));

describe("schema-valid input → well-formed output, no throw", () => {
  const cases: Array<[string, fc.Arbitrary<Record<string, unknown>>, { safeParse: (v: unknown) => { success: boolean; data?: unknown; error?: { issues: unknown[] } } }, CalcType]> = [
    ["reference.shunt", shuntArb, shuntSchema, shuntReference as unknown as CalcType],
    ["reference.adjustable", adjustableArb, adjustableSchema, adjustableReference as unknown as CalcType],
    ["reference.adc-budget", adcArb, adcBudgetSchema, adcReferenceBudget as unknown as CalcType],
  ];
  for (const [id, arb, schema, type] of cases) {
    it(id, () => {
      fc.assert(
        fc.property(arb, (raw) => {
          const parsed = schema.safeParse(raw);
          expect(parsed.success, JSON.stringify(parsed.error?.issues)).toBe(true);
          expectWellFormed(type.compute(parsed.data));
        }),
        { numRuns: 500 },
      );
    });
  }
});

/** Result value by key, or undefined when the compute stopped early (e.g. a wrong topology). */
function result(out: ReturnType<CalcType["compute"]>, key: string): number | undefined {
  return out.results.find((r) => r.key === key)?.value;
}

const EPS = 1e-9;

describe("physical invariants over the whole schema (not only the defaults)", () => {
  it("reference.shunt: the resistor is rounded the safe way, so the minimum current always holds", () => {
    let designed = 0;
    fc.assert(
      fc.property(shuntArb, (raw) => {
        const out = shuntReference.compute(shuntSchema.parse(raw));
        const r = result(out, "r_selected");
        const rMax = result(out, "r_max");
        if (r === undefined || rMax === undefined || rMax < 1e-6) return;
        designed++;
        // R·(1 + tol) ≤ Rmax (the design rule), hence Iz,lo ≥ Iz,min at the worst corner.
        expect(r * (1 + raw.tolerance)).toBeLessThanOrEqual(rMax * (1 + EPS));
        expect(out.checks.find((c) => c.id === "current.min")!.severity).toBe("pass");
        // The worst-case high current is never below the low one.
        expect(result(out, "iz_max_wc")!).toBeGreaterThanOrEqual(result(out, "iz_min_wc")! * (1 - EPS) - 1e-18);
      }),
      { numRuns: 500 },
    );
    expect(designed).toBeGreaterThan(100); // the generator reaches the design path often enough (≈ 1 in 3)
  });

  it("reference.adjustable: nominal output inside its worst-case band", () => {
    fc.assert(
      fc.property(adjustableArb, (raw) => {
        const out = adjustableReference.compute(adjustableSchema.parse(raw));
        const lo = result(out, "vout_min");
        if (lo === undefined) return;
        expect(lo).toBeLessThanOrEqual(result(out, "vout_nom")! * (1 + EPS));
        expect(result(out, "vout_max")!).toBeGreaterThanOrEqual(result(out, "vout_nom")! * (1 - EPS));
        // The box spans the operating range and 25 °C, so it is never shorter than the range.
        expect(result(out, "dT_span")!).toBeGreaterThanOrEqual(raw.tMax - raw.tMin - EPS);
      }),
      { numRuns: 500 },
    );
  });

  it("reference.adc-budget: RSS never above the worst case; drift at least the plain box", () => {
    fc.assert(
      fc.property(adcArb, (raw) => {
        const input = adcBudgetSchema.parse(raw);
        const out = adcReferenceBudget.compute(input);
        expect(result(out, "e_rss")!).toBeLessThanOrEqual(result(out, "e_wc")! * (1 + EPS) + 1e-300);
        const plain = input.reference.vNom * input.reference.tempco * (input.tMax - input.tMin);
        expect(result(out, "e_temp")!).toBeGreaterThanOrEqual(plain * (1 - EPS));
      }),
      { numRuns: 500 },
    );
  });
});

describe("invalid input → zod error naming the field", () => {
  for (const t of [shuntReference, adjustableReference, adcReferenceBudget] as unknown as CalcType[]) {
    it(t.id, () => invalidFieldProperty(t));
  }
});
