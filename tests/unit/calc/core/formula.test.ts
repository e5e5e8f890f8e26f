import { describe, expect, it } from "vitest";
import { FormulaSheet, compileFormula } from "@/lib/calc/core/formula";
import { OutputBuilder } from "@/lib/calc/core/output";

describe("FormulaSheet", () => {
  it("evaluates, prints symbolically and with values, and chains results", () => {
    const f = new FormulaSheet({ GBW: { value: 1e6, unit: "Hz" } });
    const ng = f.eval(
      { key: "NG", label: "Noise gain", symbol: "NG", expr: "1 + Rf / Rg", unit: "V/V", reference: "Franco 4th ed., ch. 6" },
      { Rf: { value: 10e3, unit: "Ω" }, Rg: { value: 4.7e3, unit: "Ω" } },
    );
    expect(ng).toBeCloseTo(1 + 10 / 4.7, 14); // hand arithmetic
    const fb = f.eval({ key: "fB", label: "Closed-loop bandwidth", symbol: "f₋₃dB", expr: "GBW / NG", unit: "Hz" });
    expect(fb).toBeCloseTo(1e6 / (1 + 10 / 4.7), 6);
    expect(f.records[0].symbolic).toBe("NG = 1 + Rf / Rg");
    expect(f.records[0].substituted).toBe("NG = 1 + 10 kΩ / 4.7 kΩ");
    expect(f.records[0].reference).toBe("Franco 4th ed., ch. 6");
    expect(f.records[1].substituted).toBe("f₋₃dB = 1 MHz / 3.128 V/V");
    expect(f.ok).toBe(true);
  });

  it("prints display symbols, parenthesises negative values and powers of quantities", () => {
    const f = new FormulaSheet();
    f.eval(
      { key: "P", label: "Power", symbol: "P", expr: "V^2 / R + -I * 2 * pi", unit: "W" },
      { V: { value: -5, unit: "V", symbol: "Vo" }, R: { value: 8, unit: "Ω", symbol: "RL" }, I: { value: 1, unit: "A" } },
    );
    expect(f.records[0].symbolic).toBe("P = Vo^2 / RL + −I · 2 · π");
    expect(f.records[0].substituted).toBe("P = (−5 V)^2 / 8 Ω + −(1 A) · 2 · π");
    expect(f.records[0].value).toBeCloseTo(25 / 8 - 2 * Math.PI, 12);
  });

  it("records a non-finite result as 0 and makes a failing check of it", () => {
    const f = new FormulaSheet();
    const v = f.eval({ key: "x", label: "Ratio", symbol: "x", expr: "a / (b - b)", unit: "" }, { a: 1, b: 3 });
    expect(Number.isFinite(v)).toBe(false);
    expect(f.ok).toBe(false);
    expect(f.records[0].value).toBe(0);
    const checks = f.nonFiniteChecks();
    expect(checks).toHaveLength(1);
    expect(checks[0].severity).toBe("fail");
    expect(checks[0].message).toContain("Ratio");
    // sqrt of a negative number is NaN (not a complex number) in predictable mode.
    expect(Number.isNaN(f.eval({ key: "y", label: "Root", symbol: "y", expr: "sqrt(a - 4)", unit: "" }, { a: 1 }))).toBe(true);
  });

  it("scales fractions to percent in the record but keeps the fraction as the variable", () => {
    const f = new FormulaSheet();
    f.eval({ key: "err", label: "Gain error", symbol: "ε", expr: "a / b - 1", unit: "%", scale: "percent" }, { a: 101, b: 100 });
    expect(f.records[0].value).toBeCloseTo(1, 12);
    expect(f.records[0].unit).toBe("%");
    expect(f.value("err")).toBeCloseTo(0.01, 14);
    f.eval({ key: "z", label: "z", symbol: "z", expr: "err * 2", unit: "" });
    expect(f.records[1].substituted).toBe("z = 1 % · 2");
  });

  it("throws for programming errors: unknown variable, bad key", () => {
    const f = new FormulaSheet();
    expect(() => f.eval({ key: "q", label: "q", symbol: "q", expr: "nope * 2", unit: "" })).toThrow(/not defined/);
    expect(() => f.eval({ key: "a.b", label: "q", symbol: "q", expr: "2", unit: "" })).toThrow(/identifier/);
  });

  it("caches compiled expressions", () => {
    expect(compileFormula("1 + a / b")).toBe(compileFormula("1 + a / b"));
  });
});

describe("OutputBuilder", () => {
  it("never lets a non-finite value escape", () => {
    const b = new OutputBuilder();
    b.result("r", "Result", "r", NaN, "V");
    b.plots.push({ kind: "line", id: "p", title: "p", x: { label: "f", unit: "Hz", scale: "log" }, y: { label: "m", unit: "dB", scale: "linear" }, series: [{ name: "s", x: [1, 2, 3], y: [1, Infinity, 3] }] });
    const out = b.build();
    expect(out.results[0].value).toBe(0);
    expect(out.checks.some((c) => c.severity === "fail" && c.message.includes("Result"))).toBe(true);
    const p = out.plots[0];
    expect(p.kind === "line" && p.series[0].y).toEqual([1, 3]);
    expect(JSON.stringify(out)).not.toContain("null");
  });
});
