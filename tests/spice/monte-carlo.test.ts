/**
 * The engine's Monte Carlo against an ngspice Monte Carlo of the same circuit with the same
 * distribution (an independent simulator and an independent random generator): ngspice alters
 * every R and C in a .control loop (sunif for uniform, sgauss/3 for normal, tolerance = 3σ) and
 * runs an AC analysis per run; the −3 dB frequency and the DC gain are read per run.
 *
 * Statistical tolerances (both are random samples, so the test compares them as such):
 * - means: |μ_engine − μ_ngspice| ≤ 4·√(σ²/N_e + σ²/N_s) (four standard errors: a false alarm
 *   about once in 16,000 runs);
 * - standard deviations: |σ_s/σ_e − 1| ≤ 4·√(1/(2N_s) + 1/(2N_e)) (normal-theory standard error
 *   of a sample σ; conservative here because these sums of bounded variables have light tails).
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import fs from "node:fs";
import { designFilter } from "@/lib/calc/filter/design";
import { seriesPicker } from "@/lib/calc/filter/compute";
import { monteCarlo } from "@/lib/calc/filter/tolerance";
import { monteCarloNetlist, parseMonteCarlo } from "@/lib/calc/spice/monte-carlo";
import { mapLimit, requireNgspice, runNgspice } from "@/lib/calc/spice/ngspice";
import { makeRunDir, NGSPICE_CONCURRENCY } from "./helpers";

let dir = "";
beforeAll(() => {
  requireNgspice();
  dir = makeRunDir("mc");
});
afterAll(() => {
  if (dir && !process.env.KEEP_SPICE) fs.rmSync(dir, { recursive: true, force: true });
});

const design = designFilter({
  kind: "lowpass", family: "butterworth", order: 4, cutoff: 1000, topology: "mfb", firstOrder: "inverting",
  gain: 2, gainSharing: "equal", resistorLevel: 10e3, picker: seriesPicker("E12", "E96"), resistorTolerance: 0.01, capacitorTolerance: 0.05,
});

function stats(x: number[]) {
  const m = x.reduce((a, b) => a + b, 0) / x.length;
  const s = Math.sqrt(x.reduce((a, b) => a + (b - m) ** 2, 0) / (x.length - 1));
  return { mean: m, std: s, n: x.length };
}

describe("Monte Carlo vs ngspice (4th-order Butterworth MFB low-pass, gain 2, R 1 %, C 5 %)", () => {
  it("mean and standard deviation of the −3 dB frequency and the gain agree (uniform and normal)", async () => {
    const runs = 2000;
    const dists = ["uniform", "normal"] as const;
    const spice = await mapLimit(dists, NGSPICE_CONCURRENCY, async (distribution, i) => {
      const plan = monteCarloNetlist(design, { runs, seed: 11 + i, distribution, prefix: `mc-${distribution}` });
      const r = await runNgspice(plan.netlist, dir, `mc-${distribution}`, plan.files, 300_000);
      return parseMonteCarlo(design, r.outputs[plan.files[0]], r.outputs[plan.files[1]]);
    });
    dists.forEach((distribution, i) => {
      const s = spice[i];
      expect(s.f3.length).toBe(runs);
      expect(s.f3.every(Number.isFinite), "every ngspice run has a −3 dB point in its sweep").toBe(true);
      const eng = monteCarlo(design, { trials: 50_000, seed: 5, distribution });
      for (const [name, e, sp] of [
        ["f3", eng.frequency, stats(s.f3)],
        ["gain", eng.gain, stats(s.gain)],
      ] as const) {
        const ne = eng.trials - eng.rejected;
        const seMean = Math.sqrt(e.std ** 2 / ne + sp.std ** 2 / sp.n);
        expect(Math.abs(e.mean - sp.mean), `${distribution} ${name} mean: engine ${e.mean}, ngspice ${sp.mean}`).toBeLessThan(4 * seMean);
        const seStd = Math.sqrt(1 / (2 * sp.n) + 1 / (2 * ne));
        expect(Math.abs(sp.std / e.std - 1), `${distribution} ${name} σ: engine ${e.std}, ngspice ${sp.std}`).toBeLessThan(4 * seStd);
      }
    });
  }, 300_000);
});
