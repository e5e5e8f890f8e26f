/**
 * Design equations, transfer functions and response.
 * - Design equations invert the transfer functions: with exact (unsnapped) values every section
 *   hits its target f₀, Q and gain to 1e-12 (internal consistency of two derivations).
 * * - The closed-form coefficients agree with the nodal solver (a different method) to 1e-10.
 * - The report formulas (mathjs expressions) agree with the coefficients to 1e-12.
 * - Group delay against closed forms (second-order section; Bessel delay at DC).
 */
import { describe, expect, it } from "vitest";
import { designFilter, sectionCircuit, type FilterSpec, type ValuePicker } from "@/lib/calc/filter/design";
import { compileCircuit } from "@/lib/calc/filter/mna";
import { FormulaSheet } from "@/lib/calc/core/formula";
import { renameVariables, sectionExpressions } from "@/lib/calc/filter/formulas";
import { minus3dBFrequency, sweepResponse } from "@/lib/calc/filter/response";
import { seriesPicker } from "@/lib/calc/filter/compute";

const exact: ValuePicker = { capSeries: "exact", resSeries: "exact", capNearest: (x) => x, capAtLeast: (x) => x, resNearest: (x) => x };
const base = { cutoff: 1000, gainSharing: "equal" as const, resistorLevel: 10e3, resistorTolerance: 0.01, capacitorTolerance: 0.05 };

function allSpecs(picker: ValuePicker): FilterSpec[] {
  const specs: FilterSpec[] = [];
  for (const kind of ["lowpass", "highpass"] as const)
    for (const topology of ["sk-unity", "sk-equal", "mfb"] as const)
      for (const firstOrder of ["rc-buffer", "inverting"] as const)
        for (const [family, order, rippleDb] of [["butterworth", 5], ["bessel", 3], ["chebyshev", 7, 3], ["chebyshev", 4, 0.5]] as const)
          specs.push({ kind, family, order, rippleDb: rippleDb as 3 | undefined, topology, firstOrder, gain: topology === "sk-equal" ? null : 3, picker, ...base });
  specs.push({ kind: "bandpass", centre: 2000, q: 8, gain: 4, resistorLevel: 10e3, picker, resistorTolerance: 0.01, capacitorTolerance: 0.05 });
  return specs;
}

describe("design equations", () => {
  it("with exact values every section meets its target f0, Q and gain, and the cascade its −3 dB point", () => {
    for (const spec of allSpecs(exact)) {
      const d = designFilter(spec);
      for (const s of d.sections) {
        expect(s.achieved.f0 / s.target.f0 - 1).toBeCloseTo(0, 12);
        if (s.variant.order === 2) expect(s.achieved.q / s.target.q - 1).toBeCloseTo(0, 12);
        expect(s.achieved.gain / s.target.gain - 1).toBeCloseTo(0, 12);
      }
      if (d.kind !== "bandpass") expect(minus3dBFrequency(d) / d.targetFrequency - 1).toBeCloseTo(0, 9);
    }
  });

  it("the overall gain is shared as asked and its magnitude is met where the topology can set it", () => {
    const d = designFilter({ kind: "lowpass", family: "butterworth", order: 5, topology: "mfb", firstOrder: "rc-buffer", gain: 8, picker: exact, ...base });
    expect(Math.abs(d.targetGain)).toBeCloseTo(8, 12);
    const gains = d.sections.map((s) => Math.abs(s.target.gain));
    gains.forEach((g) => expect(g).toBeCloseTo(2, 12)); // 8^(1/3) with three sections that take gain
    const fixed = designFilter({ kind: "lowpass", family: "butterworth", order: 4, topology: "sk-unity", firstOrder: "rc-buffer", gain: 2, picker: exact, ...base });
    expect(fixed.gainNote).toMatch(/fixes the passband gain/);
  });

  it("unity-gain Sallen-Key low-pass picks C1/C2 ≥ 4Q² (Carter & Mancini, 5th ed., ch. 16; value from memory)", () => {
    const d = designFilter({ kind: "lowpass", family: "chebyshev", rippleDb: 1, order: 6, topology: "sk-unity", firstOrder: "rc-buffer", gain: 1, picker: seriesPicker("E6", "E24"), ...base });
    for (const s of d.sections) {
      const c1 = d.values[s.offset + 2], c2 = d.values[s.offset + 3];
      expect(c1 / c2).toBeGreaterThanOrEqual(4 * s.target.q ** 2);
    }
  });
});

describe("transfer functions", () => {
  it("closed-form coefficients equal the nodal solution at many frequencies (1e-10: elimination round-off times the matrix condition, ~1e3)", () => {
    for (const spec of allSpecs(seriesPicker("E12", "E96"))) {
      const d = designFilter(spec);
      for (const s of d.sections) {
        const sv = compileCircuit(sectionCircuit(d, s), { kind: "ideal" });
        const [b0, b1, b2, a1, a2] = s.coefficients;
        for (const f of [1, 37, 500, 999, 1000, 1234, 5e3, 1e5]) {
          const w = 2 * Math.PI * f;
          const nr = b0 - b2 * w * w, ni = b1 * w, dr = 1 - a2 * w * w, di = a1 * w;
          const dd = dr * dr + di * di;
          const hr = (nr * dr + ni * di) / dd, hi = (ni * dr - nr * di) / dd;
          const [mr, mi] = sv.solve(w);
          const scale = Math.hypot(hr, hi);
          expect(Math.abs(mr - hr) / scale).toBeLessThan(1e-10);
          expect(Math.abs(mi - hi) / scale).toBeLessThan(1e-10);
        }
      }
    }
  });

  it("report formulas give the same f0, Q and gain as the coefficients (1e-12)", () => {
    for (const spec of allSpecs(seriesPicker("E12", "E96"))) {
      const d = designFilter(spec);
      const sheet = new FormulaSheet(Object.fromEntries(d.components.map((c) => [c.ref, { value: c.value, unit: c.kind === "resistor" ? "Ω" : "F" }])));
      for (const s of d.sections) {
        const ex = sectionExpressions(s.variant.topology, s.variant.kind, s.variant.gainNetwork);
        const names: Record<string, string> = { K: `K${s.index}`, Q: `Q${s.index}` };
        s.variant.parts.forEach((p, j) => (names[p.name] = s.refs[j]));
        if (ex.k) sheet.eval({ key: `K${s.index}`, label: "K", symbol: "K", expr: renameVariables(ex.k, names), unit: "V/V" });
        const f0 = sheet.eval({ key: `f${s.index}`, label: "f0", symbol: "f0", expr: renameVariables(ex.f0, names), unit: "Hz" });
        expect(f0 / s.achieved.f0 - 1).toBeCloseTo(0, 12);
        if (ex.q) expect(sheet.eval({ key: `Q${s.index}`, label: "Q", symbol: "Q", expr: renameVariables(ex.q, names), unit: "" }) / s.achieved.q - 1).toBeCloseTo(0, 12);
        const g = ex.gain ? sheet.eval({ key: `G${s.index}`, label: "G", symbol: "G", expr: renameVariables(ex.gain, names), unit: "V/V" }) : 1;
        expect(g / s.achieved.gain - 1).toBeCloseTo(0, 12);
      }
    }
  });
});

describe("group delay", () => {
  it("second-order low-pass: τ(ω) = (1/(Qω₀))·(1 + x²)/((1 − x²)² + x²/Q²), x = ω/ω₀ (closed form from the phase), to 1e-6", () => {
    const d = designFilter({ kind: "lowpass", family: "butterworth", order: 2, topology: "mfb", firstOrder: "rc-buffer", gain: 1, picker: exact, ...base });
    const { f0, q } = d.sections[0].achieved;
    const w0 = 2 * Math.PI * f0;
    const f = [10, 300, 900, 1000, 1100, 4000];
    const r = sweepResponse(d, f, { kind: "ideal" });
    f.forEach((fi, i) => {
      const x = fi / f0;
      const tau = ((1 / (q * w0)) * (1 + x * x)) / ((1 - x * x) ** 2 + (x * x) / (q * q));
      expect(r.delay[i] / tau - 1).toBeCloseTo(0, 6);
    });
  });

  it("nodal path (derivative of the nodal solution) and polynomial path (analytic) agree on |H|, phase and delay", () => {
    const d = designFilter({ kind: "highpass", family: "chebyshev", rippleDb: 1, order: 5, topology: "mfb", firstOrder: "inverting", gain: 2, picker: seriesPicker("E12", "E96"), ...base });
    const f = [50, 200, 700, 1000, 1300, 5000, 40e3];
    const a = sweepResponse(d, f, { kind: "ideal" });
    const b = sweepResponse(d, f, { kind: "ideal" }, Float64Array.from(d.values)); // forces nodal analysis
    f.forEach((_, i) => {
      expect(b.mag[i] / a.mag[i] - 1).toBeCloseTo(0, 10);
      expect(b.phase[i] - a.phase[i]).toBeCloseTo(0, 8);
      expect(b.delay[i] / a.delay[i] - 1).toBeCloseTo(0, 9); // two exact derivatives; round-off only
    });
  });

  it("Bessel low-pass delay at DC is ω₃/ω_c, ω₃ the −3 dB frequency of the unit-delay Bessel filter (n = 2…6: 1.3617, 1.7557, 2.1139, 2.4274, 2.7034 rad/s; value from memory), to 1e-4", () => {
    const w3 = [1.3617, 1.7557, 2.1139, 2.4274, 2.7034];
    w3.forEach((w, i) => {
      const d = designFilter({ kind: "lowpass", family: "bessel", order: i + 2, topology: "sk-unity", firstOrder: "rc-buffer", gain: 1, picker: exact, ...base });
      const r = sweepResponse(d, [0.01], { kind: "ideal" });
      expect(r.delay[0] * 2 * Math.PI * 1000).toBeCloseTo(w, 3);
      expect(Math.abs((r.delay[0] * 2 * Math.PI * 1000) / w - 1)).toBeLessThan(1e-4);
    });
  });
});
