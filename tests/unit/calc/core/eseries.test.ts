import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  E_SERIES,
  bestPairBy,
  bestRatioPair,
  nearestPreferred,
  nextPreferredDown,
  nextPreferredUp,
  preferredValuesBetween,
  type ESeries,
} from "@/lib/calc/core/eseries";

const SERIES: ESeries[] = ["E6", "E12", "E24", "E48", "E96", "E192"];

describe("nearest / up / down", () => {
  // Hand-worked from the IEC 60063 E12/E24 tables.
  it("nearest by logarithmic distance", () => {
    expect(nearestPreferred(4900, "E12")).toBe(4700); // ln(4.9/4.7)=0.042 < ln(5.6/4.9)=0.134
    expect(nearestPreferred(5200, "E12")).toBe(5600); // geometric midpoint √(4.7·5.6)=5.13
    expect(nearestPreferred(5100, "E12")).toBe(4700); // 5.1 < 5.13
    expect(nearestPreferred(9.6e3, "E12")).toBe(10e3); // crosses the decade
    expect(nearestPreferred(2.2e-9, "E6")).toBe(2.2e-9);
    expect(nearestPreferred(0.31, "E24")).toBe(0.3);
  });
  it("an exact member returns itself up and down", () => {
    for (const s of SERIES) for (const m of E_SERIES[s]) {
      expect(nextPreferredUp(m * 1e3, s)).toBe(Number((m * 1e3).toPrecision(12)));
      expect(nextPreferredDown(m * 1e3, s)).toBe(Number((m * 1e3).toPrecision(12)));
    }
  });
  it("up is ≥ and down is ≤, and they bracket the value tightly", () => {
    expect(nextPreferredUp(4800, "E24")).toBe(5100);
    expect(nextPreferredDown(4800, "E24")).toBe(4700);
    expect(nextPreferredUp(9.2e3, "E12")).toBe(10e3);
    expect(nextPreferredDown(999, "E12")).toBe(820);
    fc.assert(
      fc.property(fc.double({ min: 1e-12, max: 1e9, noNaN: true }), fc.constantFrom(...SERIES), (v, s) => {
        const up = nextPreferredUp(v, s);
        const down = nextPreferredDown(v, s);
        expect(up).toBeGreaterThanOrEqual(v * (1 - 1e-9));
        expect(down).toBeLessThanOrEqual(v * (1 + 1e-9));
        expect(up / down).toBeLessThan(1.61); // widest E6 step is 1.5 → 2.2 (ratio 1.47), decade step 6.8 → 10
        const n = nearestPreferred(v, s);
        expect([up, down]).toContain(n);
      }),
      { numRuns: 500 },
    );
  });
  it("rejects non-positive values", () => {
    expect(() => nearestPreferred(0, "E12")).toThrow(RangeError);
    expect(() => nextPreferredUp(-1, "E12")).toThrow(RangeError);
  });
});

describe("preferredValuesBetween", () => {
  it("lists members inclusively", () => {
    expect(preferredValuesBetween(1000, 2000, "E6")).toEqual([1000, 1500]);
    expect(preferredValuesBetween(1000, 2200, "E6")).toEqual([1000, 1500, 2200]);
    expect(preferredValuesBetween(1, 10, "E12").length).toBe(13);
    expect(preferredValuesBetween(10e3, 100e3, "E96").length).toBe(97);
    expect(preferredValuesBetween(5, 4, "E24")).toEqual([]);
  });
});

describe("bestRatioPair", () => {
  it("fixed Rb", () => {
    // 9 × 1 kΩ = 9 kΩ is not in E24; the neighbours are 8.2k and 9.1k; 9.1k is nearer (hand-worked).
    const p = bestRatioPair(9, "E24", { rb: 1000 });
    expect(p).not.toBeNull();
    expect(p!.ra).toBe(9100);
    expect(p!.error).toBeCloseTo(0.1 / 9, 12);
  });
  it("exact ratios are found when the series has them", () => {
    // 4.7/1 in E12, 2.0/1 in E24 (IEC 60063 tables).
    expect(bestRatioPair(4.7, "E12", { raMin: 1e3, raMax: 1e5 })!.error).toBeCloseTo(0, 12);
    expect(bestRatioPair(2, "E24", { raMin: 1e3, raMax: 1e5 })!.error).toBeCloseTo(0, 12);
  });
  it("is never worse than snapping Ra alone, and respects ranges", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.05, max: 500, noNaN: true }), fc.constantFrom(...SERIES), (target, s) => {
        const p = bestRatioPair(target, s, { raMin: 1e3, raMax: 1e5, rbMin: 100, rbMax: 1e6 });
        if (!p) return;
        expect(p.ra).toBeGreaterThanOrEqual(1e3);
        expect(p.ra).toBeLessThanOrEqual(1e5);
        expect(p.rb).toBeGreaterThanOrEqual(100);
        expect(p.rb).toBeLessThanOrEqual(1e6);
        expect(p.ratio).toBeCloseTo(p.ra / p.rb, 12);
        // A fixed Rb of 10 kΩ is one of the candidates considered, so the pair can only be better.
        const single = bestRatioPair(target, s, { rb: 10e3, raMin: 1e3, raMax: 1e5 });
        if (single) expect(Math.abs(Math.log(p.ratio / target))).toBeLessThanOrEqual(Math.abs(Math.log(single.ratio / target)) + 1e-12);
      }),
      { numRuns: 200 },
    );
  });
  it("takes a series offset into account", () => {
    const p = bestRatioPair(10, "E96", { raMin: 10e3, raMax: 100e3, rbOffset: 50 })!;
    expect(p.ratio).toBeCloseTo(p.ra / (p.rb + 50), 12);
    expect(Math.abs(p.error)).toBeLessThan(0.005); // E96 pairs reach ±0.5 % easily
  });
  it("returns null when nothing fits", () => {
    expect(bestRatioPair(1e6, "E12", { raMin: 1e3, raMax: 2e3, rbMin: 1e3, rbMax: 2e3 })).toBeNull();
  });
  it("bestPairBy solves a non-ratio target", () => {
    // Adjustable reference: Vout = 1.24·(1 + a/b); target 5 V → a/b = 3.032 (hand-worked).
    const r = bestPairBy("E96", 1e3, 10e3, (b) => (5 / 1.24 - 1) * b, (a, b) => (1.24 * (1 + a / b)) / 5 - 1);
    expect(r).not.toBeNull();
    expect(Math.abs(r!.error)).toBeLessThan(0.002);
  });
});
