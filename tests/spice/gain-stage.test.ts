/**
 * The gain-stage netlist in ngspice (independent simulator):
 * - ideal model: the low-frequency gain equals the ideal gain of the designed resistors
 *   (1 + Rf/Rg, or Rf/(Rs + Rin)) within 1e-6 (VCVS 1e9, 9-figure output);
 * - single-pole model, no load capacitance: the closed-loop pole of A(s) = A0/(1 + s/ωp) with
 *   noise gain NG is at f = fp·(1 + A0/NG) = GBW/A0 + GBW/NG exactly (Franco, 4th ed., ch. 6,
 *   dominant-pole closed loop) when Ro = 0. With the part's Ro loaded by Rx = RL ∥ (Rf + Rg + Rs) the
 *   open-loop gain is A·Rx/(Rx + Ro), so f = fp·(1 + k·A0/NG), k = Rx/(Rx + Ro); the current fed
 *   through Rf into Ro is neglected (< 0.1 % here), so the bound is 0.5 %.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import fs from "node:fs";
import { parseRawInputs } from "@/lib/calc/core/inputs";
import { gainStage, type GainStageInput } from "@/lib/calc/amplifier/gain-stage";
import { gainStageCircuit, gainStageNetlist } from "@/lib/calc/spice/gain-stage";
import { crossingFrequency, parseWrdata, requireNgspice, runNgspice } from "@/lib/calc/spice/ngspice";
import { makeRunDir } from "./helpers";

let dir = "";
beforeAll(() => {
  requireNgspice();
  dir = makeRunDir("gain");
});
afterAll(() => {
  if (dir && !process.env.KEEP_SPICE) fs.rmSync(dir, { recursive: true, force: true });
});

function input(patch: Record<string, string | number | boolean>): GainStageInput {
  const p = parseRawInputs(gainStage, { ...gainStage.defaults, ...patch });
  if (!p.ok) throw new Error(JSON.stringify(p.errors));
  return p.input;
}

async function ac(inp: GainStageInput, model: "ideal" | "single-pole", name: string) {
  const control = [".control", "set wr_singlescale", "set wr_vecnames", "run", `wrdata ${name}.txt vm(out) vp(out)`, "quit", ".endc"];
  const r = await runNgspice(gainStageNetlist(inp, model, control), dir, name, [`${name}.txt`]);
  const [b] = parseWrdata(r.outputs[`${name}.txt`]);
  return { f: b.columns["frequency"], mag: b.columns["vm(out)"] };
}

describe("gain-stage netlist vs ngspice", () => {
  const cases: Array<[string, Record<string, string | number | boolean>]> = [
    ["non-inverting ×10, single supply", {}],
    ["inverting ×4.7 with 1 kΩ source, split supply", { configuration: "inverting", gain: "4.7", supply: "split", vPos: "15", vNeg: "-15", rSource: "1k" }],
    ["non-inverting ×100", { gain: "100", cLoad: "0" }],
  ];
  for (const [name, patch] of cases) {
    it(name, async () => {
      const inp = input(patch);
      const { rg, rf } = gainStageCircuit(inp);
      const ideal = inp.configuration === "non-inverting" ? 1 + rf / rg : rf / (inp.rSource + rg);
      const a = await ac(inp, "ideal", `gi-${name.replace(/\W+/g, "")}`);
      expect(Math.abs(a.mag[0] / ideal - 1)).toBeLessThan(1e-6);
      const s = await ac({ ...inp, cLoad: 0 }, "single-pole", `gs-${name.replace(/\W+/g, "")}`);
      const ng = inp.configuration === "non-inverting" ? 1 + rf / rg : 1 + rf / (inp.rSource + rg);
      const a0 = 10 ** (inp.opamp.aolDb / 20);
      const rx = 1 / (1 / inp.rLoad + 1 / (rf + rg + inp.rSource));
      const k = rx / (rx + inp.opamp.rout);
      const fb = (inp.opamp.gbw / a0) * (1 + (k * a0) / ng);
      const f3 = crossingFrequency(s.f, s.mag, s.mag[0] * Math.SQRT1_2, true);
      expect(Math.abs(f3 / fb - 1)).toBeLessThan(0.005);
    });
  }
});
