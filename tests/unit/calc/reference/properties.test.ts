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

const shuntArb = fc.record({
  reference: referenceArb(),
  supply: sortedPair(logDouble(1e-3, 10000)),
  load: sortedPair(zeroOr(1e-9, 100)),
  series: fc.constantFrom("E6" as const, "E12" as const, "E24" as const, "E48" as const, "E96" as const, "E192" as const),
  tolerance: uniform(0, 0.2),
  resistorRating: logDouble(1e-3, 1000),
}).map((r) => ({
  reference: r.reference,
  vSupplyMin: r.supply[0],
  vSupplyMax: r.supply[1],
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

describe("invalid input → zod error naming the field", () => {
  for (const t of [shuntReference, adjustableReference, adcReferenceBudget] as unknown as CalcType[]) {
    it(t.id, () => invalidFieldProperty(t));
  }
});
