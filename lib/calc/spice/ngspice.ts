/**
 * Node-only helpers to run Debian's ngspice in batch mode and read its results. Used by the
 * simulator cross-check tests (tests/spice) and the benchmark (bench/filter.ts); never imported
 * by a calculation type (the engine stays free of process and file-system access).
 *
 * Batch-mode practice (see /work/shared/STACK.md): `quit` at the end of the .control block,
 * `set wr_singlescale` and `set wr_vecnames` before `wrdata`, check that every output file exists
 * and search the log for errors.
 */
import { spawn, spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";

/** The ngspice executable used (override with the NGSPICE environment variable). */
export function ngspicePath(): string {
  return process.env.NGSPICE ?? "ngspice";
}

/** Whether ngspice can be started; returns its version line or throws a clear error. */
export function requireNgspice(): string {
  const r = spawnSync(ngspicePath(), ["--version"], { encoding: "utf8" });
  if (r.error || r.status !== 0) {
    throw new Error(
      `ngspice is not installed or cannot run (${r.error?.message ?? `exit ${r.status}`}). ` +
        "Install Debian's package: apt-get update && apt-get install -y ngspice (scripts/test.sh does this when run as root).",
    );
  }
  const line = (r.stdout || "").split("\n").find((l) => /ngspice-\d+/.test(l));
  return line?.replace(/^\*+\s*/, "").trim() ?? "ngspice";
}

/** Result of one batch run. */
export interface NgspiceResult {
  /** Combined stdout/stderr log. */
  log: string;
  /** Contents of each requested output file, by name. */
  outputs: Record<string, string>;
  /** Wall time of the simulator process, ms. */
  elapsedMs: number;
}

/** Lines of an ngspice log that report an error (ignoring harmless notes). */
export function logErrors(log: string): string[] {
  return log
    .split("\n")
    .filter((l) => /\berror\b/i.test(l) || /^\s*fatal/i.test(l) || /unknown (sub)?circuit|no such vector|not found/i.test(l))
    .filter((l) => !/errors?:\s*0\b/i.test(l));
}

/**
 * Run ngspice -b on a netlist in `dir`, wait for it and collect output files.
 * @param netlist full netlist text (with a .control block that writes the outputs and quits)
 * @param dir working directory (one temp directory per test run)
 * @param name base file name of the netlist
 * @param outputs files the run must write (relative to dir)
 * @param timeoutMs kill the process after this long (default 120 s)
 * @throws with the log when ngspice fails, reports an error or misses an output
 */
export function runNgspice(netlist: string, dir: string, name: string, outputs: string[], timeoutMs = 120_000): Promise<NgspiceResult> {
  const cir = path.join(dir, `${name}.cir`);
  fs.writeFileSync(cir, netlist);
  for (const o of outputs) fs.rmSync(path.join(dir, o), { force: true });
  const t0 = performance.now();
  return new Promise((resolve, reject) => {
    const child = spawn(ngspicePath(), ["-b", cir], { cwd: dir, stdio: ["ignore", "pipe", "pipe"] });
    let log = "";
    child.stdout.on("data", (d: Buffer) => (log += d.toString()));
    child.stderr.on("data", (d: Buffer) => (log += d.toString()));
    const timer = setTimeout(() => child.kill("SIGKILL"), timeoutMs);
    child.on("error", (e) => {
      clearTimeout(timer);
      reject(new Error(`ngspice could not start: ${e.message}`));
    });
    child.on("close", (code) => {
      clearTimeout(timer);
      const elapsedMs = performance.now() - t0;
      fs.writeFileSync(path.join(dir, `${name}.log`), log);
      const errs = logErrors(log);
      const missing = outputs.filter((o) => !fs.existsSync(path.join(dir, o)));
      if (code !== 0 || errs.length > 0 || missing.length > 0) {
        reject(new Error(`ngspice run "${name}" failed (exit ${code}; errors: ${errs.join(" | ") || "none"}; missing: ${missing.join(", ") || "none"})\n${log.slice(-2000)}`));
        return;
      }
      const out: Record<string, string> = {};
      for (const o of outputs) out[o] = fs.readFileSync(path.join(dir, o), "utf8");
      resolve({ log, outputs: out, elapsedMs });
    });
  });
}

/** A table written by wrdata with wr_singlescale and wr_vecnames. */
export interface WrdataTable {
  names: string[];
  /** columns[name] = values. */
  columns: Record<string, number[]>;
}

/**
 * Parse wrdata output (first line the vector names, then numbers). With `set appendwrite` a file
 * holds several blocks, each starting with its own header: they are returned in order.
 */
export function parseWrdata(text: string): WrdataTable[] {
  const blocks: WrdataTable[] = [];
  let cur: WrdataTable | null = null;
  for (const raw of text.split("\n")) {
    const line = raw.trim();
    if (!line) continue;
    const parts = line.split(/\s+/);
    if (!/^[-+0-9.]/.test(parts[0])) {
      cur = { names: parts, columns: Object.fromEntries(parts.map((p) => [p, [] as number[]])) };
      blocks.push(cur);
      continue;
    }
    if (!cur) throw new Error("wrdata output without a header line (set wr_vecnames)");
    parts.forEach((p, i) => cur!.columns[cur!.names[i]]?.push(Number(p)));
  }
  return blocks;
}

/**
 * The frequency (Hz) where a sampled magnitude crosses `level` (same unit as mag), interpolated
 * linearly in dB against log frequency; for a falling edge the highest crossing, for a rising
 * edge the lowest. NaN when there is none.
 */
export function crossingFrequency(f: readonly number[], mag: readonly number[], level: number, falling: boolean): number {
  const db = (x: number) => 20 * Math.log10(x);
  const L = db(level);
  const n = f.length;
  const at = (i: number) => {
    const y0 = db(mag[i]) - L, y1 = db(mag[i + 1]) - L;
    const t = y0 / (y0 - y1);
    return Math.exp(Math.log(f[i]) + t * (Math.log(f[i + 1]) - Math.log(f[i])));
  };
  if (falling) {
    for (let i = n - 2; i >= 0; i--) if (mag[i] >= level && mag[i + 1] < level) return at(i);
  } else {
    for (let i = 0; i < n - 1; i++) if (mag[i] < level && mag[i + 1] >= level) return at(i);
  }
  return NaN;
}

/**
 * Run async jobs with at most `limit` in flight (ngspice processes on a 2-core machine: 2).
 */
export async function mapLimit<T, R>(items: readonly T[], limit: number, fn: (item: T, index: number) => Promise<R>): Promise<R[]> {
  const results = new Array<R>(items.length);
  let next = 0;
  const worker = async () => {
    while (next < items.length) {
      const i = next++;
      results[i] = await fn(items[i], i);
    }
  };
  await Promise.all(Array.from({ length: Math.max(1, Math.min(limit, items.length)) }, worker));
  return results;
}
