/**
 * Helpers of the amplifier and reference packs' reference tests: run a type from its defaults
 * with a patch, read results by key, and run a tiny ngspice batch job.
 */
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { CalcOutput, CalcType, RawInputs } from "@/lib/calc/core/types";
import { parseRawInputs } from "@/lib/calc/core/inputs";

/** Parse a type's defaults with a patch applied; throws with the field errors if they do not parse. */
export function parsedInput<T>(type: CalcType, patch: RawInputs): T {
  const r = parseRawInputs(type, { ...type.defaults, ...patch });
  if (!r.ok) throw new Error(`${type.id}: ${JSON.stringify(r.errors)}`);
  return r.input as T;
}

/** Compute a type from its defaults with a patch; returns the output and a result getter. */
export function run(type: CalcType, patch: RawInputs): { out: CalcOutput; v: (key: string) => number; check: (id: string) => CalcOutput["checks"][number] } {
  const out = type.compute(parsedInput(type, patch));
  return {
    out,
    v: (key) => {
      const r = out.results.find((x) => x.key === key);
      if (!r) throw new Error(`no result "${key}" in ${type.id}`);
      return r.value;
    },
    check: (id) => {
      const c = out.checks.find((x) => x.id === id);
      if (!c) throw new Error(`no check "${id}" in ${type.id}: ${out.checks.map((x) => x.id).join(", ")}`);
      return c;
    },
  };
}

/** Relative difference |a/b − 1|. */
export function rel(a: number, b: number): number {
  return Math.abs(a / b - 1);
}

/**
 * Run ngspice in batch mode on a netlist whose .control block writes `out` with wrdata; returns
 * the columns of the data file. Throws if ngspice is missing or reports an error.
 */
export function ngspiceColumns(netlist: string, out: string): Record<string, number[]> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "lw-calc-ref-"));
  try {
    fs.writeFileSync(path.join(dir, "c.cir"), netlist);
    const r = spawnSync(process.env.NGSPICE ?? "ngspice", ["-b", "c.cir"], { cwd: dir, encoding: "utf8" });
    if (r.error) throw new Error(`ngspice did not start (${r.error.message}); install Debian's ngspice`);
    const file = path.join(dir, out);
    if (r.status !== 0 || !fs.existsSync(file) || /\berror\b/i.test(r.stdout + r.stderr)) {
      throw new Error(`ngspice failed:\n${r.stdout}\n${r.stderr}`);
    }
    const lines = fs.readFileSync(file, "utf8").trim().split("\n");
    const names = lines[0].trim().split(/\s+/);
    const cols: Record<string, number[]> = Object.fromEntries(names.map((n) => [n, [] as number[]]));
    for (const line of lines.slice(1)) line.trim().split(/\s+/).forEach((x, i) => cols[names[i]].push(Number(x)));
    return cols;
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

/** Simpson integration of f over [a, b] in ln(x) (for integrands spanning decades). */
export function integrateLog(f: (x: number) => number, a: number, b: number, n = 20000): number {
  const la = Math.log(a);
  const lb = Math.log(b);
  const h = (lb - la) / n;
  let s = 0;
  for (let i = 0; i <= n; i++) {
    const x = Math.exp(la + i * h);
    const w = i === 0 || i === n ? 1 : i % 2 ? 4 : 2;
    s += w * f(x) * x;
  }
  return (s * h) / 3;
}
