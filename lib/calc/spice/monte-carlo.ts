/**
 * ngspice Monte Carlo of a designed filter: a .control loop that alters every resistor and
 * capacitor to a random value within its tolerance (uniform: sunif, on [−1, 1); normal: sgauss
 * with σ = tolerance/3, as the engine's analysis), runs an AC sweep around the −3 dB frequency and
 * one AC point in the passband per run, and appends both to files (ngspice `set appendwrite`).
 * Used to check the engine's tolerance analysis against the simulator (tests/spice) and in the
 * benchmark. Pure text generation and parsing; running is done by ngspice.ts.
 */
import type { FilterDesign } from "../filter/design";
import { minus3dBFrequency } from "../filter/response";
import { filterNetlist } from "./filter";
import { spiceNumber } from "./netlist";
import { crossingFrequency, parseWrdata } from "./ngspice";

/** Options of an ngspice Monte Carlo run. */
export interface SpiceMonteCarloOptions {
  runs: number;
  /** ngspice `setseed` value. */
  seed: number;
  distribution: "uniform" | "normal";
  /** Sweep around the nominal −3 dB frequency: [f/span, f·span], default 1.5. */
  span?: number;
  /** Points per decade, default 200. */
  pointsPerDecade?: number;
  /** File name prefix, default "mc". */
  prefix?: string;
}

/** The netlist of an ngspice Monte Carlo and the two output files it writes. */
export function monteCarloNetlist(design: FilterDesign, opts: SpiceMonteCarloOptions): { netlist: string; files: [string, string] } {
  if (design.kind === "bandpass") throw new RangeError("the ngspice Monte Carlo covers low- and high-pass designs");
  const prefix = opts.prefix ?? "mc";
  const files: [string, string] = [`${prefix}-sweep.txt`, `${prefix}-ref.txt`];
  const f3 = minus3dBFrequency(design);
  const span = opts.span ?? 1.5;
  const ppd = opts.pointsPerDecade ?? 200;
  const fRef = design.kind === "lowpass" ? f3 * 1e-4 : f3 * 1e4;
  const draw = opts.distribution === "uniform" ? "sunif(0)" : "sgauss(0)/3";
  const control = [
    ".control",
    "set wr_singlescale",
    "set wr_vecnames",
    "set appendwrite",
    `setseed ${Math.floor(opts.seed)}`,
    "let run = 0",
    `while run < ${Math.floor(opts.runs)}`,
    ...design.components.flatMap((c) => [`let v = ${spiceNumber(c.value)}*(1+${spiceNumber(c.tolerance)}*${draw})`, `alter ${c.ref} = $&v`]),
    `ac dec ${ppd} ${spiceNumber(f3 / span)} ${spiceNumber(f3 * span)}`,
    `wrdata ${files[0]} vm(out)`,
    `ac lin 1 ${spiceNumber(fRef)} ${spiceNumber(fRef)}`,
    `wrdata ${files[1]} vm(out)`,
    "destroy all",
    "let run = run + 1",
    "end",
    "quit",
    ".endc",
  ];
  return { netlist: filterNetlist(design, { kind: "ideal" }, { fStart: f3 / span, fStop: f3 * span, pointsPerDecade: ppd, tail: control }), files };
}

/**
 * Per-run −3 dB frequency (Hz, interpolated in dB against log f; NaN when the sweep does not
 * contain it) and passband gain magnitude (V/V) from the two output files.
 */
export function parseMonteCarlo(design: FilterDesign, sweepText: string, refText: string): { f3: number[]; gain: number[] } {
  const sweeps = parseWrdata(sweepText);
  const refs = parseWrdata(refText);
  if (sweeps.length !== refs.length) throw new Error(`ngspice Monte Carlo wrote ${sweeps.length} sweeps but ${refs.length} reference points`);
  const gain = refs.map((b) => b.columns["vm(out)"][0]);
  const f3 = sweeps.map((b, i) => crossingFrequency(b.columns["frequency"], b.columns["vm(out)"], gain[i] * Math.SQRT1_2, design.kind === "lowpass"));
  return { f3, gain };
}
