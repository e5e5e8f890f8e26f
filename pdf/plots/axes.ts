/**
 * Axis arithmetic for the report's vector plots: "nice" linear ticks (1-2-5 steps), decade ticks
 * for log axes, and one SI prefix per axis so every tick label on an axis shares a scale
 * (e.g. "−3 dB frequency, kHz" with ticks 0.96 0.98 1.00 1.02).
 */

export interface LinearAxis {
  min: number;
  max: number;
  step: number;
  ticks: number[];
}

export interface LogAxis {
  /** Lower and upper bounds, on whole decades. */
  min: number;
  max: number;
  /** Decade lines 10^k (labelled). */
  majors: number[];
  /** 2·10^k … 9·10^k (unlabelled). */
  minors: number[];
}

/** Step from the 1-2-5 sequence close to span / target. */
export function niceStep(span: number, target: number): number {
  if (!(span > 0)) return 1;
  const raw = span / Math.max(1, target);
  const mag = 10 ** Math.floor(Math.log10(raw));
  const f = raw / mag;
  const nice = f <= 1 ? 1 : f <= 2 ? 2 : f <= 2.5 ? 2.5 : f <= 5 ? 5 : 10;
  return nice * mag;
}

/** Linear axis covering [lo, hi] with about `target` intervals on a 1-2-5 step. */
export function linearAxis(lo: number, hi: number, target = 5): LinearAxis {
  let a = Math.min(lo, hi);
  let b = Math.max(lo, hi);
  if (!Number.isFinite(a) || !Number.isFinite(b)) {
    a = 0;
    b = 1;
  }
  if (a === b) {
    const pad = a === 0 ? 1 : Math.abs(a) * 0.1;
    a -= pad;
    b += pad;
  }
  const step = niceStep(b - a, target);
  // Values within 0.1 % of a step of a tick count as on it (e.g. +0.0001 dB of peaking).
  const min = Math.floor(a / step + 1e-3) * step || 0;
  const max = Math.ceil(b / step - 1e-3) * step || 0;
  const ticks: number[] = [];
  const n = Math.round((max - min) / step);
  for (let i = 0; i <= n; i++) {
    const v = min + i * step;
    ticks.push(Math.abs(v) < step * 1e-9 ? 0 : Number(v.toPrecision(12)));
  }
  return { min, max, step, ticks };
}

/** Log axis on whole decades covering [lo, hi] (both > 0). */
export function logAxis(lo: number, hi: number): LogAxis {
  const a = Math.max(Math.min(lo, hi), 1e-30);
  const b = Math.max(lo, hi, a * 10);
  const d0 = Math.floor(Math.log10(a) + 1e-9);
  let d1 = Math.ceil(Math.log10(b) - 1e-9);
  if (d1 <= d0) d1 = d0 + 1;
  const majors: number[] = [];
  const minors: number[] = [];
  for (let d = d0; d <= d1; d++) {
    majors.push(10 ** d);
    if (d < d1) for (let m = 2; m <= 9; m++) minors.push(m * 10 ** d);
  }
  return { min: 10 ** d0, max: 10 ** d1, majors, minors };
}

const PREFIXES: Array<[number, string]> = [
  [-12, "p"],
  [-9, "n"],
  [-6, "µ"],
  [-3, "m"],
  [0, ""],
  [3, "k"],
  [6, "M"],
  [9, "G"],
];

/** Units that take SI prefixes on an axis (others, such as dB, °, %, V/V, are printed as is). */
export function takesPrefix(unit: string): boolean {
  return /^(V|A|Ω|F|H|Hz|s|W|V\/s|V\/√Hz|A\/√Hz|V\/°C|A\/°C)$/.test(unit);
}

/** Scale of an axis: the factor to divide values by and the prefixed unit to print. */
export interface AxisScale {
  factor: number;
  unit: string;
}

/** One SI prefix for all values on an axis, chosen from the largest magnitude. */
export function axisScale(maxAbs: number, unit: string): AxisScale {
  if (!takesPrefix(unit) || !(maxAbs > 0)) return { factor: 1, unit };
  const e = Math.floor(Math.log10(maxAbs) / 3 + 1e-9) * 3;
  const [exp, prefix] = PREFIXES.reduce((best, p) => (Math.abs(p[0] - e) < Math.abs(best[0] - e) ? p : best), PREFIXES[4]);
  return { factor: 10 ** exp, unit: `${prefix}${unit}` };
}

/** Decimals needed to print ticks `step` apart (after scaling). */
export function decimalsFor(step: number): number {
  if (!(step > 0)) return 0;
  return Math.max(0, Math.min(6, -Math.floor(Math.log10(step) + 1e-9)));
}

/** Prints a number with a true minus sign (U+2212) and fixed decimals. */
export function fixed(value: number, decimals: number): string {
  const t = value.toFixed(decimals);
  if (!t.startsWith("-")) return t;
  return /^-[0.]*$/.test(t) ? t.slice(1) : `−${t.slice(1)}`;
}

/** Label of a decade tick with an SI prefix letter: 1, 10, 100, 1k, 10k, 1M, 100m. */
export function decadeLabel(value: number, unit: string): string {
  if (!takesPrefix(unit)) {
    const e = Math.round(Math.log10(value));
    return e >= -3 && e <= 5 ? fixed(value, Math.max(0, -e)) : `10^${e}`;
  }
  const e = Math.round(Math.log10(value));
  const e3 = Math.floor(e / 3) * 3;
  const prefix = PREFIXES.find((p) => p[0] === e3)?.[1];
  if (prefix === undefined) return `1e${e}`;
  return `${10 ** (e - e3)}${prefix}`;
}
