/**
 * Contract of every calculation type of the amplifier and reference packs (lib/calc/core/types.ts):
 * defaults parse and compute, fields match the schema, ids and keys are stable and unique, every
 * formula is printed symbolically and with values, and the registry lists the types.
 */
import { describe, expect, it } from "vitest";
import { amplifierTypes } from "@/lib/calc/amplifier";
import { referenceTypes } from "@/lib/calc/reference";
import { getCalcType } from "@/lib/calc/registry";
import { describeInputs, parseRawInputs } from "@/lib/calc/core/inputs";
import { expectWellFormed } from "../core/arbitraries";

const types = [...amplifierTypes, ...referenceTypes];

/** Engine version of each type; bump here together with the type's `version`. */
const VERSIONS: Record<string, string> = {
  "amplifier.gain-stage": "1.2.1",
  "amplifier.difference": "1.2.1",
  "amplifier.power-stage": "1.0.1",
  "reference.shunt": "1.0.2",
  "reference.adjustable": "1.0.2",
  "reference.adc-budget": "1.0.1",
};

describe("calculation type contract", () => {
  it("the packs register the six types", () => {
    expect(amplifierTypes.map((t) => t.id)).toEqual(["amplifier.gain-stage", "amplifier.difference", "amplifier.power-stage"]);
    expect(referenceTypes.map((t) => t.id)).toEqual(["reference.shunt", "reference.adjustable", "reference.adc-budget"]);
    for (const t of types) expect(getCalcType(t.id)).toBe(t);
  });

  for (const t of types) {
    describe(t.id, () => {
      it("has its metadata", () => {
        expect(t.id.startsWith(`${t.pack}.`)).toBe(true);
        // Pinned so that a change of formula or check is a deliberate version bump (types.ts).
        expect(t.version).toBe(VERSIONS[t.id]);
        expect(t.title.length).toBeGreaterThan(5);
        expect(t.summary.endsWith(".")).toBe(true);
      });

      it("field keys are unique, and every default has a field", () => {
        const keys = t.fields.map((f) => f.key);
        expect(new Set(keys).size).toBe(keys.length);
        for (const k of Object.keys(t.defaults)) expect(keys).toContain(k);
        for (const f of t.fields) if (f.when) expect(keys).toContain(f.when.key);
      });

      it("defaults parse, compute and describe", () => {
        const p = parseRawInputs(t, t.defaults);
        expect(p.ok, p.ok ? "" : JSON.stringify(p.errors)).toBe(true);
        if (!p.ok) return;
        const out = t.compute(p.input);
        expectWellFormed(out);
        expect(out.results.length).toBeGreaterThan(3);
        expect(out.formulas.length).toBeGreaterThan(3);
        // A new sheet shows a plausible design: no failing check with the defaults.
        expect(out.checks.filter((c) => c.severity === "fail").map((c) => c.message)).toEqual([]);
        const rows = describeInputs(t, p.input, t.defaults);
        expect(rows.length).toBeGreaterThanOrEqual(t.fields.length - t.fields.filter((f) => f.when).length);
        for (const r of rows) expect(r.display).not.toMatch(/NaN|undefined/);
      });

      it("result keys and check ids are unique; every formula is printed", () => {
        const p = parseRawInputs(t, t.defaults);
        if (!p.ok) throw new Error("defaults");
        const out = t.compute(p.input);
        const rk = out.results.map((r) => r.key);
        expect(new Set(rk).size).toBe(rk.length);
        const ck = out.checks.map((c) => c.id);
        expect(new Set(ck).size).toBe(ck.length);
        for (const f of out.formulas) {
          expect(f.symbolic.startsWith(`${f.symbol} = `)).toBe(true);
          expect(f.substituted.startsWith(`${f.symbol} = `)).toBe(true);
          expect(f.substituted).not.toMatch(/\u0001/);
        }
        for (const c of out.components) expect(c.display.length).toBeGreaterThan(0);
      });

      it("every field error message names the rule", () => {
        const p = parseRawInputs(t, Object.fromEntries(Object.entries(t.defaults).map(([k, v]) => [k, typeof v === "string" ? "nonsense" : v])));
        expect(p.ok).toBe(false);
        if (!p.ok) for (const e of p.errors) expect(e.message).toMatch(/expected|must|required/);
      });
    });
  }
});
