/**
 * amplifier.difference against ngspice (Debian's ngspice, an independent simulator), DC operating
 * points of the four-resistor bridge with a near-ideal op-amp (VCVS, gain 1e9):
 * - common-mode and differential gain at each of the 16 resistor-tolerance corners: the largest
 *   |Acm| and the smallest |Adm/Acm| must equal the engine's `acm_max` and `cmrr_r_corners`;
 * - the output current at the corners of the input range (±Vd, lowest and highest common mode):
 *   the largest |I| must equal the engine's `i_out_peak`, which includes the common-mode current
 *   through R1 + R2 into the output.
 *
 * Tolerances: the op-amp is a VCVS of gain A = 1e7. Its finite gain scales every output by
 * Aβ/(1 + Aβ), β = R1/(R1 + R2) of that corner (exact for this linear circuit), which the test
 * divides out; a larger A would make the nodal matrix ill-conditioned (condition number ~A, so
 * ~1e-16·A volts of round-off on a 3.6 mV common-mode output). ngspice prints 13 significant
 * figures (numdgt=12). What is left is round-off of order 1e-9 relative, so the engine's closed
 * forms must agree within 1e-6 relative — far below any difference a wrong formula would make
 * (the former output-current estimate was 10× too small).
 */
import { beforeAll, describe, expect, it } from "vitest";
import { differenceAmplifier } from "@/lib/calc/amplifier/difference";
import { demoOpAmp, toRawPart } from "@/lib/calc/core/demo-parts";
import { requireNgspice } from "@/lib/calc/spice/ngspice";
import type { CalcType, RawInputs } from "@/lib/calc/core/types";
import { ngspiceColumns, rel, run } from "../reference/amplifier/helpers";

const T = differenceAmplifier as unknown as CalcType;

beforeAll(() => {
  requireNgspice();
});

const A_OL = 1e7;

/** One bridge copy: V1 → R1 → n; R2 n → out; V2 → R3 → p; R4 p → ref; E out = A·(p − n). */
function bridge(tag: string, v1: string, v2: string, ref: string, r: [number, number, number, number], rl: number): string[] {
  return [
    `R1${tag} ${v1} n${tag} ${r[0]}`,
    `R2${tag} n${tag} o${tag} ${r[1]}`,
    `R3${tag} ${v2} p${tag} ${r[2]}`,
    `R4${tag} p${tag} ${ref} ${r[3]}`,
    `E${tag} e${tag} 0 p${tag} n${tag} ${A_OL}`,
    // 0 V source in series with the output: its current is the op-amp output current.
    `VI${tag} e${tag} o${tag} DC 0`,
    `RL${tag} o${tag} ${ref} ${rl}`,
  ];
}

function operatingPoint(lines: string[], vectors: string[]): Record<string, number> {
  const net = ["* Loopwright difference amplifier cross-check", ...lines, ".control", "set wr_singlescale", "set wr_vecnames", "option numdgt=12", "op", `wrdata op.txt ${vectors.join(" ")}`, "quit", ".endc", ".end"].join("\n");
  const cols = ngspiceColumns(net, "op.txt");
  return Object.fromEntries(vectors.map((v) => [v, cols[v][0]]));
}

describe("difference amplifier vs ngspice", () => {
  it("worst-case common-mode gain and CMRR over the 16 tolerance corners", () => {
    // G = 10, E24, 1 % resistors: R1 = R3 = 10 kΩ, R2 = R4 = 100 kΩ.
    const base: RawInputs = { gain: "10", series: "E24", r1Target: "10k", tolerance: "1", cmrrOpampDb: "200" };
    const { v, out } = run(T, base);
    const r1 = out.components.find((c) => c.ref === "R1")!.value;
    const r2 = out.components.find((c) => c.ref === "R2")!.value;
    const p = 0.01;
    const lines = ["VCM cm 0 DC 1", "VDP dp 0 DC 0.5", "VDN dn 0 DC -0.5"];
    const vecs: string[] = [];
    for (let k = 0; k < 16; k++) {
      const s = (bit: number) => ((k >> bit) & 1 ? 1 + p : 1 - p);
      const r: [number, number, number, number] = [r1 * s(0), r2 * s(1), r1 * s(2), r2 * s(3)];
      lines.push(...bridge(`c${k}`, "cm", "cm", "0", r, 1e9), ...bridge(`d${k}`, "dn", "dp", "0", r, 1e9));
      vecs.push(`v(oc${k})`, `v(od${k})`);
    }
    const op = operatingPoint(lines, vecs);
    let acmMax = 0;
    let cmrrMin = Infinity;
    for (let k = 0; k < 16; k++) {
      const s = (bit: number) => ((k >> bit) & 1 ? 1 + p : 1 - p);
      const aBeta = (A_OL * r1 * s(0)) / (r1 * s(0) + r2 * s(1));
      const ideal = (1 + aBeta) / aBeta; // divide out the finite loop gain (exact, linear circuit)
      const acm = Math.abs(op[`v(oc${k})`]) * ideal; // 1 V common mode in
      const adm = Math.abs(op[`v(od${k})`]) * ideal; // 1 V differential in
      acmMax = Math.max(acmMax, acm);
      cmrrMin = Math.min(cmrrMin, adm / acm);
    }
    expect(rel(v("acm_max"), acmMax)).toBeLessThan(1e-6);
    expect(rel(v("cmrr_r_corners"), cmrrMin)).toBeLessThan(1e-6);
    // And both sit near Franco's linearised worst case (1 + R2/R1)/(4p) = 275 (4th ed., ch. 2).
    expect(rel(cmrrMin, 275)).toBeLessThan(0.02);
  });

  it("peak output current includes the common-mode current through R1 + R2", () => {
    // Attenuator G = 0.1 (R1 = 100 kΩ, R2 = 10 kΩ) on ±15 V for ±100 V common mode, 10 V peak
    // differential, RL = 10 kΩ, Vref = 0. The four input corners (vd = ±10 V, vcm = ±100 V).
    const patch: RawInputs = { gain: "0.1", series: "E24", r1Target: "100k", vcmMin: "-100", vcmMax: "100", vdPeak: "10", rLoad: "10k", vRef: "0" };
    const { v, out } = run(T, patch);
    const r1 = out.components.find((c) => c.ref === "R1")!.value;
    const r2 = out.components.find((c) => c.ref === "R2")!.value;
    expect([r1, r2]).toEqual([100e3, 10e3]);
    const lines: string[] = [];
    const vecs: string[] = [];
    let k = 0;
    for (const vd of [10, -10]) {
      for (const vcm of [100, -100]) {
        lines.push(`V1k${k} a${k} 0 DC ${vcm - vd / 2}`, `V2k${k} b${k} 0 DC ${vcm + vd / 2}`);
        lines.push(...bridge(`k${k}`, `a${k}`, `b${k}`, "0", [r1, r2, r1, r2], 10e3));
        vecs.push(`i(VIk${k})`);
        k++;
      }
    }
    const op = operatingPoint(lines, vecs);
    // The finite gain moves the output current by at most (1 + R2/R1)/A = 1.1e-7 relative here
    // (V+ − V− = Vout/A), so the same 1e-6 bound holds without a correction.
    const iMax = Math.max(...vecs.map((x) => Math.abs(op[x])));
    expect(iMax).toBeGreaterThan(1e-3); // ≈ 1.064 mA: (10·0.6 + 100)/110 kΩ + 10·0.1/10 kΩ
    expect(rel(v("i_out_peak"), iMax)).toBeLessThan(1e-6);
  });

  it("the output current check fails when the common-mode current exceeds the part's limit", () => {
    // Same circuit with a part limited to 0.5 mA: 1.064 mA (ngspice above) must fail; the former
    // RL ∥ (R1 + R2) estimate, 1 V/9.17 kΩ = 109 µA, passed it.
    const part = toRawPart({ ...demoOpAmp("LW-OA610"), ioutMax: 0.5e-3 });
    const r = run(T, { gain: "0.1", series: "E24", r1Target: "100k", vcmMin: "-100", vcmMax: "100", vdPeak: "10", rLoad: "10k", vRef: "0", opamp: part });
    expect(r.check("output.current").severity).toBe("fail");
    expect(r.check("output.current").message).toMatch(/1\.064 mA exceeds the part's 500 µA; raise RL or R1 and R2/);
  });
});
