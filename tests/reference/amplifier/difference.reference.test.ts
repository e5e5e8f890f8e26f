/**
 * amplifier.difference against the standard results for the four-resistor difference amplifier.
 */
import { describe, expect, it } from "vitest";
import { differenceAmplifier, cornerCmrr } from "@/lib/calc/amplifier/difference";
import type { CalcType, RawInputs } from "@/lib/calc/core/types";
import { demoOpAmp, toRawPart } from "@/lib/calc/core/demo-parts";
import { expectWellFormed } from "../../unit/calc/core/arbitraries";
import { rel, run } from "./helpers";

const T = differenceAmplifier as unknown as CalcType;
const base: RawInputs = { gain: "10", series: "E24", r1Target: "10k", tolerance: "1", cmrrOpampDb: "200" };

describe("difference amplifier", () => {
  it("worst-case CMRR from tolerance: (1 + R2/R1)/(4p) (Franco 4th ed., ch. 2)", () => {
    // R1 = R3 = 10 kΩ, R2 = R4 = 100 kΩ, 1 % resistors: 11 / 0.04 = 275 → 48.79 dB (hand-worked
    // from Franco's expression). The op-amp CMRR is set to 200 dB so it does not count.
    const { v } = run(T, base);
    expect(v("gain")).toBe(10);
    expect(v("cmrr_r")).toBeCloseTo(275, 9);
    // The exact 16-corner value: for p = 1 % it lies within 2p of the linearised bound.
    expect(rel(v("cmrr_r_corners"), 275)).toBeLessThan(0.02);
    expect(v("cmrr_total_db")).toBeCloseTo(20 * Math.log10(v("cmrr_r_corners")), 6);
  });

  it("corner enumeration converges to the linearised bound as p → 0 (independent check of both)", () => {
    // Exact bridge algebra over the 16 corners vs (1+G)/(4p): the difference is O(p).
    for (const p of [1e-3, 1e-4, 1e-5]) {
      const { cmrrMin } = cornerCmrr(10e3, 100e3, p);
      expect(rel(cmrrMin, 11 / (4 * p))).toBeLessThan(3 * p);
    }
  });

  it("op-amp CMRR adds as 1/CMRR = 1/CMRR_r + 1/CMRR_OA (worst case, Franco ch. 5)", () => {
    // 0.1 % resistors at G = 10: 2750; with a 70 dB op-amp (3162.3): 1/(1/2750 + 1/3162.3) ≈ 1471.
    const { v } = run(T, { ...base, tolerance: "0.1", cmrrOpampDb: "70" });
    const cr = v("cmrr_r_corners");
    expect(v("cmrr_total")).toBeCloseTo(1 / (1 / cr + 1 / 10 ** (70 / 20)), 6);
  });

  it("common mode at the op-amp inputs: V+ = (G·V2 + Vref)/(1 + G) (Franco ch. 2, hand-worked)", () => {
    // Vcm up to 10.9 V with 0.2 V peak differential: V2 max = 11 V → V+ = 110/11 = 10 V.
    const { v, check } = run(T, { ...base, vcmMin: "-10.9", vcmMax: "10.9", vdPeak: "0.2" });
    expect(v("v_plus_max")).toBeCloseTo(10, 10);
    expect(v("v_plus_min")).toBeCloseTo(-10, 10);
    expect(check("icmr.high").severity).toBe("pass"); // LW-OA610 on ±15 V: limit 13.5 V
  });

  it("output current: load plus the current through R2, common mode included (hand calculation, shown here)", () => {
    // With v1, v2, vout measured from Vref, the − input sits at Gd·v2/(1 + Gd), so
    // I(R2) = (vout − v−)/R2 = (vd·(Gd + ½) − vcm)/(R1 + R2) for v2,1 = vcm ± vd/2.
    // Defaults: Gd = 10, R1 = 10 kΩ, R2 = 100 kΩ, RL = 10 kΩ, Vd = 0.2 V peak, Vcm ±5 V, Vref 0:
    //   load 2 V/10 kΩ = 200 µA; feedback 0.2·10.5/110 kΩ = 19.09 µA; common mode 5/110 kΩ = 45.45 µA
    //   → 264.5 µA. (ngspice confirms the bridge algebra in tests/spice/amplifier-difference.test.ts.)
    const { v } = run(T, { gain: "10", series: "E24", r1Target: "10k", rLoad: "10k", vdPeak: "0.2", vcmMin: "-5", vcmMax: "5", vRef: "0" });
    expect(rel(v("i_out_peak"), 2 / 10e3 + (0.2 * 10.5) / 110e3 + 5 / 110e3)).toBeLessThan(1e-12);
    // Common mode is measured from Vref: Vref = 5 V with Vcm 0…5 V leaves |vcm − Vref| ≤ 5 V.
    const shifted = run(T, { gain: "10", series: "E24", r1Target: "10k", rLoad: "10k", vdPeak: "0.2", vcmMin: "0", vcmMax: "5", vRef: "5", supply: "single", vPos: "12" });
    expect(rel(shifted.v("i_out_peak"), 2 / 10e3 + (0.2 * 10.5) / 110e3 + 5 / 110e3)).toBeLessThan(1e-12);
  });

  it("DC output error of the balanced bridge, (1 + R2/R1)·Vos + R2·Ios (Franco 4th ed., ch. 5), and the swing it uses up", () => {
    // Franco: Eo = NG·[Vos + (Rp − Rn)·IB + (Rp + Rn)·IOS/2] with Rp = Rn = R1 ∥ R2, so the IB term
    // cancels and NG·(R1 ∥ R2) = R2. LW-OA610 (Vos 25 µV, IOS 1 nA), R1 = 10 kΩ, R2 = 100 kΩ:
    // 11 × 25 µV + 100 kΩ × 1 nA = 275 µV + 100 µV = 375 µV (hand calculation).
    const { v } = run(T, { ...base, tolerance: "0.1" });
    expect(v("e_offset")).toBeCloseTo(375e-6, 15);
    expect(v("e_dc")).toBeCloseTo(375e-6 + v("cm_error_out"), 15);
    // ×1000 with a 5 mV, 200 nA part: R2 = 10 MΩ, Eo = 1001 × 5 mV + 10 MΩ × 200 nA = 7.005 V
    // before the common-mode error; with ±13 V of output range a 10 V peak no longer fits.
    const p = toRawPart(demoOpAmp("LW-OA110"));
    const big = run(T, { ...base, tolerance: "0.1", gain: "1000", vdPeak: "10m", opamp: p });
    expect(big.v("e_offset")).toBeCloseTo(7.005, 9);
    expect(big.check("swing.high").severity).toBe("pass");
    expect(big.check("swing.dc").severity).toBe("fail");
    expect(big.check("swing.dc").message).toMatch(/offset 7\.005 V/);
  });

  it("unachievable: 80 dB CMRR from 1 % resistors fails with a sentence; common mode beyond the rails fails", () => {
    const r = run(T, { ...base, cmrrMinDb: "80" });
    expect(r.check("cmrr").severity).toBe("fail");
    expect(r.check("cmrr").message).toMatch(/below the required 80 dB/);
    // The sentence says what tolerance would do (hand calculation): with a 200 dB op-amp the
    // resistors need CMRR_r = 1/(1e-4 − 1e-10) ≈ 10 000 (80 dB), so p ≈ 11/(4·10 000) = 0.0275 %.
    expect(r.check("cmrr").message).toMatch(/CMRR_r ≥ 80 dB, which needs a tolerance \(or matching\) of about 0\.0275 % at this gain \(now 1 %\)/);
    // An op-amp whose own CMRR is below the requirement cannot be rescued by matching.
    const oa = run(T, { ...base, tolerance: "0.01", cmrrOpampDb: "70", cmrrMinDb: "80" });
    expect(oa.check("cmrr").message).toMatch(/op-amp's own CMRR already uses up the requirement/);
    expectWellFormed(r.out);
    const cm = run(T, { ...base, gain: "1", vcmMax: "40" });
    expect(cm.check("icmr.high").severity).toBe("fail");
    expectWellFormed(cm.out);
  });
});
