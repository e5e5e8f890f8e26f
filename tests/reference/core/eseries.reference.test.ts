/**
 * Preferred number series against IEC 60063:2015 (Tables 1 and 2) and its known structure.
 * The structural facts (subsets, the geometric progression and its listed exceptions) are an
 * outside check on the hard-coded tables: a mistyped entry breaks one of them.
 */
import { describe, expect, it } from "vitest";
import { E_SERIES, E_SERIES_TOLERANCE, type ESeries } from "@/lib/calc/core/eseries";

const SIZE: Record<ESeries, number> = { E6: 6, E12: 12, E24: 24, E48: 48, E96: 96, E192: 192 };

describe("IEC 60063:2015 series tables", () => {
  it("each series has n strictly increasing members in [1, 10)", () => {
    for (const s of Object.keys(SIZE) as ESeries[]) {
      const t = E_SERIES[s];
      expect(t.length).toBe(SIZE[s]);
      expect(t[0]).toBe(1);
      for (let i = 1; i < t.length; i++) expect(t[i]).toBeGreaterThan(t[i - 1]);
      expect(t[t.length - 1]).toBeLessThan(10);
    }
  });

  it("E6 ⊂ E12 ⊂ E24 and E48 ⊂ E96 ⊂ E192, taking every other member (IEC 60063:2015 §4)", () => {
    const everyOther = (t: readonly number[]) => t.filter((_, i) => i % 2 === 0);
    expect(everyOther(E_SERIES.E12)).toEqual(E_SERIES.E6);
    expect(everyOther(E_SERIES.E24)).toEqual(E_SERIES.E12);
    expect(everyOther(E_SERIES.E96)).toEqual(E_SERIES.E48);
    expect(everyOther(E_SERIES.E192)).toEqual(E_SERIES.E96);
  });

  it("E24 departs from round(10^(i/24), 1 decimal) exactly at 2.7 3.0 3.3 3.6 3.9 4.3 4.7 8.2 (IEC 60063:2015 Table 1; list also in the brief)", () => {
    const departures: number[] = [];
    E_SERIES.E24.forEach((v, i) => {
      const formula = Number((10 ** (i / 24)).toFixed(1));
      if (Math.abs(formula - v) > 1e-9) departures.push(v);
    });
    expect(departures).toEqual([2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2]);
  });

  it("E48 and E96 follow round(10^(i/n), 2 decimals); E192 too except 9.20 (formula 9.19) — IEC 60063:2015 Table 2 (exception value from memory)", () => {
    for (const s of ["E48", "E96"] as const) {
      E_SERIES[s].forEach((v, i) => expect(v).toBeCloseTo(Number((10 ** (i / SIZE[s])).toFixed(2)), 9));
    }
    const departures: number[] = [];
    E_SERIES.E192.forEach((v, i) => {
      if (Math.abs(Number((10 ** (i / 192)).toFixed(2)) - v) > 1e-9) departures.push(v);
    });
    expect(departures).toEqual([9.2]);
  });

  it("spot values of the tables (IEC 60063:2015 Tables 1, 2)", () => {
    expect(E_SERIES.E12).toEqual([1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2]);
    expect(E_SERIES.E96).toContain(4.99);
    expect(E_SERIES.E96).toContain(6.04);
    expect(E_SERIES.E48).toContain(5.11);
    expect(E_SERIES.E192).toContain(9.88);
  });

  it("usual tolerances: E6 20 %, E12 10 %, E24 5 %, E48 2 %, E96 1 %, E192 0.5 % (IEC 60063:2015, §1; common practice)", () => {
    expect(E_SERIES_TOLERANCE).toEqual({ E6: 0.2, E12: 0.1, E24: 0.05, E48: 0.02, E96: 0.01, E192: 0.005 });
  });
});
