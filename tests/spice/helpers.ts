/**
 * Shared helpers of the ngspice cross-check suites: a temp directory per run, AC runs of
 * designed filters, and the design spread the suites use.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { FilterDesign } from "@/lib/calc/filter/design";
import { filterNetlist } from "@/lib/calc/spice/filter";
import type { SpiceOpAmpModel } from "@/lib/calc/spice/netlist";
import { parseWrdata, runNgspice } from "@/lib/calc/spice/ngspice";

/** Concurrent ngspice processes (2 cores on the CI machine). */
export const NGSPICE_CONCURRENCY = Math.max(1, Math.min(2, os.cpus().length));

/** A fresh temp directory for one test run. */
export function makeRunDir(tag: string): string {
  return fs.mkdtempSync(path.join(os.tmpdir(), `lw-spice-${tag}-`));
}

/** AC data of one run: frequency (Hz), magnitude (V/V) and phase (rad) of v(out). */
export interface AcData {
  f: number[];
  mag: number[];
  phase: number[];
}

/**
 * Run an AC sweep (decade, `ppd` points per decade) of a design in ngspice plus single-point
 * analyses at `points` (Hz); returns the sweep and the magnitude/phase at each point.
 */
export async function ngspiceAc(
  design: FilterDesign,
  model: SpiceOpAmpModel,
  dir: string,
  name: string,
  sweep: { fStart: number; fStop: number; ppd: number },
  points: number[] = [],
): Promise<{ sweep: AcData; points: Array<{ mag: number; phase: number }> }> {
  const files = ["sweep.txt", ...points.map((_, i) => `pt${i}.txt`)].map((f) => `${name}-${f}`);
  const control = [
    ".control",
    "set wr_singlescale",
    "set wr_vecnames",
    `ac dec ${sweep.ppd} ${sweep.fStart} ${sweep.fStop}`,
    `wrdata ${files[0]} vm(out) vp(out)`,
    ...points.flatMap((f, i) => [`ac lin 1 ${f} ${f}`, `wrdata ${files[i + 1]} vm(out) vp(out)`]),
    "quit",
    ".endc",
  ];
  const net = filterNetlist(design, model, { fStart: sweep.fStart, fStop: sweep.fStop, pointsPerDecade: sweep.ppd, tail: control });
  const r = await runNgspice(net, dir, name, files);
  const toData = (text: string): AcData => {
    const [b] = parseWrdata(text);
    return { f: b.columns["frequency"], mag: b.columns["vm(out)"], phase: b.columns["vp(out)"] };
  };
  return {
    sweep: toData(r.outputs[files[0]]),
    points: points.map((_, i) => {
      const d = toData(r.outputs[files[i + 1]]);
      return { mag: d.mag[0], phase: d.phase[0] };
    }),
  };
}
