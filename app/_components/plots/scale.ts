/**
 * Scales and ticks for the sheet's plots: pure functions, no React.
 *
 * - Linear axes get "nice" ticks on a 1-2-5 sequence (angles in degrees get 15°, 30°, 45°, 90°,
 *   180° steps), and their domain is widened to the enclosing ticks.
 * - Log axes get a line at every decade (10ⁿ) and minor lines at 2…9 × 10ⁿ; labels sit on the
 *   decades, every n-th decade when there are many, and on 2 and 5 when the span is under about
 *   a decade.
 * - A value a scale cannot show (not finite, or ≤ 0 on a log axis) maps to NaN; callers treat
 *   NaN as "not drawn" (a break in a line, a dropped bar).
 */

/** Linear or logarithmic (base 10) axis. */
export type ScaleKind = "linear" | "log";

/** A mapping from data values to pixels along one axis. */
export interface Scale {
  kind: ScaleKind;
  /** Data interval shown, [low, high] (low > 0 on a log axis). */
  domain: [number, number];
  /** Pixel interval the domain maps to, [start, end] (end may be below start, as for y). */
  range: [number, number];
  /** Value → pixel; NaN where the value cannot be shown on this scale. */
  map(value: number): number;
  /** Pixel → value (the inverse of map, within the domain's scale space). */
  invert(px: number): number;
}

/** True when `value` can be drawn on a scale of this kind (finite, and > 0 on a log axis). */
export function isPlottable(value: number, kind: ScaleKind): boolean {
  return Number.isFinite(value) && (kind === "linear" || value > 0);
}

/** The value in the scale's own space: log10 for a log axis, unchanged for linear. */
export function toScaleSpace(value: number, kind: ScaleKind): number {
  if (!isPlottable(value, kind)) return NaN;
  return kind === "log" ? Math.log10(value) : value;
}

/** Inverse of {@link toScaleSpace}. */
function fromScaleSpace(t: number, kind: ScaleKind): number {
  return kind === "log" ? 10 ** t : t;
}

/**
 * Build a scale. Halves are used in the arithmetic so domains near ±Number.MAX_VALUE do not
 * overflow to infinity.
 * @param kind linear or log
 * @param domain [low, high] in data units (both > 0 for log)
 * @param range [start, end] in pixels
 */
export function makeScale(kind: ScaleKind, domain: [number, number], range: [number, number]): Scale {
  const a = toScaleSpace(domain[0], kind) / 2;
  const b = toScaleSpace(domain[1], kind) / 2;
  const span = b - a;
  const [r0, r1] = range;
  return {
    kind,
    domain,
    range,
    map(value: number): number {
      const t = toScaleSpace(value, kind) / 2;
      if (!Number.isFinite(t) || !(span !== 0)) return NaN;
      return r0 + ((t - a) / span) * (r1 - r0);
    },
    invert(px: number): number {
      if (r1 === r0) return NaN;
      return fromScaleSpace(2 * (a + ((px - r0) / (r1 - r0)) * span), kind);
    },
  };
}

/** Exact decimal m × 10^e (the nearest double to it, without 10 ** e rounding noise). */
export function decimal(m: number, e: number): number {
  return Number(`${m}e${e}`);
}

/** Remove floating-point noise from a tick value (k × step) and turn −0 into 0. */
function tidy(v: number): number {
  const r = Number(v.toPrecision(12));
  return r === 0 ? 0 : r;
}

/** Which steps an axis may use: decimal 1-2-5, angles (degrees), decibels. */
export type StepKind = "decimal" | "angle" | "dB";

/** Steps above 10 for angles (degrees) and for decibels; beyond the last, 1-2-5 again. */
const SPECIAL_STEPS: Record<Exclude<StepKind, "decimal">, number[]> = {
  angle: [15, 30, 45, 90, 180, 360],
  dB: [20, 40, 60, 100, 200, 400],
};

/**
 * The step kind that suits an axis unit: "°" angles, "dB" decibels, else decimal.
 * @param unit the axis unit symbol
 */
export function stepKindFor(unit: string): StepKind {
  return unit === "°" ? "angle" : unit === "dB" ? "dB" : "decimal";
}

/**
 * The smallest "nice" step ≥ `raw`: 1, 2 or 5 × 10ⁿ; above 10, angles (degrees) step by 15°,
 * 30°, 45°, 90°, 180° or 360° and decibels by 20, 40, 60, 100, 200 or 400 dB.
 * @param raw the step that would give the wanted number of intervals (data units)
 * @param kind which steps are allowed, default decimal
 * @returns the step, or NaN when `raw` is not a positive finite number
 * @example niceStep(0.23) // 0.5
 * @example niceStep(36, "angle") // 45
 * @example niceStep(32, "dB") // 40
 */
export function niceStep(raw: number, kind: StepKind = "decimal"): number {
  if (!(raw > 0) || !Number.isFinite(raw)) return NaN;
  if (kind !== "decimal" && raw > 10) {
    const s = SPECIAL_STEPS[kind].find((x) => x >= raw - 1e-9);
    if (s !== undefined) return s;
  }
  const e = Math.floor(Math.log10(raw));
  const f = raw / 10 ** e;
  const m = f <= 1 + 1e-9 ? 1 : f <= 2 + 1e-9 ? 2 : f <= 5 + 1e-9 ? 5 : 10;
  return decimal(m, e);
}

/**
 * Ticks at every multiple of a nice step inside [lo, hi].
 * @param lo low end of the interval (data units)
 * @param hi high end of the interval (data units)
 * @param target wanted number of intervals (about; the step is rounded up to a nice one)
 * @param kind which steps are allowed (see {@link niceStep})
 * @returns the step and the tick values, ascending; no ticks when the interval is empty or not finite
 * @example linearTicks(0, 1, 5) // { step: 0.2, ticks: [0, 0.2, 0.4, 0.6, 0.8, 1] }
 */
export function linearTicks(lo: number, hi: number, target = 5, kind: StepKind = "decimal"): { step: number; ticks: number[] } {
  const step = niceStep((hi / 2 - lo / 2) * (2 / Math.max(1, target)), kind);
  if (!Number.isFinite(step) || !Number.isFinite(lo) || !Number.isFinite(hi)) return { step: NaN, ticks: [] };
  const k0 = Math.ceil(lo / step - 1e-9);
  const k1 = Math.floor(hi / step + 1e-9);
  const ticks: number[] = [];
  for (let k = k0; k <= k1 && ticks.length < 1000; k++) ticks.push(tidy(k * step));
  return { step, ticks };
}

/** Data may pass the outermost tick by this share of the span before the domain grows a step
 * (a curve 0.001 dB above 0 dB should not add a whole 40 dB interval). */
export const DOMAIN_SLACK = 0.015;

/**
 * A linear domain widened to the nice ticks that enclose [lo, hi], with its ticks. A single
 * value is given room around it (±10 %, or ±1 around zero). Data beyond a tick by less than
 * {@link DOMAIN_SLACK} of the span does not widen the domain.
 * @param lo smallest data value
 * @param hi largest data value
 * @param target wanted number of intervals
 * @param kind which steps are allowed (see {@link niceStep})
 */
export function niceLinearDomain(lo: number, hi: number, target = 5, kind: StepKind = "decimal"): { domain: [number, number]; step: number; ticks: number[] } {
  let a = lo;
  let b = hi;
  if (a === b) {
    const pad = a === 0 ? 1 : Math.abs(a) * 0.1;
    a -= pad;
    b += pad;
  }
  const first = linearTicks(a, b, target, kind);
  if (!Number.isFinite(first.step)) return { domain: [a, b], step: NaN, ticks: [] };
  const step = first.step;
  const slack = Math.max(1e-9, (DOMAIN_SLACK * (b / 2 - a / 2) * 2) / step);
  const d0 = tidy(Math.floor(a / step + slack) * step);
  const d1 = tidy(Math.ceil(b / step - slack) * step);
  if (!Number.isFinite(d0) || !Number.isFinite(d1) || !(d1 > d0)) return { domain: [a, b], step, ticks: first.ticks };
  return { domain: [d0, d1], step, ticks: linearTicks(d0, d1, Math.round((d1 - d0) / step), kind).ticks };
}

/** One grid line of an axis. */
export interface Tick {
  /** Position in data units. */
  value: number;
  /** Decades (and the labelled lines of a linear axis) are major; 2…9 × 10ⁿ are minor. */
  major: boolean;
  /** Whether the tick carries a label. */
  label: boolean;
}

/**
 * Ticks of a log axis over [lo, hi] (both > 0): a major tick at every decade 10ⁿ, minor ticks at
 * 2…9 × 10ⁿ (when `minors` is true), labels on the decades, thinned to every n-th decade (n
 * chosen so at most `maxLabels` decades are labelled, labels on multiples of n so that with n = 3
 * they fall on 1, 1 k, 1 M). When fewer than two decades lie inside, the 2 and 5 minors are
 * labelled too; when still fewer than two labels fit, linear nice ticks are used instead.
 * @param lo low end (> 0, data units)
 * @param hi high end (> lo, data units)
 * @param opts.maxLabels most labelled decades, default 8
 * @param opts.minors draw 2…9 × 10ⁿ lines, default true
 * @returns ticks ascending; empty when the interval is not valid for a log axis
 * @example logTicks(10, 1000, { minors: false }) // 10, 100, 1000, all major and labelled
 */
export function logTicks(lo: number, hi: number, opts: { maxLabels?: number; minors?: boolean } = {}): Tick[] {
  const maxLabels = Math.max(1, opts.maxLabels ?? 8);
  const minors = opts.minors ?? true;
  if (!(lo > 0) || !(hi > lo) || !Number.isFinite(hi)) return [];
  const inside = (v: number) => v >= lo * (1 - 1e-12) && v <= hi * (1 + 1e-12);
  const eLo = Math.floor(Math.log10(lo) + 1e-12);
  const eHi = Math.floor(Math.log10(hi) + 1e-12);
  const decades: number[] = [];
  for (let e = eLo; e <= eHi; e++) if (inside(decimal(1, e))) decades.push(e);
  const every = Math.max(1, Math.ceil(decades.length / maxLabels));
  const ticks: Tick[] = [];
  const fewDecades = decades.length < 2;
  for (let e = eLo; e <= eHi; e++) {
    const major = decimal(1, e);
    if (inside(major)) ticks.push({ value: major, major: true, label: fewDecades || e % every === 0 });
    if (!minors && !fewDecades) continue;
    for (let m = 2; m <= 9; m++) {
      const v = decimal(m, e);
      if (!inside(v)) continue;
      const labelled = fewDecades && (m === 2 || m === 5);
      if (minors || labelled) ticks.push({ value: v, major: false, label: labelled });
    }
  }
  if (ticks.filter((t) => t.label).length < 2) {
    // Under about half a decade: a log axis with linear nice ticks reads best.
    const grid = ticks.filter((t) => !t.label);
    const lin = linearTicks(lo, hi, 4).ticks.filter((v) => v > 0);
    const labelled = lin.map((v) => ({ value: v, major: true, label: true }));
    return [...grid.filter((g) => !lin.some((v) => Math.abs(v - g.value) <= 1e-12 * v)), ...labelled].sort((p, q) => p.value - q.value);
  }
  return ticks;
}

/**
 * A log domain covering [lo, hi]: unchanged when it spans a range; a single value gets half a
 * decade either side.
 * @param lo smallest positive data value
 * @param hi largest data value (≥ lo)
 */
export function logDomain(lo: number, hi: number): [number, number] {
  if (hi > lo) return [lo, hi];
  return [lo / Math.sqrt(10), lo * Math.sqrt(10)];
}

/**
 * Smallest and largest drawable value, or null when there is none.
 * @param values data values (non-finite ones, and ≤ 0 ones on a log axis, are skipped)
 * @param kind the axis the values are drawn on
 */
export function extent(values: Iterable<number>, kind: ScaleKind): [number, number] | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of values) {
    if (!isPlottable(v, kind)) continue;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return lo <= hi ? [lo, hi] : null;
}
