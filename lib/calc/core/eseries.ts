/**
 * Preferred number series for resistors and capacitors, IEC 60063:2015 (E6 … E192).
 *
 * The tables are hard-coded from the standard (Tables 1 and 2), never computed: several E24
 * values (2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2) and one E192 value (920) differ from the
 * rounded geometric progression 10^(i/n).
 *
 * All values are in SI base units (Ω for resistors, F for capacitors); the functions work on any
 * positive value, so they serve both.
 */

/** A preferred number series of IEC 60063. */
export type ESeries = "E6" | "E12" | "E24" | "E48" | "E96" | "E192";

/** The series in order of density. */
export const E_SERIES_NAMES: readonly ESeries[] = ["E6", "E12", "E24", "E48", "E96", "E192"];

/** Mantissas of each series in [1, 10), IEC 60063:2015 Table 1 (E6–E24) and Table 2 (E48–E192). */
export const E_SERIES: Readonly<Record<ESeries, readonly number[]>> = {
  E6: [1.0, 1.5, 2.2, 3.3, 4.7, 6.8],
  E12: [1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2],
  E24: [
    1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1,
  ],
  E48: [
    1.0, 1.05, 1.1, 1.15, 1.21, 1.27, 1.33, 1.4, 1.47, 1.54, 1.62, 1.69, 1.78, 1.87, 1.96, 2.05, 2.15, 2.26, 2.37, 2.49,
    2.61, 2.74, 2.87, 3.01, 3.16, 3.32, 3.48, 3.65, 3.83, 4.02, 4.22, 4.42, 4.64, 4.87, 5.11, 5.36, 5.62, 5.9, 6.19, 6.49,
    6.81, 7.15, 7.5, 7.87, 8.25, 8.66, 9.09, 9.53,
  ],
  E96: [
    1.0, 1.02, 1.05, 1.07, 1.1, 1.13, 1.15, 1.18, 1.21, 1.24, 1.27, 1.3, 1.33, 1.37, 1.4, 1.43, 1.47, 1.5, 1.54, 1.58,
    1.62, 1.65, 1.69, 1.74, 1.78, 1.82, 1.87, 1.91, 1.96, 2.0, 2.05, 2.1, 2.15, 2.21, 2.26, 2.32, 2.37, 2.43, 2.49, 2.55,
    2.61, 2.67, 2.74, 2.8, 2.87, 2.94, 3.01, 3.09, 3.16, 3.24, 3.32, 3.4, 3.48, 3.57, 3.65, 3.74, 3.83, 3.92, 4.02, 4.12,
    4.22, 4.32, 4.42, 4.53, 4.64, 4.75, 4.87, 4.99, 5.11, 5.23, 5.36, 5.49, 5.62, 5.76, 5.9, 6.04, 6.19, 6.34, 6.49, 6.65,
    6.81, 6.98, 7.15, 7.32, 7.5, 7.68, 7.87, 8.06, 8.25, 8.45, 8.66, 8.87, 9.09, 9.31, 9.53, 9.76,
  ],
  E192: [
    1.0, 1.01, 1.02, 1.04, 1.05, 1.06, 1.07, 1.09, 1.1, 1.11, 1.13, 1.14, 1.15, 1.17, 1.18, 1.2, 1.21, 1.23, 1.24, 1.26,
    1.27, 1.29, 1.3, 1.32, 1.33, 1.35, 1.37, 1.38, 1.4, 1.42, 1.43, 1.45, 1.47, 1.49, 1.5, 1.52, 1.54, 1.56, 1.58, 1.6,
    1.62, 1.64, 1.65, 1.67, 1.69, 1.72, 1.74, 1.76, 1.78, 1.8, 1.82, 1.84, 1.87, 1.89, 1.91, 1.93, 1.96, 1.98, 2.0, 2.03,
    2.05, 2.08, 2.1, 2.13, 2.15, 2.18, 2.21, 2.23, 2.26, 2.29, 2.32, 2.34, 2.37, 2.4, 2.43, 2.46, 2.49, 2.52, 2.55, 2.58,
    2.61, 2.64, 2.67, 2.71, 2.74, 2.77, 2.8, 2.84, 2.87, 2.91, 2.94, 2.98, 3.01, 3.05, 3.09, 3.12, 3.16, 3.2, 3.24, 3.28,
    3.32, 3.36, 3.4, 3.44, 3.48, 3.52, 3.57, 3.61, 3.65, 3.7, 3.74, 3.79, 3.83, 3.88, 3.92, 3.97, 4.02, 4.07, 4.12, 4.17,
    4.22, 4.27, 4.32, 4.37, 4.42, 4.48, 4.53, 4.59, 4.64, 4.7, 4.75, 4.81, 4.87, 4.93, 4.99, 5.05, 5.11, 5.17, 5.23, 5.3,
    5.36, 5.42, 5.49, 5.56, 5.62, 5.69, 5.76, 5.83, 5.9, 5.97, 6.04, 6.12, 6.19, 6.26, 6.34, 6.42, 6.49, 6.57, 6.65, 6.73,
    6.81, 6.9, 6.98, 7.06, 7.15, 7.23, 7.32, 7.41, 7.5, 7.59, 7.68, 7.77, 7.87, 7.96, 8.06, 8.16, 8.25, 8.35, 8.45, 8.56,
    8.66, 8.76, 8.87, 8.98, 9.09, 9.2, 9.31, 9.42, 9.53, 9.65, 9.76, 9.88,
  ],
};

/** The usual tolerance of each series as a fraction (IEC 60063: E6 20 %, … E192 0.5 %). */
export const E_SERIES_TOLERANCE: Readonly<Record<ESeries, number>> = {
  E6: 0.2,
  E12: 0.1,
  E24: 0.05,
  E48: 0.02,
  E96: 0.01,
  E192: 0.005,
};

/** Mantissas extended by the next decade's first member (10), for neighbour searches. */
function mantissas(series: ESeries): readonly number[] {
  const m = E_SERIES[series];
  if (!m) throw new Error(`Unknown E-series "${String(series)}"`);
  return m;
}

/** Value of mantissa index i (may run past the end into following decades) at decade d. */
function valueAt(series: ESeries, decade: number, index: number): number {
  const m = mantissas(series);
  const n = m.length;
  const d = decade + Math.floor(index / n);
  const i = ((index % n) + n) % n;
  // Mantissas have at most two decimals: k = 100·m is an integer, and k·10^(d−2) computed as an
  // exact integer times (or divided by) an exact power of ten is the double nearest the decimal
  // value (2.2 kΩ → 2200 exactly, 4.7 nF → 4.7e-9 as typed).
  const k = Math.round(m[i] * 100);
  const e = d - 2;
  return e >= 0 ? k * 10 ** e : k / 10 ** -e;
}

/** The two members bracketing `value`: lo ≤ value ≤ hi (equal when value is a member). */
function bracket(value: number, series: ESeries): { lo: number; hi: number } {
  const m = mantissas(series);
  let decade = Math.floor(Math.log10(value));
  let mant = value / 10 ** decade;
  // Guard log10 rounding at decade edges.
  if (mant >= 10 * (1 - 1e-12)) {
    decade += 1;
    mant = value / 10 ** decade;
  } else if (mant < 1 * (1 - 1e-12)) {
    decade -= 1;
    mant = value / 10 ** decade;
  }
  const tol = 1e-9;
  // Binary search: first index whose mantissa is ≥ mant (within tolerance).
  let lo = 0;
  let hi = m.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (m[mid] < mant * (1 - tol)) lo = mid + 1;
    else hi = mid;
  }
  const i = lo;
  if (i < m.length && Math.abs(mant - m[i]) <= tol * m[i]) {
    const v = valueAt(series, decade, i);
    return { lo: v, hi: v };
  }
  if (i === m.length && Math.abs(mant - 10) <= tol * 10) {
    const v = valueAt(series, decade, i);
    return { lo: v, hi: v };
  }
  return { lo: valueAt(series, decade, i - 1), hi: valueAt(series, decade, i) };
}

function assertPositive(value: number, what: string): void {
  if (!(value > 0) || !Number.isFinite(value)) throw new RangeError(`${what} must be a positive finite number, got ${value}`);
}

/**
 * The member of `series` nearest to `value` by logarithmic distance (ratio), e.g. 4.9 kΩ → 4.7 kΩ
 * in E12 (|ln(4.9/4.7)| < |ln(5.6/4.9)|). Ties go to the lower value.
 * @param value positive value, Ω or F
 * @param series preferred series
 * @returns the nearest preferred value, same unit
 * @example nearestPreferred(4900, "E12") // 4700
 */
export function nearestPreferred(value: number, series: ESeries): number {
  assertPositive(value, "value");
  const { lo, hi } = bracket(value, series);
  if (lo === hi) return lo;
  return Math.log(value / lo) <= Math.log(hi / value) ? lo : hi;
}

/**
 * The smallest member of `series` that is ≥ `value` (an exact member returns itself).
 * @param value positive value, Ω or F
 * @example nextPreferredUp(4800, "E24") // 5100
 */
export function nextPreferredUp(value: number, series: ESeries): number {
  assertPositive(value, "value");
  return bracket(value, series).hi;
}

/**
 * The largest member of `series` that is ≤ `value` (an exact member returns itself).
 * @param value positive value, Ω or F
 * @example nextPreferredDown(4800, "E24") // 4700
 */
export function nextPreferredDown(value: number, series: ESeries): number {
  assertPositive(value, "value");
  return bracket(value, series).lo;
}

/**
 * Every member of `series` in [min, max], ascending.
 * @param min lower bound (inclusive), Ω or F
 * @param max upper bound (inclusive), Ω or F
 * @example preferredValuesBetween(1000, 2000, "E6") // [1000, 1500]
 */
export function preferredValuesBetween(min: number, max: number, series: ESeries): number[] {
  assertPositive(min, "min");
  assertPositive(max, "max");
  if (max < min) return [];
  const out: number[] = [];
  let v = nextPreferredUp(min, series);
  const n = mantissas(series).length;
  // Walk up member by member.
  let decade = Math.floor(Math.log10(v) + 1e-12);
  const mant = v / 10 ** decade;
  let index = mantissas(series).findIndex((m) => Math.abs(m - mant) <= 1e-9 * m);
  if (index < 0) index = 0;
  let guard = 0;
  while (v <= max * (1 + 1e-12) && guard < 100_000) {
    out.push(v);
    index++;
    if (index >= n) {
      index = 0;
      decade++;
    }
    v = valueAt(series, decade, index);
    guard++;
  }
  return out;
}

/** A resistor pair and the ratio it achieves. */
export interface RatioPair {
  /** Upper / numerator resistor, Ω. */
  ra: number;
  /** Lower / denominator resistor, Ω. */
  rb: number;
  /** Achieved ratio ra / (rb + rbOffset). */
  ratio: number;
  /** Relative error of the achieved ratio: ratio / target − 1. */
  error: number;
}

/** Options of {@link bestRatioPair}. */
export interface RatioPairOptions {
  /** Fix Rb at this value (Ω); only Ra is chosen. */
  rb?: number;
  /** Range for Ra, Ω (default 10 Ω … 10 MΩ). */
  raMin?: number;
  raMax?: number;
  /** Range for Rb, Ω (default 10 Ω … 10 MΩ). */
  rbMin?: number;
  rbMax?: number;
  /** Resistance in series with Rb that is not chosen (e.g. a source resistance), Ω; default 0. */
  rbOffset?: number;
}

/**
 * The best pair of preferred values for a target ratio Ra / (Rb + rbOffset), by smallest
 * logarithmic ratio error. Every Ra in its range is tried with the two Rb members bracketing the
 * ideal Rb. Among equally good pairs, the one with Ra nearest the geometric centre of its range
 * wins (so the caller's scale choice is respected).
 *
 * @param targetRatio desired Ra/Rb, > 0 (e.g. G − 1 for a non-inverting stage)
 * @param series preferred series both resistors come from
 * @param opts ranges, a fixed Rb, or an extra series resistance
 * @returns the pair, the achieved ratio and its relative error; null if no pair fits the ranges
 * @example bestRatioPair(9, "E24", { rb: 1000 }) // { ra: 9100, rb: 1000, ratio: 9.1, error: 0.0111 }
 */
export function bestRatioPair(targetRatio: number, series: ESeries, opts: RatioPairOptions = {}): RatioPair | null {
  assertPositive(targetRatio, "targetRatio");
  const offset = opts.rbOffset ?? 0;
  const raMin = opts.raMin ?? 10;
  const raMax = opts.raMax ?? 10e6;
  const rbMin = opts.rb ?? opts.rbMin ?? 10;
  const rbMax = opts.rb ?? opts.rbMax ?? 10e6;
  const centre = Math.sqrt(raMin * raMax);
  let best: RatioPair | null = null;
  let bestScore = Infinity;
  let bestCentre = Infinity;
  const consider = (ra: number, rb: number) => {
    if (rb < rbMin * (1 - 1e-12) || rb > rbMax * (1 + 1e-12)) return;
    const ratio = ra / (rb + offset);
    const score = Math.abs(Math.log(ratio / targetRatio));
    const c = Math.abs(Math.log(ra / centre));
    if (score < bestScore - 1e-12 || (Math.abs(score - bestScore) <= 1e-12 && c < bestCentre)) {
      best = { ra, rb, ratio, error: ratio / targetRatio - 1 };
      bestScore = score;
      bestCentre = c;
    }
  };
  const raCandidates = preferredValuesBetween(raMin, raMax, series);
  for (const ra of raCandidates) {
    if (opts.rb !== undefined) {
      consider(ra, opts.rb);
      continue;
    }
    const rbIdeal = ra / targetRatio - offset;
    if (!(rbIdeal > 0)) continue;
    const { lo, hi } = bracket(rbIdeal, series);
    consider(ra, lo);
    if (hi !== lo) consider(ra, hi);
  }
  return best;
}

/**
 * Generic best pair: for each B in the series within [bMin, bMax], the ideal A is given by
 * `idealA(b)`; the two A members bracketing it are tried and the pair with the smallest
 * |error(a, b)| wins. Used where the target is not a plain ratio (e.g. an adjustable reference,
 * Vout = Vref·(1 + R1/R2) + Iadj·R1).
 *
 * @param series preferred series
 * @param bMin lower bound of B, Ω
 * @param bMax upper bound of B, Ω
 * @param idealA ideal A for a given B, Ω (non-positive or non-finite means "no A fits")
 * @param error signed relative error of a pair, dimensionless
 * @returns the best pair and its error, or null when no pair fits
 */
export function bestPairBy(
  series: ESeries,
  bMin: number,
  bMax: number,
  idealA: (b: number) => number,
  error: (a: number, b: number) => number,
): { a: number; b: number; error: number } | null {
  let best: { a: number; b: number; error: number } | null = null;
  for (const b of preferredValuesBetween(bMin, bMax, series)) {
    const ai = idealA(b);
    if (!(ai > 0) || !Number.isFinite(ai)) continue;
    const { lo, hi } = bracket(ai, series);
    for (const a of lo === hi ? [lo] : [lo, hi]) {
      const e = error(a, b);
      if (!Number.isFinite(e)) continue;
      if (!best || Math.abs(e) < Math.abs(best.error) - 1e-15) best = { a, b, error: e };
    }
  }
  return best;
}
