/**
 * amplifier.gain-stage against ngspice (Debian's ngspice, an independent simulator) on circuits
 * written here from the designed resistors, with the op-amp as a single-pole macromodel: a VCVS
 * of gain A0 into an RC pole at fp = GBW/A0, a unity buffer and the output resistance Ro.
 * - DC gain with finite open-loop gain: operating point of the closed loop (Ro = 0, so the
 *   engine's G/(1 + NG/A0) is exact); agreement within 1e-9 relative (13 printed figures).
 * - Phase margin with a capacitive load: the loop is broken at the − input (the op-amp's input
 *   draws no current and the − input is grounded, so the break is exact), T(f) = v(fb)/v(test);
 *   the crossover |T| = 1 is interpolated in log f and log |T| between points of a
 *   2000-point-per-decade sweep (0.12 % apart; the interpolation error is of order 1e-8), and the
 *   phase there linearly. The engine's loop — dominant pole, the loaded gain A₀·Rx/(Rx + Ro),
 *   Rx = RL ∥ (Rf + Rg), and the pole of Ro ∥ Rx with CL — is then the same circuit, so the bounds
 *   are 1e-6 relative on the crossover and 1e-3° on the margin. (Before the loaded gain was
 *   modelled the engine's crossover was 1.5 % high and its margin 0.4° low here.)
 */
import { beforeAll, describe, expect, it } from "vitest";
import { gainStage } from "@/lib/calc/amplifier/gain-stage";
import { demoOpAmp, toRawPart } from "@/lib/calc/core/demo-parts";
import { requireNgspice } from "@/lib/calc/spice/ngspice";
import type { CalcType } from "@/lib/calc/core/types";
import { ngspiceColumns, rel, run } from "../reference/amplifier/helpers";

const T = gainStage as unknown as CalcType;

beforeAll(() => {
  requireNgspice();
});

/** Single-pole op-amp from (plus, minus) to out: A0, pole at GBW/A0, output resistance Ro. */
function opamp(plus: string, minus: string, out: string, a0: number, gbw: number, ro: number): string[] {
  const fp = gbw / a0;
  return [`EA na 0 ${plus} ${minus} ${a0}`, "RP na nb 1k", `CP nb 0 ${1 / (2 * Math.PI * 1e3 * fp)}`, "EB nc 0 nb 0 1", ro > 0 ? `RO nc ${out} ${ro}` : `VO nc ${out} DC 0`];
}

describe("gain stage vs ngspice", () => {
  it("DC gain with a finite open-loop gain: G/(1 + NG/A0) (Franco 4th ed., ch. 1)", () => {
    // 60 dB part so the finite-gain error (≈ 1 %) is large against the comparison bound.
    const p = toRawPart({ ...demoOpAmp("LW-OA320"), aolDb: 60, rout: 0 });
    for (const configuration of ["non-inverting", "inverting"]) {
      const { v, out } = run(T, { configuration, supply: "split", vPos: "2.5", vNeg: "-2.5", cLoad: "0", rSource: "0", opamp: p });
      const rg = out.components.find((c) => c.ref === "R1")!.value;
      const rf = out.components.find((c) => c.ref === "R2")!.value;
      const lines =
        configuration === "non-inverting"
          ? ["VIN in 0 DC 1", `RG inn 0 ${rg}`, `RF out inn ${rf}`, ...opamp("in", "inn", "out", 1e3, 10e6, 0), "RL out 0 10k"]
          : ["VIN in 0 DC 1", `RG in inn ${rg}`, `RF inn out ${rf}`, ...opamp("0", "inn", "out", 1e3, 10e6, 0), "RL out 0 10k"];
      const net = ["* gain stage DC gain", ...lines, ".control", "set wr_singlescale", "set wr_vecnames", "option numdgt=12", "op", "wrdata dc.txt v(out)", "quit", ".endc", ".end"].join("\n");
      const g = ngspiceColumns(net, "dc.txt")["v(out)"][0];
      expect(Math.abs(g / v("gain_ideal") - 1)).toBeGreaterThan(5e-3); // the finite-A0 effect is there
      expect(rel(v("gain_dc"), g)).toBeLessThan(1e-9);
    }
  });

  it("phase margin with a capacitive load (Franco 4th ed., ch. 8), loop broken at the − input", () => {
    for (const cl of ["1n", "2.2n", "4.7n"]) {
      const { v, out } = run(T, { cLoad: cl });
      const rg = out.components.find((c) => c.ref === "R1")!.value;
      const rf = out.components.find((c) => c.ref === "R2")!.value;
      const p = demoOpAmp("LW-OA320");
      const a0 = 10 ** (p.aolDb / 20);
      const clF = Number(cl.replace("n", "e-9"));
      const net = [
        "* gain stage loop gain",
        "VT test 0 DC 0 AC 1",
        ...opamp("test", "0", "out", a0, p.gbw, p.rout),
        `CL out 0 ${clF}`,
        "RL out 0 10k",
        `RF out fb ${rf}`,
        `RG fb 0 ${rg}`,
        ".control",
        "set wr_singlescale",
        "set wr_vecnames",
        "option numdgt=12",
        "ac dec 2000 100k 10meg",
        "let tm = vm(fb)",
        "let tp = vp(fb)",
        "wrdata lg.txt tm tp",
        "quit",
        ".endc",
        ".end",
      ].join("\n");
      const cols = ngspiceColumns(net, "lg.txt");
      const f = cols["frequency"];
      const m = cols["tm"];
      let i = 0;
      while (i + 1 < m.length && m[i + 1] > 1) i++;
      // Interpolate |T| = 1 in log f, then the phase there (2000 points per decade).
      const t = Math.log(m[i]) / Math.log(m[i] / m[i + 1]);
      const fc = f[i] * (f[i + 1] / f[i]) ** t;
      const ph = cols["tp"][i] + t * (cols["tp"][i + 1] - cols["tp"][i]);
      const pmSpice = 180 + (ph * 180) / Math.PI;
      expect(rel(v("f_crossover"), fc)).toBeLessThan(1e-6);
      expect(Math.abs(v("phase_margin") - pmSpice)).toBeLessThan(1e-3);
    }
  });
});
