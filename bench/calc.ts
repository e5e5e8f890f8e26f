// npm run bench – median time of one compute for each calculation type of the amplifier and
// reference packs, warm (after a warm-up), from parsed inputs; target: under 1 ms each.
import { amplifierTypes } from "../lib/calc/amplifier";
import { referenceTypes } from "../lib/calc/reference";
import { parseRawInputs } from "../lib/calc/core/inputs";
import os from "node:os";
import type { CalcType, RawInputs } from "../lib/calc/core/types";

const TARGET_MS = 1;
const WARMUP = 300;
const RUNS = 2000;

/** Variants per type: the defaults plus a few configurations that take other code paths. */
const VARIANTS: Record<string, RawInputs[]> = {
  "amplifier.gain-stage": [
    {},
    { configuration: "inverting", supply: "split", vPos: "15", vNeg: "-15", gain: "47", series: "E192", biasCompensation: true },
    // Low phase margin: the sentence searches the largest CL for 60° (bisection).
    { cLoad: "10n" },
  ],
  "amplifier.difference": [{}, { gain: "0.1", r1Target: "100k", vcmMin: "-100", vcmMax: "100", vdPeak: "10", cmrrMinDb: "80" }],
  "amplifier.power-stage": [{}, { stageClass: "class-a-series", iq: "1", vcc: "24", vPeak: "5" }],
  "reference.shunt": [{}],
  "reference.adjustable": [{}],
  "reference.adc-budget": [{}],
};

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

let misses = 0;
console.log(`Calc engine: median compute time, ${RUNS} warm runs each (target < ${TARGET_MS} ms); load average ${os.loadavg()[0].toFixed(1)} on ${os.cpus().length} cores`);
for (const type of [...amplifierTypes, ...referenceTypes] as CalcType[]) {
  for (const [i, patch] of (VARIANTS[type.id] ?? [{}]).entries()) {
    const parsed = parseRawInputs(type, { ...type.defaults, ...patch });
    if (!parsed.ok) throw new Error(`${type.id}: ${JSON.stringify(parsed.errors)}`);
    const input = parsed.input;
    for (let k = 0; k < WARMUP; k++) type.compute(input);
    const times: number[] = [];
    const cpu0 = process.cpuUsage();
    for (let k = 0; k < RUNS; k++) {
      const t0 = performance.now();
      type.compute(input);
      times.push(performance.now() - t0);
    }
    const cpu = process.cpuUsage(cpu0);
    const cpuMs = (cpu.user + cpu.system) / 1000 / RUNS;
    const med = median(times);
    const p95 = [...times].sort((a, b) => a - b)[Math.floor(times.length * 0.95)];
    const ok = med < TARGET_MS;
    if (!ok) misses++;
    const name = `${type.id}${i ? ` (variant ${i})` : ""}`;
    console.log(`  ${name.padEnd(40)} median ${med.toFixed(3)} ms   p95 ${p95.toFixed(3)} ms   CPU ${cpuMs.toFixed(3)} ms/run   ${ok ? "meets target" : "MISSES target"}`);
  }
}
console.log(misses ? `${misses} case(s) miss the ${TARGET_MS} ms target.` : `All cases meet the ${TARGET_MS} ms target.`);
process.exit(misses ? 1 : 0);
