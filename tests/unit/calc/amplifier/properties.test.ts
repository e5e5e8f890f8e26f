/**
 * Property tests of the amplifier pack: any schema-valid input gives a well-formed output (finite
 * numbers, sentences, no throw); an invalid value in any field gives a zod error naming it.
 */
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { gainStage, gainStageSchema } from "@/lib/calc/amplifier/gain-stage";
import { differenceAmplifier, differenceSchema } from "@/lib/calc/amplifier/difference";
import { powerStage, powerStageSchema, operatingPoint } from "@/lib/calc/amplifier/power-stage";
import { parseRawInputs } from "@/lib/calc/core/inputs";
import type { CalcOutput, CalcType } from "@/lib/calc/core/types";
import { expectWellFormed, invalidFieldProperty, logDouble, opAmpArb, tempRange, uniform, zeroOr } from "../core/arbitraries";

const gainStageArb = fc
  .record({
    configuration: fc.constantFrom("non-inverting" as const, "inverting" as const),
    gainRaw: logDouble(0.01, 10000),
    supply: fc.constantFrom("split" as const, "single" as const),
    vPos: logDouble(0.5, 200),
    vNeg: uniform(-200, 0),
    biasFrac: uniform(0.01, 0.99),
    rBias: zeroOr(1, 1e8),
    series: fc.constantFrom("E12" as const, "E24" as const, "E48" as const, "E96" as const, "E192" as const),
    tolerance: uniform(0, 0.2),
    rfTarget: logDouble(10, 10e6),
    rSource: zeroOr(1e-3, 10e6),
    biasCompensation: fc.boolean(),
    voutPeak: logDouble(1e-6, 200),
    fMax: logDouble(1e-3, 1e9),
    gainErrorMax: logDouble(1e-6, 0.5),
    rLoad: logDouble(1, 1e9),
    cLoad: zeroOr(1e-15, 1e-3),
    temps: tempRange,
    ibModel: fc.constantFrom("constant" as const, "doubling" as const),
    dcErrorMax: logDouble(1e-9, 100),
    fNoiseLow: logDouble(1e-3, 1e8),
    snrMin: uniform(0, 250),
    opamp: opAmpArb,
  })
  .map((r) => ({
    configuration: r.configuration,
    gain: r.configuration === "non-inverting" ? Math.max(1, r.gainRaw) : r.gainRaw,
    supply: r.supply,
    vPos: r.vPos,
    ...(r.supply === "split" ? { vNeg: r.vNeg } : { vBias: r.vPos * r.biasFrac, rBias: r.rBias }),
    series: r.series,
    tolerance: r.tolerance,
    rfTarget: r.rfTarget,
    rSource: r.rSource,
    biasCompensation: r.biasCompensation,
    voutPeak: r.voutPeak,
    fMax: r.fMax,
    gainErrorMax: r.gainErrorMax,
    rLoad: r.rLoad,
    cLoad: r.cLoad,
    tMin: r.temps[0],
    tMax: r.temps[1],
    ibModel: r.ibModel,
    dcErrorMax: r.dcErrorMax,
    fNoiseLow: r.fNoiseLow,
    snrMin: r.snrMin,
    opamp: r.opamp,
  }));

const differenceArb = fc
  .record({
    gain: logDouble(0.01, 1000),
    series: fc.constantFrom("E24" as const, "E48" as const, "E96" as const, "E192" as const),
    tolerance: logDouble(1e-6, 0.2),
    r1Target: logDouble(10, 10e6),
    supply: fc.constantFrom("split" as const, "single" as const),
    vPos: logDouble(0.5, 200),
    vNeg: uniform(-200, 0),
    vRef: uniform(-200, 200),
    cm: fc.tuple(uniform(-1000, 1000), uniform(-1000, 1000)).map(([a, b]) => (a <= b ? [a, b] : [b, a])),
    vdPeak: logDouble(1e-6, 1000),
    fMax: logDouble(1e-3, 1e9),
    rLoad: logDouble(1, 1e9),
    cmrrOpampDb: uniform(20, 200),
    cmrrMinDb: uniform(0, 200),
    opamp: opAmpArb,
  })
  .map((r) => ({
    gain: r.gain,
    series: r.series,
    tolerance: r.tolerance,
    r1Target: r.r1Target,
    supply: r.supply,
    vPos: r.vPos,
    ...(r.supply === "split" ? { vNeg: r.vNeg } : {}),
    vRef: r.vRef,
    vcmMin: r.cm[0],
    vcmMax: r.cm[1],
    vdPeak: r.vdPeak,
    fMax: r.fMax,
    rLoad: r.rLoad,
    cmrrOpampDb: r.cmrrOpampDb,
    cmrrMinDb: r.cmrrMinDb,
    opamp: r.opamp,
  }));

const powerArb = fc
  .record({
    stageClass: fc.constantFrom("class-a-series" as const, "class-a-transformer" as const, "class-b" as const, "class-ab" as const),
    vcc: logDouble(0.01, 1000),
    rLoad: logDouble(0.1, 1e6),
    turnsRatio: logDouble(0.01, 1000),
    vPeak: zeroOr(1e-6, 1000),
    iq: logDouble(1e-9, 100),
    vSat: zeroOr(1e-3, 100),
    tAmbient: uniform(-60, 150),
    tjMax: uniform(25, 250),
    marginFrac: uniform(0, 0.99),
    thetaJc: zeroOr(1e-3, 1000),
    thetaCs: zeroOr(1e-3, 1000),
    sharedHeatsink: fc.boolean(),
    heatsinkChosen: fc.boolean(),
    thetaSa: zeroOr(1e-3, 1000),
  })
  .filter((r) => r.tjMax > r.tAmbient + 1e-6)
  .map((r) => ({
    stageClass: r.stageClass,
    vcc: r.vcc,
    rLoad: r.rLoad,
    ...(r.stageClass === "class-a-transformer" ? { turnsRatio: r.turnsRatio } : {}),
    vPeak: r.vPeak,
    ...(r.stageClass === "class-b" ? {} : { iq: r.iq }),
    vSat: r.vSat,
    tAmbient: r.tAmbient,
    tjMax: r.tjMax,
    tjMargin: Math.min(200, (r.tjMax - r.tAmbient) * r.marginFrac),
    thetaJc: r.thetaJc,
    thetaCs: r.thetaCs,
    ...(r.stageClass === "class-b" || r.stageClass === "class-ab" ? { sharedHeatsink: r.sharedHeatsink } : {}),
    heatsinkChosen: r.heatsinkChosen,
    ...(r.heatsinkChosen ? { thetaSa: r.thetaSa } : {}),
  }));

describe("schema-valid input → well-formed output, no throw", () => {
  it("amplifier.gain-stage", () => {
    fc.assert(
      fc.property(gainStageArb, (raw) => {
        const parsed = gainStageSchema.safeParse(raw);
        expect(parsed.success, JSON.stringify(parsed.error?.issues)).toBe(true);
        if (parsed.success) expectWellFormed(gainStage.compute(parsed.data));
      }),
      { numRuns: 400 },
    );
  });
  it("amplifier.difference", () => {
    fc.assert(
      fc.property(differenceArb, (raw) => {
        const parsed = differenceSchema.safeParse(raw);
        expect(parsed.success, JSON.stringify(parsed.error?.issues)).toBe(true);
        if (parsed.success) expectWellFormed(differenceAmplifier.compute(parsed.data));
      }),
      { numRuns: 400 },
    );
  });
  it("amplifier.power-stage", () => {
    fc.assert(
      fc.property(powerArb, (raw) => {
        const parsed = powerStageSchema.safeParse(raw);
        expect(parsed.success, JSON.stringify(parsed.error?.issues)).toBe(true);
        if (parsed.success) expectWellFormed(powerStage.compute(parsed.data));
      }),
      { numRuns: 400 },
    );
  });
});

/** Result getter of one output (throws on a missing key, so a renamed result fails loudly). */
function results(out: CalcOutput): (key: string) => number {
  return (key) => {
    const r = out.results.find((x) => x.key === key);
    if (!r) throw new Error(`no result ${key}`);
    return r.value;
  };
}

/** Relative slack for comparisons of computed doubles (a few ulps of accumulated round-off). */
const EPS = 1e-9;

describe("physical invariants over the whole schema (not only the defaults)", () => {
  it("amplifier.gain-stage: gain within its tolerance band, WC ≥ RSS, output inside the rails, PM in (0°, 180°]", () => {
    const seen = new Map<string, Set<string>>();
    fc.assert(
      fc.property(gainStageArb, (raw) => {
        const input = gainStageSchema.parse(raw);
        const out = gainStage.compute(input);
        const v = results(out);
        // Resistor tolerance can only widen the gain around its nominal (Franco ch. 1 algebra).
        expect(v("gain_min")).toBeLessThanOrEqual(Math.abs(v("gain_ideal")) * (1 + EPS));
        expect(v("gain_max")).toBeGreaterThanOrEqual(Math.abs(v("gain_ideal")) * (1 - EPS));
        // A root-sum-square of the same terms never exceeds their plain sum.
        expect(v("e_dc_rss")).toBeLessThanOrEqual(v("e_dc_wc") * (1 + EPS) + 1e-300);
        // The load can only take open-loop gain away; the loaded bandwidth is at most GBW/NG + fp.
        expect(v("aol_loaded")).toBeLessThanOrEqual(v("aol") * (1 + EPS));
        expect(v("f3db")).toBeLessThanOrEqual((v("f3db_gbw") + v("f_pole")) * (1 + EPS));
        // A single-pole noise bandwidth never exceeds π/2 of its −3 dB frequency (Franco ch. 7).
        expect(v("nbw")).toBeLessThanOrEqual((Math.PI / 2) * v("f3db") * (1 + EPS));
        // An output cannot pass its rails; the peak current is at least the resistive one.
        const vNeg = input.supply === "split" ? (input.vNeg ?? 0) : 0;
        expect(v("v_out_max")).toBeLessThanOrEqual(input.vPos);
        expect(v("v_out_min")).toBeGreaterThanOrEqual(vNeg);
        expect(v("i_out_peak")).toBeGreaterThanOrEqual((input.voutPeak / v("r_load_total")) * (1 - EPS));
        if (out.results.some((r) => r.key === "phase_margin")) {
          expect(v("phase_margin")).toBeGreaterThan(0);
          expect(v("phase_margin")).toBeLessThanOrEqual(180);
        }
        for (const c of out.checks) {
          if (!seen.has(c.id)) seen.set(c.id, new Set());
          seen.get(c.id)!.add(c.severity);
        }
      }),
      { numRuns: 400 },
    );
    // The generator reaches both outcomes of every main check, so the properties above are tested
    // on failing designs as well as passing ones.
    for (const id of ["gain.error", "bandwidth", "slew", "swing.high", "swing.low", "output.current", "supply.range", "icmr.high", "icmr.low", "dc.error", "noise.snr", "stability.pm"]) {
      expect([...(seen.get(id) ?? [])].sort(), id).toEqual(expect.arrayContaining(["fail", "pass"]));
    }
  });

  it("amplifier.difference: stage CMRR never above either of its parts, output current at least the load's", () => {
    fc.assert(
      fc.property(differenceArb, (raw) => {
        const out = differenceAmplifier.compute(differenceSchema.parse(raw));
        const v = results(out);
        // 1/CMRR = 1/CMRR_r + 1/CMRR_OA (Franco ch. 5): the sum is below each term.
        expect(v("cmrr_total")).toBeLessThanOrEqual(Math.min(v("cmrr_r_corners"), v("cmrr_oa")) * (1 + EPS));
        expect(v("i_out_peak")).toBeGreaterThanOrEqual(((v("gain") * raw.vdPeak) / raw.rLoad) * (1 - EPS));
        // A bridge of resistors with any tolerance left has some common-mode gain at its worst corner.
        expect(v("acm_max")).toBeGreaterThan(0);
      }),
      { numRuns: 400 },
    );
  });

  it("amplifier.power-stage: efficiency within the class limit and the worst-case dissipation really the worst, whenever the stage can swing the amplitude", () => {
    const seen = new Set<string>();
    fc.assert(
      fc.property(powerArb, (raw) => {
        const input = powerStageSchema.parse(raw);
        const out = powerStage.compute(input);
        const v = results(out);
        const amp = out.checks.find((c) => c.id === "output.amplitude")!;
        seen.add(amp.severity);
        expect(v("p_dev")).toBeGreaterThanOrEqual(0);
        if (amp.severity !== "fail" && !out.checks.some((c) => c.id === "bias.saturated")) {
          // Boylestad & Nashelsky: 25 % (series-fed A), 50 % (transformer-coupled A), π/4 (B, AB).
          expect(v("efficiency")).toBeLessThanOrEqual(v("efficiency_limit") * (1 + EPS));
          // The per-device worst case over all amplitudes is at least the dissipation at this one.
          expect(v("p_dev")).toBeLessThanOrEqual(v("p_dev_max") * (1 + EPS) + 1e-12);
          // …and at least at every amplitude the stage can deliver (independent sweep, 201 points).
          const perDevice = input.stageClass === "class-b" || input.stageClass === "class-ab" ? 0.5 : 1;
          for (let i = 0; i <= 200; i++) {
            const a = (v("vp_max") * i) / 200;
            expect(operatingPoint(input, a).pDevTotal * perDevice).toBeLessThanOrEqual(v("p_dev_max") * (1 + 1e-9) + 1e-12);
          }
        }
      }),
      { numRuns: 400 },
    );
    expect([...seen].sort()).toEqual(expect.arrayContaining(["fail", "pass"]));
  });
});

describe("invalid input → zod error naming the field", () => {
  for (const t of [gainStage, differenceAmplifier, powerStage] as unknown as CalcType[]) {
    it(t.id, () => invalidFieldProperty(t));
  }
  it("an invalid op-amp parameter names the part field", () => {
    const parsed = parseRawInputs(gainStage, gainStage.defaults);
    if (!parsed.ok) throw new Error("defaults");
    const r = gainStageSchema.safeParse({ ...parsed.input, opamp: { ...parsed.input.opamp, gbw: -1 } });
    expect(r.success).toBe(false);
    if (!r.success) expect(r.error.issues.map((i) => i.path.join("."))).toContain("opamp.gbw");
  });
});
