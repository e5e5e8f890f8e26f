/**
 * The filter calculation types through their public contract: raw inputs → parseRawInputs →
 * compute. Bad input gets messages naming the field; impossible designs give failing checks,
 * never NaN; schema-valid input never throws and gives finite numbers (fast-check).
 */
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { parseRawInputs } from "@/lib/calc/core/inputs";
import { demoOpAmp, toRawPart } from "@/lib/calc/core/demo-parts";
import type { CalcOutput, CalcType, RawInputs } from "@/lib/calc/core/types";
import { bandpassType, filterTypes, highpassType, lowpassType } from "@/lib/calc/filter";
import { getCalcType } from "@/lib/calc/registry";

function run(type: CalcType, raw: RawInputs): CalcOutput {
  const p = parseRawInputs(type, raw);
  if (!p.ok) throw new Error(JSON.stringify(p.errors));
  return type.compute(p.input);
}
function errorsOf(type: CalcType, patch: RawInputs) {
  const p = parseRawInputs(type, { ...type.defaults, ...patch });
  return p.ok ? [] : p.errors;
}
function allFinite(o: CalcOutput): boolean {
  const nums: number[] = [
    ...o.results.map((r) => r.value),
    ...o.formulas.map((f) => f.value),
    ...o.checks.filter((c) => c.margin !== undefined).map((c) => c.margin as number),
    ...o.components.map((c) => c.value),
  ];
  for (const p of o.plots) {
    if (p.kind === "line") for (const s of p.series) nums.push(...s.x, ...s.y);
    if (p.kind === "histogram") nums.push(...p.edges, ...p.counts);
  }
  return nums.every(Number.isFinite);
}

describe("registry", () => {
  it("registers the three filter types with one signature pattern", () => {
    expect(filterTypes.map((t) => t.id)).toEqual(["filter.lowpass", "filter.highpass", "filter.bandpass"]);
    for (const t of filterTypes) {
      expect(getCalcType(t.id)).toBe(t);
      expect(t.pack).toBe("filter");
      expect(t.version).toBe("1.0.1");
      expect(t.fields.some((f) => f.kind === "part" && f.key === "opamp")).toBe(true);
      expect(typeof t.netlist).toBe("function");
    }
  });
  it("defaults compute to a design that passes its own checks", () => {
    for (const t of filterTypes) {
      const o = run(t, t.defaults);
      expect(allFinite(o)).toBe(true);
      expect(o.checks.filter((c) => c.severity === "fail").map((c) => c.id)).toEqual([]);
      expect(o.tables[0].rows.length).toBeGreaterThan(0);
      expect(o.plots.map((p) => p.id)).toEqual(expect.arrayContaining(["bode.magnitude", "bode.phase", "group-delay", "mc.frequency"]));
      // A gain histogram only where the gain depends on toleranced parts; otherwise a sentence.
      const gainResult = o.results.find((r) => r.key === "wc_gain_max")!.value - o.results.find((r) => r.key === "wc_gain_min")!.value;
      if (gainResult > 1e-9) expect(o.plots.map((p) => p.id)).toContain("mc.gain");
      else expect(o.assumptions.some((a) => /no gain histogram is drawn/.test(a))).toBe(true);
      expect(o.components.filter((c) => c.kind === "opamp").length).toBe(o.tables[0].rows.length);
    }
  });
});

describe("gain histogram", () => {
  it("is drawn for a gain set by resistors and left out (with a sentence) for unity-gain sections", () => {
    // Unity-gain Sallen-Key sections: the gain is exactly 1 whatever the tolerances
    // (common practice, no source: a follower's gain sets no component).
    const unity = run(lowpassType, { ...lowpassType.defaults, topology: "sk-unity", fixGain: false });
    expect(unity.plots.map((p) => p.id)).not.toContain("mc.gain");
    expect(unity.assumptions.join(" ")).toMatch(/does not depend on any toleranced component/);
    // Multiple feedback with gain 2: the gain is a resistor ratio and spreads.
    const mfb = run(lowpassType, { ...lowpassType.defaults, topology: "mfb", fixGain: true, gain: "2" });
    expect(mfb.plots.map((p) => p.id)).toContain("mc.gain");
  });
});

describe("bad input names the field", () => {
  const cases: Array<[string, CalcType, RawInputs, string, RegExp]> = [
    ["order 0", lowpassType, { order: 0 }, "order", /order must be from 1 to 8/],
    ["order 9", lowpassType, { order: 9 }, "order", /order must be from 1 to 8/],
    ["cutoff 0", lowpassType, { cutoff: "0" }, "cutoff", /cutoff must be between/],
    ["cutoff negative", highpassType, { cutoff: "-100" }, "cutoff", /cutoff must be between/],
    ["stopband below a low-pass cutoff", lowpassType, { stopbandFreq: "500" }, "stopbandFreq", /above the cutoff/],
    ["stopband above a high-pass cutoff", highpassType, { stopbandFreq: "500" }, "stopbandFreq", /below the cutoff/],
    ["ripple not offered", lowpassType, { response: "chebyshev", rippleDb: 1.5 }, "rippleDb", /Passband ripple must be one of/],
    ["resistor tolerance 0", lowpassType, { resTolerance: "0" }, "resTolerance", /greater than 0 %/],
    ["capacitor tolerance 60 %", bandpassType, { capTolerance: "60" }, "capTolerance", /at most 50 %/],
    ["N above the limit", lowpassType, { mcTrials: 100_001 }, "mcTrials", /at most 100,000/],
    ["band-pass centre 0", bandpassType, { centre: "0" }, "centre", /centre must be between/],
    ["band-pass stopband at the centre", bandpassType, { stopbandFreq: "1k" }, "stopbandFreq", /must differ from the centre/],
  ];
  for (const [name, type, patch, field, msg] of cases) {
    it(name, () => {
      const errs = errorsOf(type, patch);
      const e = errs.find((x) => x.field === field);
      expect(e, JSON.stringify(errs)).toBeDefined();
      expect(e!.message).toMatch(msg);
    });
  }
  it("a Chebyshev design without a ripple is refused by the schema", () => {
    const r = lowpassType.schema.safeParse({ ...parseOk(lowpassType), response: "chebyshev", rippleDb: undefined });
    expect(r.success).toBe(false);
    if (!r.success) expect(r.error.issues.some((i) => i.path[0] === "rippleDb")).toBe(true);
  });
});

function parseOk(t: CalcType): Record<string, unknown> {
  const p = parseRawInputs(t, t.defaults);
  if (!p.ok) throw new Error("defaults do not parse");
  return p.input as Record<string, unknown>;
}

describe("a design the op-amp cannot support", () => {
  it("a 50 kHz 8th-order Chebyshev on a 100 kHz GBW part gives failing checks, not NaN", () => {
    const o = run(lowpassType, { ...lowpassType.defaults, response: "chebyshev", rippleDb: 1, order: 8, cutoff: "50k", stopbandFreq: "100k", passbandFreq: "20k", opamp: toRawPart(demoOpAmp("LW-OA710")) });
    expect(allFinite(o)).toBe(true);
    const fails = o.checks.filter((c) => c.severity === "fail").map((c) => c.id);
    expect(fails).toEqual(expect.arrayContaining(["gbw.section4"]));
    expect(fails.some((id) => id.startsWith("spec."))).toBe(true);
  });
  it("a band-pass with gain above 2Q² fails its realisability check", () => {
    const o = run(bandpassType, { ...bandpassType.defaults, q: "1", gain: "5" });
    expect(allFinite(o)).toBe(true);
    expect(o.checks.find((c) => c.id === "section1.realise")?.severity).toBe("fail");
  });
  it("an equal-component Sallen-Key design with a fixed gain of 1 reports that the gain cannot be set", () => {
    const o = run(lowpassType, { ...lowpassType.defaults, topology: "sk-equal", order: 4 });
    expect(o.checks.find((c) => c.id === "gain.realise")?.severity).toBe("fail");
  });
});

describe("netlist", () => {
  it("is plain SPICE with both op-amp models, an AC card and the design named", () => {
    const p = parseRawInputs(lowpassType, lowpassType.defaults);
    if (!p.ok) throw new Error("defaults do not parse");
    const ideal = lowpassType.netlist!(p.input, "ideal");
    const pole = lowpassType.netlist!(p.input, "single-pole");
    expect(ideal).toMatch(/^\* 4th-order Butterworth low-pass/);
    expect(ideal).toMatch(/\nEU1 /);
    expect(ideal).toMatch(/\n\.ac dec \d+ /);
    expect(ideal.trimEnd().endsWith(".end")).toBe(true);
    expect(pole).toMatch(/\n\.subckt LW_OPAMP_1P inp inn out\n/);
    expect(pole).toMatch(/\nXU1 /);
    expect(pole).not.toMatch(/\.control/);
  });
});

describe("property: schema-valid input never throws and gives finite numbers", () => {
  const parts = ["LW-OA110", "LW-OA320", "LW-OA520", "LW-OA710"].map((n) => toRawPart(demoOpAmp(n)));
  const freq = fc.double({ min: 0.1, max: 1e6, noNaN: true });
  it("low- and high-pass", () => {
    fc.assert(
      fc.property(
        fc.record({
          hp: fc.boolean(),
          response: fc.constantFrom("butterworth", "bessel", "chebyshev"),
          order: fc.integer({ min: 1, max: 8 }),
          rippleDb: fc.constantFrom(0.5, 1, 2, 3),
          cutoffMeaning: fc.constantFrom("-3db", "ripple-edge"),
          cutoff: freq,
          fixGain: fc.boolean(),
          gain: fc.double({ min: 0.01, max: 1000, noNaN: true }),
          gainSharing: fc.constantFrom("equal", "first", "last"),
          topology: fc.constantFrom("sk-unity", "sk-equal", "mfb"),
          firstOrder: fc.constantFrom("rc-buffer", "inverting"),
          resistorLevel: fc.double({ min: 10, max: 10e6, noNaN: true }),
          capSeries: fc.constantFrom("E6", "E12", "E24"),
          resSeries: fc.constantFrom("E24", "E48", "E96", "E192"),
          tol: fc.double({ min: 0.001, max: 0.5, noNaN: true }),
          stopRatio: fc.double({ min: 1.01, max: 100, noNaN: true }),
          part: fc.constantFrom(...parts),
          distribution: fc.constantFrom("uniform", "normal"),
          seed: fc.integer({ min: 0, max: 2 ** 32 - 1 }),
        }),
        (v) => {
          const type = v.hp ? highpassType : lowpassType;
          const fs = v.hp ? v.cutoff / v.stopRatio : v.cutoff * v.stopRatio;
          const raw: RawInputs = {
            ...type.defaults,
            response: v.response, order: v.order, rippleDb: v.rippleDb, cutoffMeaning: v.cutoffMeaning, cutoff: v.cutoff, fixGain: v.fixGain, gain: v.gain,
            gainSharing: v.gainSharing, topology: v.topology, firstOrder: v.firstOrder, resistorLevel: v.resistorLevel, capSeries: v.capSeries, resSeries: v.resSeries,
            resTolerance: v.tol, capTolerance: v.tol, stopbandFreq: fs, passbandFreq: v.hp ? fs * 1.5 : fs / 1.5, opamp: v.part,
            mcTrials: 50, mcDistribution: v.distribution, mcSeed: v.seed,
          };
          const p = parseRawInputs(type, raw);
          if (!p.ok) throw new Error(`generated input should be valid: ${JSON.stringify(p.errors)}`);
          const o = type.compute(p.input);
          if (!allFinite(o)) throw new Error("non-finite number in the output");
        },
      ),
      { numRuns: 60, seed: 20261202 },
    );
  }, 120_000);
  it("band-pass", () => {
    fc.assert(
      fc.property(freq, fc.double({ min: 0.1, max: 100, noNaN: true }), fc.double({ min: 0.01, max: 1000, noNaN: true }), fc.constantFrom(...parts), fc.double({ min: 1.01, max: 50, noNaN: true }), (f0, q, gain, part, r) => {
        const raw: RawInputs = { ...bandpassType.defaults, centre: f0, q, gain, opamp: part, stopbandFreq: f0 * r, mcTrials: 50 };
        const p = parseRawInputs(bandpassType, raw);
        if (!p.ok) throw new Error(JSON.stringify(p.errors));
        if (!allFinite(bandpassType.compute(p.input))) throw new Error("non-finite number in the output");
      }),
      { numRuns: 60, seed: 7 },
    );
  }, 120_000);
});
