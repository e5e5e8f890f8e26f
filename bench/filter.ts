// bench/filter.ts – speed of the active filter engine (run by `npm run bench`; not a test).
// Prints, in one run:
//  1. design + 1,000-point response (ideal and finite-GBW, magnitude, phase, group delay) for
//     orders 2, 4 and 8 (median of many runs);
//  2. a Monte Carlo of 10,000 trials of an 8th-order design (median of several runs);
//  3. the same circuit's Monte Carlo in ngspice (1,000 runs in a .control loop), the per-trial
//     time ratio and the agreement of the mean −3 dB frequency.
// Targets: 10,000 trials in under 100 ms; per trial ≥ 1,000× faster than ngspice; mean −3 dB
// frequency within 0.5 % of ngspice's.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { designFilter, type FilterSpec } from "../lib/calc/filter/design";
import { seriesPicker } from "../lib/calc/filter/compute";
import { logSweep, sweepResponse } from "../lib/calc/filter/response";
import { monteCarlo } from "../lib/calc/filter/tolerance";
import { monteCarloNetlist, parseMonteCarlo } from "../lib/calc/spice/monte-carlo";
import { requireNgspice, runNgspice } from "../lib/calc/spice/ngspice";

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};
const ms = (x: number) => `${x.toFixed(2)} ms`;
const verdict = (ok: boolean) => (ok ? "MET" : "NOT MET");

const picker = seriesPicker("E12", "E96");
const spec = (order: number): FilterSpec => ({
  kind: "lowpass", family: "butterworth", order, cutoff: 1000, topology: "sk-unity", firstOrder: "rc-buffer",
  gain: 1, gainSharing: "equal", resistorLevel: 10e3, picker, resistorTolerance: 0.01, capacitorTolerance: 0.02,
});
const part = { kind: "single-pole" as const, a0: 10 ** (110 / 20), gbw: 10e6 };

console.log(`Node ${process.version}, ${os.cpus().length} cores (${os.cpus()[0]?.model ?? "?"}), load average ${os.loadavg().map((l) => l.toFixed(2)).join(" ")}`);

// 1. design + 1,000-point response
console.log("\n1. Design + 1,000-point response (ideal and single-pole op-amp; |H|, phase, group delay)");
const f = logSweep(10, 100e3, 1000);
for (const order of [2, 4, 8]) {
  const times: number[] = [];
  for (let i = 0; i < 60; i++) {
    const t0 = performance.now();
    const d = designFilter(spec(order));
    sweepResponse(d, f, { kind: "ideal" });
    sweepResponse(d, f, part);
    times.push(performance.now() - t0);
  }
  console.log(`   order ${order}: median ${ms(median(times.slice(10)))} over ${times.length - 10} runs (after 10 warm-up runs)`);
}

// 2. Monte Carlo, 10,000 trials, 8th order
console.log("\n2. Monte Carlo: 10,000 trials of an 8th-order Butterworth unity-gain Sallen-Key low-pass (R 1 %, C 2 %, uniform)");
const d8 = designFilter(spec(8));
const mcTimes: number[] = [];
let mc = monteCarlo(d8, { trials: 10_000, seed: 1, distribution: "uniform" });
for (let i = 0; i < 25; i++) {
  const t0 = performance.now();
  mc = monteCarlo(d8, { trials: 10_000, seed: 1 + i, distribution: "uniform" });
  mcTimes.push(performance.now() - t0);
}
const mcMedian = median(mcTimes.slice(5));
console.log(`   median ${ms(mcMedian)} (min ${ms(Math.min(...mcTimes))}) over ${mcTimes.length - 5} runs; ${((mcMedian / 10_000) * 1000).toFixed(3)} µs per trial`);
console.log(`   mean −3 dB frequency ${mc.frequency.mean.toFixed(3)} Hz, σ ${mc.frequency.std.toFixed(3)} Hz`);
console.log(`   target < 100 ms: ${verdict(mcMedian < 100)}`);

// 3. ngspice Monte Carlo of the same circuit
console.log("\n3. The same circuit's Monte Carlo in ngspice: 1,000 runs in one .control loop (alter + AC sweep + one AC point per run)");
try {
  console.log(`   ${requireNgspice()}`);
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "lw-bench-"));
  const runs = 1000;
  const plan = monteCarloNetlist(d8, { runs, seed: 1, distribution: "uniform" });
  runNgspice(plan.netlist, dir, "bench-mc", plan.files, 600_000)
    .then((r) => {
      const s = parseMonteCarlo(d8, r.outputs[plan.files[0]], r.outputs[plan.files[1]]);
      const ok = s.f3.filter(Number.isFinite);
      const spiceMean = ok.reduce((a, b) => a + b, 0) / ok.length;
      const perSpice = r.elapsedMs / runs;
      const perEngine = mcMedian / 10_000;
      const ratio = perSpice / perEngine;
      const dev = Math.abs(mc.frequency.mean / spiceMean - 1);
      console.log(`   ngspice: ${ms(r.elapsedMs)} for ${runs} runs (process start included), ${ms(perSpice)} per run; ${ok.length} runs with a −3 dB point`);
      console.log(`   per-trial ratio ngspice/engine: ${ratio.toFixed(0)}×  target ≥ 1,000×: ${verdict(ratio >= 1000)}`);
      console.log(`   mean −3 dB frequency: engine ${mc.frequency.mean.toFixed(3)} Hz, ngspice ${spiceMean.toFixed(3)} Hz, difference ${(dev * 100).toFixed(3)} %  target ≤ 0.5 %: ${verdict(dev <= 0.005)}`);
      fs.rmSync(dir, { recursive: true, force: true });
    })
    .catch((e: unknown) => {
      console.log(`   ngspice run failed: ${e instanceof Error ? e.message.split("\n")[0] : String(e)}`);
      process.exitCode = 1;
    });
} catch (e) {
  console.log(`   ${e instanceof Error ? e.message : String(e)}`);
  process.exitCode = 1;
}
