/**
 * Reference pack against worked examples and independent computations.
 */
import { describe, expect, it } from "vitest";
import { shuntReference } from "@/lib/calc/reference/shunt";
import { adjustableReference, type AdjustableInput } from "@/lib/calc/reference/adjustable";
import { adcReferenceBudget } from "@/lib/calc/reference/adc-budget";
import { demoReference, toRawPart } from "@/lib/calc/core/demo-parts";
import type { ReferenceParams } from "@/lib/calc/core/parts";
import type { CalcType, RawInputs } from "@/lib/calc/core/types";
import { expectWellFormed } from "../../unit/calc/core/arbitraries";
import { parsedInput, rel, run } from "../amplifier/helpers";

const SHUNT = shuntReference as unknown as CalcType;
const ADJ = adjustableReference as unknown as CalcType;
const ADC = adcReferenceBudget as unknown as CalcType;

function ref(base: string, over: Partial<ReferenceParams>): RawInputs[string] {
  return toRawPart({ ...demoReference(base), ...over });
}

describe("reference.shunt", () => {
  it("Boylestad & Nashelsky Zener example: VZ 20 V, R 220 Ω, RL 1.2 kΩ, IZM 60 mA → Vi from 23.67 V to 36.87 V (value from memory)", () => {
    // The book finds the input range that keeps the Zener on; here the design direction: at
    // Vi,min = 23.67 V with IL = 20/1.2k = 16.67 mA and IZ,min ≈ 0 the largest R is 220 Ω, and at
    // Vi,max = 36.87 V the Zener carries IZM = 60 mA. Ideal parts (0 % tolerance, exact VZ).
    const zener = ref("LW-Z51", { vNom: 20, accuracy: 0, iMin: 0, iMax: 0.06, pMax: 1.2, zDyn: 0 });
    const il = 20 / 1200;
    const viMin = 20 * (1 + 220 / 1200); // 23.667 V
    const viMax = 220 * (0.06 + il) + 20; // 36.867 V
    const { v } = run(SHUNT, { reference: zener, vSupplyMin: String(viMin), vSupplyMax: String(viMax), iLoadMin: String(il), iLoadMax: String(il), series: "E12", tolerance: "0", resistorRating: "10" });
    expect(rel(v("r_max"), 220)).toBeLessThan(1e-12); // ideal Zener (IZ,min = 0), exact arithmetic
    expect(v("r_selected")).toBe(220); // E12 member (IEC 60063)
    expect(rel(v("iz_max_wc"), 0.06)).toBeLessThan(1e-12);
    expect(Math.abs(viMin - 23.67)).toBeLessThan(0.005);
    expect(Math.abs(viMax - 36.87)).toBeLessThan(0.005);
  });

  it("rounds down the safe way, tolerance included (hand-worked)", () => {
    // LW-SR25: 2.5 V ±0.5 %, Iz,min 60 µA. Vs 4.5–5.5 V, IL 0–1 mA, 1 % E24:
    // Rmax = (4.5 − 2.5125)/(1.06 mA) = 1875 Ω; /1.01 = 1856.4 Ω → 1.8 kΩ (next E24 value down).
    const { v, check } = run(SHUNT, {});
    expect(v("r_max")).toBeCloseTo(1875, 9);
    expect(v("r_selected")).toBe(1800);
    // Minimum current with R at +1 %: (4.5 − 2.5125)/(1818 Ω) − 1 mA = 93.2 µA ≥ 60 µA.
    expect(v("iz_min_wc")).toBeCloseTo((4.5 - 2.5125) / 1818 - 1e-3, 12);
    expect(check("current.min").severity).toBe("pass");
    // Worst-case high: (5.5 − 2.4875)/(1782 Ω) = 1.6905 mA; P = 2.5125 V × that.
    expect(v("iz_max_wc")).toBeCloseTo((5.5 - 2.4875) / 1782, 12);
    expect(v("p_ref_max")).toBeCloseTo(2.5125 * ((5.5 - 2.4875) / 1782), 12);
    expect(v("p_res_max")).toBeCloseTo((5.5 - 2.4875) ** 2 / 1782, 12);
  });

  it("Rmax that is itself a preferred value is used and passes (hand calculation, shown here)", () => {
    // Ideal 2.5 V shunt (0 % accuracy), Iz,min 60 µA, Vs,min 5 V, IL,max 1.19 mA, 0 % E24:
    // Rmax = 2.5 V / 1.25 mA = 2 kΩ, an E24 member (IEC 60063 Table 1), so R = 2 kΩ and
    // Iz,lo = 2.5 V/2 kΩ − 1.19 mA = 60 µA, exactly the minimum. Formerly the 1e-16 round-off of
    // this subtraction failed the check with "60 µA, below its minimum 60 µA".
    const ideal = ref("LW-SR25", { accuracy: 0 });
    const { v, check } = run(SHUNT, { reference: ideal, vSupplyMin: "5", iLoadMax: "1.19m", tolerance: "0" });
    expect(v("r_selected")).toBe(2000);
    expect(Math.abs(v("iz_min_wc") - 60e-6)).toBeLessThan(1e-15);
    expect(check("current.min").severity).toBe("pass");
  });

  it("unachievable: supply below the reference, and a supply range too wide for a resistor feed", () => {
    const low = run(SHUNT, { vSupplyMin: "2.4", vSupplyMax: "5" });
    expect(low.check("supply.headroom").severity).toBe("fail");
    expect(low.check("supply.headroom").message).toMatch(/does not exceed the highest reference voltage 2\.512 V/);
    expectWellFormed(low.out);
    const wide = run(SHUNT, { vSupplyMin: "3", vSupplyMax: "60", iLoadMax: "5m" });
    expect(wide.check("current.max").severity).toBe("fail");
    // The sentence gives the highest supply this R allows (hand calculation): R = 91 Ω at −1 %,
    // Iz,max 15 mA, IL,min 0, Vz,min 2.4875 V → 90.09 Ω × 15 mA + 2.4875 V = 3.839 V.
    expect(wide.check("current.max").message).toMatch(/With R = 91 Ω the supply may rise only to 3\.839 V/);
    expect(wide.out.cautions.join(" ")).toMatch(/hazardous/);
    expectWellFormed(wide.out);
  });
});

describe("reference.adjustable", () => {
  it("Vout = Vref·(1 + R1/R2) + Iadj·R1 (Horowitz & Hill 3rd ed., ch. 9), hand-worked", () => {
    // 1.24 V, Iadj 0.3 µA (design value 0.15 µA); the chosen pair must give Vout as the formula says.
    const { v } = run(ADJ, {});
    const r1 = v("r1");
    const r2 = v("r2");
    expect(v("vout_nom")).toBeCloseTo(1.24 * (1 + r1 / r2) + 0.15e-6 * r1, 12);
    expect(Math.abs(v("error_design"))).toBeLessThan(0.1); // % — E96 pair within 0.1 % of 5 V
  });

  it("worst case equals a brute-force search over every error at its limits (independent method)", () => {
    const inp = parsedInput<AdjustableInput>(ADJ, {});
    const { v } = run(ADJ, {});
    const r = inp.reference;
    const r1 = v("r1");
    const r2 = v("r2");
    // Box height over the operating range and 25 °C (box method; the initial accuracy is at 25 °C).
    const drift = r.tempco * (Math.max(inp.tMax, 25) - Math.min(inp.tMin, 25));
    let hi = -Infinity;
    let lo = Infinity;
    // 2^5 corners: Vref accuracy, drift, R1, R2, Iadj ∈ {0, max}.
    for (let k = 0; k < 32; k++) {
      const s = (bit: number) => ((k >> bit) & 1 ? 1 : -1);
      const vref = r.vNom * (1 + s(0) * r.accuracy) * (1 + s(1) * drift);
      const a = r1 * (1 + s(2) * inp.tolerance);
      const b = r2 * (1 + s(3) * inp.tolerance);
      const iadj = (k >> 4) & 1 ? r.iAdj : 0;
      const vo = vref * (1 + a / b) + iadj * a;
      hi = Math.max(hi, vo);
      lo = Math.min(lo, vo);
    }
    expect(v("vout_max")).toBeCloseTo(hi, 12);
    expect(v("vout_min")).toBeCloseTo(lo, 12);
    expect(v("error_wc")).toBeCloseTo(Math.max(hi / 5 - 1, 1 - lo / 5) * 100, 9);
    // RSS is never above the worst case (common practice, no source).
    expect(v("error_rss")).toBeLessThanOrEqual(v("error_wc"));
  });

  it("box-method drift spans 25 °C when the operating range does not (hand calculation, shown here)", () => {
    // LW-AR124: TC 50 ppm/°C. At 50…85 °C the box must reach down to 25 °C, where the initial
    // accuracy is stated: ΔT = 60 °C → 50 ppm/°C × 60 °C = 0.3 % (not 35 °C → 0.175 %).
    const { v } = run(ADJ, { tMin: "50", tMax: "85" });
    expect(v("dT_span")).toBe(60);
    expect(v("drift")).toBeCloseTo(0.3, 12); // %
    // Worst case high with every term at its limit, hand-evaluated from the same corner:
    // Vref·(1 + 0.5 %)·(1 + 0.3 %)·(1 + R1·1.001/(R2·0.999)) + Iadj·R1·1.001.
    const r1 = v("r1");
    const r2 = v("r2");
    const hi = 1.24 * 1.005 * 1.003 * (1 + (r1 * 1.001) / (r2 * 0.999)) + 0.3e-6 * r1 * 1.001;
    expect(rel(v("vout_max"), hi)).toBeLessThan(1e-12);
  });

  it("unachievable: a target below Vref, and an error limit tighter than the reference allows", () => {
    const below = run(ADJ, { vOutTarget: "1" });
    expect(below.check("vout.range").severity).toBe("fail");
    expect(below.check("vout.range").message).toMatch(/can only be set to Vref or higher/);
    expectWellFormed(below.out);
    const tight = run(ADJ, { errorMax: "0.1" });
    expect(tight.check("error.wc").severity).toBe("fail");
    expect(tight.check("error.wc").message).toMatch(/accuracy and drift dominate/);
    // Between the reference-only error (1.225 %, hand-summed below) and the 0.1 % design's 1.374 %
    // the sentence names a resistor tolerance; fed back, it passes.
    // Reference-only, exact resistors: high 1.24 × 1.005 × 1.00625 × (1 + R1/R2) + Iadj·R1 and low
    // 1.24 × 0.995 × 0.99375 × (1 + R1/R2), against 5 V; the low side is the larger, 1.2255 %.
    const { v } = run(ADJ, {});
    const hiOnly = (1.24 * 1.005 * 1.00625 * (1 + v("r1") / v("r2")) + 0.3e-6 * v("r1")) / 5 - 1;
    const loOnly = 1 - (1.24 * 0.995 * 0.99375 * (1 + v("r1") / v("r2"))) / 5;
    expect(Math.max(hiOnly, loOnly)).toBeCloseTo(0.012255, 5);
    expect(tight.check("error.wc").message).toMatch(/with exact resistors the error would still be 1\.225 %/);
    const mid = run(ADJ, { errorMax: "1.3" });
    const m = /resistors of ([\d.]+) % or better would meet it \(0\.1 % now\)/.exec(mid.check("error.wc").message);
    expect(m).not.toBeNull();
    expect(run(ADJ, { errorMax: "1.3", tolerance: m![1] }).check("error.wc").severity).toBe("pass");
    expect(run(ADJ, { errorMax: "1.3", tolerance: String(Number(m![1]) * 1.2) }).check("error.wc").severity).toBe("fail");
    expectWellFormed(tight.out);
  });
});

describe("reference.adc-budget", () => {
  it("budget terms, hand-worked for a 4.096 V, 0.05 %, 3 ppm/°C reference at 12 bits", () => {
    // 1 LSB = 4.096 V / 4096 = 1 mV (definition). Initial 0.05 % = 2.048 mV = 2.048 LSB;
    // box drift 3 ppm/°C × 125 °C = 375 ppm = 1.536 mV; long-term 50 ppm/1000 h × √8.76 = 148 ppm
    // (√t scaling: common practice, no source); noise 12 µV; load 0.08 Ω × 1 mA = 80 µV.
    const { v } = run(ADC, {});
    expect(v("lsb")).toBeCloseTo(1e-3, 15);
    expect(v("e_init")).toBeCloseTo(2.048e-3, 15);
    expect(v("e_temp")).toBeCloseTo(1.536e-3, 15);
    expect(v("e_long")).toBeCloseTo(4.096 * 50e-6 * Math.sqrt(8.76), 15);
    expect(v("e_noise")).toBeCloseTo(12e-6, 15);
    expect(v("e_load")).toBeCloseTo(80e-6, 15);
    const wc = 2.048e-3 + 1.536e-3 + 4.096 * 50e-6 * Math.sqrt(8.76) + 12e-6 + 80e-6;
    expect(v("e_wc")).toBeCloseTo(wc, 15);
    expect(v("e_wc_lsb")).toBeCloseTo(wc / 1e-3, 9);
    expect(v("e_wc_ppm")).toBeCloseTo((wc / 4.096) * 1e6, 6);
    expect(v("e_rss")).toBeCloseTo(Math.hypot(2.048e-3, 1.536e-3, 4.096 * 50e-6 * Math.sqrt(8.76), 12e-6, 80e-6), 15);
  });

  it("the LSB figure does not depend on FS/Vref (a reference error is a gain error)", () => {
    expect(run(ADC, { fsRatio: "2" }).v("e_wc_lsb")).toBeCloseTo(run(ADC, {}).v("e_wc_lsb"), 12);
  });

  it("calibration removes the initial term", () => {
    expect(run(ADC, { calibrated: true }).v("e_init")).toBe(0);
  });

  it("box-method drift: the box spans 25 °C, where the initial accuracy is stated (hand calculation, shown here)", () => {
    // Box method (Horowitz & Hill 3rd ed., ch. 9): over a temperature box the reference stays
    // within Vnom·TC·ΔT. The initial accuracy is the error at 25 °C, so the drift that adds to it
    // is V(T) − V(25 °C); a box that does not contain 25 °C bounds nothing about that difference.
    // The box must therefore span the operating range and 25 °C:
    //   50…85 °C:   ΔT = 85 − 25 = 60 °C → 4.096 V × 3 ppm/°C × 60 °C = 737.28 µV (not 35 °C → 430 µV)
    //   −55…−10 °C: ΔT = 25 − (−55) = 80 °C → 983.04 µV
    //   0…70 °C (crosses 25 °C): ΔT = 70 °C → 860.16 µV, the plain operating span.
    // Exact products of decimals, so 1e-12 relative.
    const hot = run(ADC, { tMin: "50", tMax: "85" });
    expect(rel(hot.v("e_temp"), 4.096 * 3e-6 * 60)).toBeLessThan(1e-12);
    expect(rel(run(ADC, { tMin: "-55", tMax: "-10" }).v("e_temp"), 4.096 * 3e-6 * 80)).toBeLessThan(1e-12);
    expect(rel(run(ADC, { tMin: "0", tMax: "70" }).v("e_temp"), 4.096 * 3e-6 * 70)).toBeLessThan(1e-12);
    // A range that is a single temperature away from 25 °C still drifts from the 25 °C value.
    expect(rel(run(ADC, { tMin: "60", tMax: "60" }).v("e_temp"), 4.096 * 3e-6 * 35)).toBeLessThan(1e-12);
    expectWellFormed(hot.out);
  });

  it("unachievable: 24 bits from a 0.05 % reference fails, naming the dominant term", () => {
    const r = run(ADC, { bits: 24, errorMaxLsb: "4" });
    expect(r.check("error.total").severity).toBe("fail");
    expect(r.check("error.total").message).toMatch(/initial accuracy dominates/);
    expectWellFormed(r.out);
  });
});
