/**
 * Tolerance analysis of a designed filter: worst case and Monte Carlo of the −3 dB frequency
 * (centre frequency for band-pass), the passband gain magnitude and every section's f₀ and Q.
 *
 * Model: each resistor and capacitor varies independently around its chosen value within its
 * stated tolerance t (a fraction):
 * - uniform: v = v₀·(1 + t·u), u uniform on [−1, 1);
 * - normal: v = v₀·(1 + σ·z), z standard normal, σ = t/3 (tolerance = 3σ, common practice, no
 *   source), not truncated.
 * The op-amp is ideal in this analysis; the finite-GBW shift is reported separately at nominal.
 * Each trial evaluates the section polynomials and finds the −3 dB point with polynomialEdge (a
 * Newton step from the nominal point with the nominal slope, a bracket check, then the Illinois
 * iteration on ln|H(jω)|² in u = ω², about 5 evaluations of |H|²), not a dense sweep.
 *
 * Worst case: per section, all 2ᵏ corners of its k parts (k ≤ 6). For the overall −3 dB
 * frequency and gain: all corners when the design has at most 12 parts (4,096 corners); beyond
 * that, the two corners given by the signs of the first-order sensitivities (each part at the
 * tolerance limit that raises, resp. lowers, the figure), evaluated exactly. This is exact for
 * monotonic dependence and an estimate otherwise; the results say which method was used. For
 * ripple responses (Chebyshev) the −3 dB point can jump to a lower frequency when a ripple valley
 * sags below −3 dB, which the Monte Carlo shows and the sensitivity corners may miss.
 *
 * Random numbers: xoshiro128** seeded by SplitMix32 (prng.ts).
 */
import type { FilterDesign } from "./design";
import { createPrng, type Prng } from "./prng";
import { cascadeMag2, cascadeReferenceMag2, minus3dBFrequency, packedCoefficients, polynomialEdge } from "./response";

const TWO_PI = 2 * Math.PI;

/** Largest Monte Carlo trial count accepted. */
export const MAX_MONTE_CARLO_TRIALS = 100_000;

/** Distribution of part values within their tolerance. */
export type ToleranceDistribution = "uniform" | "normal";

/** Monte Carlo options. */
export interface MonteCarloOptions {
  /** Number of trials, 1 … 100,000. */
  trials: number;
  /** 32-bit integer seed. */
  seed: number;
  distribution: ToleranceDistribution;
  /** Histogram bins (default 40). */
  bins?: number;
}

/** Summary statistics of one figure. */
export interface FigureStats {
  /** Unit of the values: "Hz", "V/V" or "" (Q). */
  unit: string;
  nominal: number;
  mean: number;
  /** Sample standard deviation (n − 1). */
  std: number;
  min: number;
  max: number;
  /** Percentiles (probability 0 … 1 → value), linear interpolation between order statistics. */
  percentiles: Array<{ p: number; value: number }>;
  /** Histogram: edges (bins + 1) and counts (bins). */
  histogram: { edges: number[]; counts: number[] };
}

/** Monte Carlo result. */
export interface MonteCarloResult {
  trials: number;
  seed: number;
  distribution: ToleranceDistribution;
  /** σ as a fraction of the tolerance for the normal distribution (1/3). */
  sigmaPerTolerance: number;
  /** Trials that gave an unstable or edge-less response (excluded from the statistics). */
  rejected: number;
  /** −3 dB frequency (low/high-pass) or centre frequency (band-pass), Hz. */
  frequency: FigureStats;
  /** Passband gain magnitude (DC, high-frequency or centre), V/V. */
  gain: FigureStats;
  sections: Array<{ f0: FigureStats; q: FigureStats }>;
}

/** Progress and cancellation for long runs. */
export interface MonteCarloControl {
  /** Called after each chunk with trials done and the total. */
  onProgress?(done: number, total: number): void;
  /** Abort the run: the promise rejects with the signal's reason. */
  signal?: AbortSignal;
  /** Trials per chunk between yields to the event loop (default 2,000). */
  chunkSize?: number;
}

/** Percentiles reported (probabilities): ±3σ-equivalent tails, the central 95 % and the median. */
export const PERCENTILES = [0.00135, 0.025, 0.5, 0.975, 0.99865] as const;

/** Tolerance vector (fractions) of a design's parts, in FilterDesign.values order. */
function tolerances(design: FilterDesign): Float64Array {
  return Float64Array.from(design.components.map((c) => c.tolerance));
}

/** Evaluates the figures of one set of part values. */
interface Evaluator {
  /** Fills c (packed coefficients) from values; returns false if a section is unstable. */
  coefficients(v: Float64Array, c: Float64Array): boolean;
  /** −3 dB (or centre) frequency, Hz; NaN if none. */
  frequency(c: Float64Array): number;
  /** Gain magnitude, V/V. */
  gain(c: Float64Array): number;
}

/** d ln|H|²/d ln(ω²) of the nominal design at its −3 dB frequency f3 (Hz), by central difference. */
function edgeSlope(design: FilterDesign, f3: number): number {
  const c = packedCoefficients(design);
  const n = design.sections.length;
  const u = (TWO_PI * f3) ** 2, h = 1e-4;
  return (Math.log(cascadeMag2(c, n, Math.sqrt(u * (1 + h)))) - Math.log(cascadeMag2(c, n, Math.sqrt(u * (1 - h))))) / (Math.log(1 + h) - Math.log(1 - h));
}

function makeEvaluator(design: FilterDesign): Evaluator {
  const n = design.sections.length;
  const sections = design.sections;
  const f3nom = design.kind === "bandpass" ? design.targetFrequency : minus3dBFrequency(design);
  const kind = design.kind;
  // a Newton step from the nominal −3 dB point with the nominal slope brackets each trial's edge
  const slope = kind === "bandpass" ? 0 : edgeSlope(design, f3nom);
  return {
    coefficients(v, c) {
      let ok = true;
      for (let k = 0; k < n; k++) {
        const s = sections[k];
        s.variant.coefficients(v, s.offset, c, 5 * k);
        if (!(c[5 * k + 3] > 0) || c[5 * k + 4] < 0) ok = false;
      }
      return ok;
    },
    frequency(c) {
      if (kind === "bandpass") return 1 / (TWO_PI * Math.sqrt(c[4]));
      return polynomialEdge(kind, c, n, 0.5, TWO_PI * f3nom, slope) / TWO_PI;
    },
    gain(c) {
      if (kind === "bandpass") return Math.abs(c[1] / c[3]);
      return Math.sqrt(cascadeReferenceMag2(kind, c, n));
    },
  };
}

function sectionF0(c: Float64Array, k: number, order: 1 | 2): number {
  return order === 1 ? 1 / (TWO_PI * c[5 * k + 3]) : 1 / (TWO_PI * Math.sqrt(c[5 * k + 4]));
}
function sectionQ(c: Float64Array, k: number, order: 1 | 2): number {
  return order === 1 ? 0 : Math.sqrt(c[5 * k + 4]) / c[5 * k + 3];
}

/** In-place selection (Hoare's quickselect, median-of-three): after it, x[k] is the k-th smallest of x[lo…hi]. */
function select(x: Float64Array, k: number, lo: number, hi: number): void {
  while (hi > lo) {
    const mid = (lo + hi) >> 1;
    // median of three into x[mid]
    if (x[mid] < x[lo]) { const t = x[mid]; x[mid] = x[lo]; x[lo] = t; }
    if (x[hi] < x[lo]) { const t = x[hi]; x[hi] = x[lo]; x[lo] = t; }
    if (x[hi] < x[mid]) { const t = x[hi]; x[hi] = x[mid]; x[mid] = t; }
    const pivot = x[mid];
    let i = lo, j = hi;
    while (i <= j) {
      while (x[i] < pivot) i++;
      while (x[j] > pivot) j--;
      if (i <= j) {
        const t = x[i]; x[i] = x[j]; x[j] = t;
        i++; j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return;
  }
}

/**
 * Summary statistics of samples (first `count` entries of `x`, which is left unchanged):
 * mean, sample standard deviation, min, max, percentiles (linear interpolation between order
 * statistics, found by selection rather than a full sort) and a histogram of `bins` equal bins.
 */
export function figureStats(x: Float64Array, count: number, nominal: number, unit: string, bins = 40): FigureStats {
  let sum = 0, min = Infinity, max = -Infinity;
  for (let i = 0; i < count; i++) {
    const v = x[i];
    sum += v;
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (count === 0) { min = nominal; max = nominal; }
  const mean = count > 0 ? sum / count : nominal;
  const span = max - min;
  const lo = span > 0 ? min : min - Math.abs(min) * 1e-6 - 1e-300;
  const hi = span > 0 ? max : max + Math.abs(max) * 1e-6 + 1e-300;
  const edges: number[] = [];
  for (let i = 0; i <= bins; i++) edges.push(lo + ((hi - lo) * i) / bins);
  const counts = new Array<number>(bins).fill(0);
  const scale = bins / (hi - lo);
  // second pass: squared deviations (two-pass variance, numerically safe) and the histogram
  let ss = 0;
  for (let i = 0; i < count; i++) {
    const v = x[i];
    ss += (v - mean) * (v - mean);
    let b = ((v - lo) * scale) | 0;
    if (b >= bins) b = bins - 1;
    else if (b < 0) b = 0;
    counts[b]++;
  }
  const std = count > 1 ? Math.sqrt(ss / (count - 1)) : 0;
  const work = x.slice(0, count);
  // median first, then each tail inside its half: about 3n element visits in all
  const pick = (p: number, lo: number, hi: number): { k: number; value: number } => {
    const h = (count - 1) * p;
    const k = Math.floor(h);
    select(work, k, lo, hi);
    let value = work[k];
    if (h > k && k + 1 < count) {
      // the (k+1)-th smallest: the least element after k in the selected range, or (when k ends
      // the range) after the range, whose elements are all ≥ those inside it
      let next = Infinity;
      const end = k + 1 <= hi ? hi : count - 1;
      for (let i = k + 1; i <= end; i++) if (work[i] < next) next = work[i];
      value += (h - k) * (next - value);
    }
    return { k, value };
  };
  const byP = new Map<number, number>();
  if (count > 0) {
    const mid = pick(0.5, 0, count - 1);
    byP.set(0.5, mid.value);
    const lowerOuter = pick(PERCENTILES[1], 0, mid.k);
    byP.set(PERCENTILES[1], lowerOuter.value);
    byP.set(PERCENTILES[0], pick(PERCENTILES[0], 0, lowerOuter.k).value);
    const upperInner = pick(PERCENTILES[3], mid.k, count - 1);
    byP.set(PERCENTILES[3], upperInner.value);
    byP.set(PERCENTILES[4], pick(PERCENTILES[4], upperInner.k, count - 1).value);
  }
  const percentiles = PERCENTILES.map((p) => ({ p, value: byP.get(p) ?? nominal }));
  return { unit, nominal, mean, std, min, max, percentiles, histogram: { edges, counts } };
}

/** Running state of a Monte Carlo run, advanced chunk by chunk. */
interface McState {
  done: number;
  accepted: number;
  rejected: number;
  freq: Float64Array;
  gain: Float64Array;
  f0: Float64Array[];
  q: Float64Array[];
}

function createState(design: FilterDesign, trials: number): McState {
  return {
    done: 0,
    accepted: 0,
    rejected: 0,
    freq: new Float64Array(trials),
    gain: new Float64Array(trials),
    f0: design.sections.map(() => new Float64Array(trials)),
    q: design.sections.map(() => new Float64Array(trials)),
  };
}

function runChunk(design: FilterDesign, ev: Evaluator, rng: Prng, dist: ToleranceDistribution, st: McState, count: number, tol: Float64Array): void {
  const nom = design.values;
  const m = nom.length;
  const v = new Float64Array(m);
  const c = new Float64Array(5 * design.sections.length);
  const sigma = 1 / 3;
  const orders = design.sections.map((s) => s.variant.order);
  // random numbers in blocks of trials (a reused buffer keeps the garbage collector idle)
  const block = Math.min(count, 256);
  const rnd = new Float64Array(m * block);
  for (let t = 0; t < count; t++) {
    const j = t % block;
    if (j === 0) {
      const len = m * Math.min(block, count - t);
      const view = len === rnd.length ? rnd : rnd.subarray(0, len);
      if (dist === "uniform") rng.fillSymmetric(view);
      else {
        rng.fillNormal(view);
        for (let i = 0; i < len; i++) view[i] *= sigma;
      }
    }
    let positive = true;
    const base = j * m;
    for (let i = 0; i < m; i++) {
      const x = nom[i] * (1 + tol[i] * rnd[base + i]);
      if (!(x > 0)) positive = false;
      v[i] = x;
    }
    st.done++;
    const ok = positive && ev.coefficients(v, c);
    const f = ok ? ev.frequency(c) : NaN;
    if (!ok || !Number.isFinite(f)) {
      st.rejected++;
      continue;
    }
    const a = st.accepted++;
    st.freq[a] = f;
    st.gain[a] = ev.gain(c);
    for (let k = 0; k < orders.length; k++) {
      st.f0[k][a] = sectionF0(c, k, orders[k]);
      st.q[k][a] = sectionQ(c, k, orders[k]);
    }
  }
}

function finish(design: FilterDesign, opts: MonteCarloOptions, st: McState): MonteCarloResult {
  const bins = opts.bins ?? 40;
  const nomC = packedCoefficients(design);
  const ev = makeEvaluator(design);
  return {
    trials: st.done,
    seed: opts.seed,
    distribution: opts.distribution,
    sigmaPerTolerance: 1 / 3,
    rejected: st.rejected,
    frequency: figureStats(st.freq, st.accepted, design.kind === "bandpass" ? ev.frequency(nomC) : minus3dBFrequency(design), "Hz", bins),
    gain: figureStats(st.gain, st.accepted, ev.gain(nomC), "V/V", bins),
    sections: design.sections.map((s, k) => ({
      f0: figureStats(st.f0[k], st.accepted, s.achieved.f0, "Hz", bins),
      q: figureStats(st.q[k], st.accepted, s.achieved.q, "", bins),
    })),
  };
}

/**
 * Monte Carlo analysis, synchronous (for the compute path with a moderate trial count).
 * @param design the designed filter (chosen values and tolerances)
 * @param opts trials (≤ 100,000), seed, distribution
 */
export function monteCarlo(design: FilterDesign, opts: MonteCarloOptions): MonteCarloResult {
  const trials = Math.max(1, Math.min(MAX_MONTE_CARLO_TRIALS, Math.floor(opts.trials)));
  const st = createState(design, trials);
  runChunk(design, makeEvaluator(design), createPrng(opts.seed), opts.distribution, st, trials, tolerances(design));
  return finish(design, opts, st);
}

/**
 * Monte Carlo analysis for long runs: runs in chunks, reports progress, yields to the event loop
 * between chunks and can be cancelled. Gives the same numbers as monteCarlo() for the same seed.
 *
 * @param design the designed filter
 * @param opts trials (≤ 100,000), seed, distribution
 * @param control onProgress(done, total), signal (AbortSignal), chunkSize
 * @returns a promise of the result; rejects with the abort reason when cancelled
 * @example await runMonteCarlo(design, { trials: 100_000, seed: 1, distribution: "normal" }, { onProgress: (d, t) => … })
 */
export async function runMonteCarlo(design: FilterDesign, opts: MonteCarloOptions, control: MonteCarloControl = {}): Promise<MonteCarloResult> {
  const trials = Math.max(1, Math.min(MAX_MONTE_CARLO_TRIALS, Math.floor(opts.trials)));
  const st = createState(design, trials);
  const ev = makeEvaluator(design);
  const rng = createPrng(opts.seed);
  const tol = tolerances(design);
  const chunk = Math.max(1, Math.floor(control.chunkSize ?? 2000));
  control.signal?.throwIfAborted();
  while (st.done < trials) {
    runChunk(design, ev, rng, opts.distribution, st, Math.min(chunk, trials - st.done), tol);
    control.onProgress?.(st.done, trials);
    if (st.done < trials) {
      await new Promise<void>((resolve) => setTimeout(resolve, 0));
      control.signal?.throwIfAborted();
    }
  }
  return finish(design, opts, st);
}

/** Worst-case bounds of one figure. */
export interface WorstCaseBounds {
  nominal: number;
  min: number;
  max: number;
}

/** Worst-case result. */
export interface WorstCaseResult {
  /** "corners" (every combination) or "sensitivity" (sensitivity-directed corners). */
  method: "corners" | "sensitivity";
  /** Corner evaluations made for the overall figures. */
  evaluations: number;
  frequency: WorstCaseBounds;
  gain: WorstCaseBounds;
  sections: Array<{ method: "corners"; f0: WorstCaseBounds; q: WorstCaseBounds }>;
  /** Corners that gave an unstable response (a warning when > 0). */
  unstableCorners: number;
}

/** Largest part count for which every corner of the whole design is evaluated. */
export const MAX_CORNER_PARTS = 12;

/**
 * Worst-case analysis at the tolerance limits (see the module doc for the method).
 * @param design the designed filter
 */
export function worstCase(design: FilterDesign): WorstCaseResult {
  const ev = makeEvaluator(design);
  const nom = design.values;
  const tol = tolerances(design);
  const m = nom.length;
  const c = new Float64Array(5 * design.sections.length);
  const v = new Float64Array(m);
  ev.coefficients(nom, c);
  const f0n = ev.frequency(c), g0 = ev.gain(c);
  const freq = { nominal: f0n, min: f0n, max: f0n };
  const gain = { nominal: g0, min: g0, max: g0 };
  let unstable = 0;
  let evaluations = 0;
  const evalCorner = () => {
    evaluations++;
    if (!ev.coefficients(v, c)) {
      unstable++;
      return;
    }
    const f = ev.frequency(c), g = ev.gain(c);
    if (Number.isFinite(f)) {
      freq.min = Math.min(freq.min, f);
      freq.max = Math.max(freq.max, f);
    }
    gain.min = Math.min(gain.min, g);
    gain.max = Math.max(gain.max, g);
  };
  let method: WorstCaseResult["method"] = "corners";
  if (m <= MAX_CORNER_PARTS) {
    for (let mask = 0; mask < 1 << m; mask++) {
      for (let i = 0; i < m; i++) v[i] = nom[i] * (1 + ((mask >> i) & 1 ? tol[i] : -tol[i]));
      evalCorner();
    }
  } else {
    method = "sensitivity";
    const sensF = new Float64Array(m), sensG = new Float64Array(m);
    const h = 1e-6;
    for (let i = 0; i < m; i++) {
      v.set(nom);
      v[i] = nom[i] * (1 + h);
      ev.coefficients(v, c);
      const fp = ev.frequency(c), gp = ev.gain(c);
      v[i] = nom[i] * (1 - h);
      ev.coefficients(v, c);
      const fm = ev.frequency(c), gm = ev.gain(c);
      sensF[i] = fp - fm;
      sensG[i] = gp - gm;
    }
    for (const sens of [sensF, sensG]) {
      for (const dir of [1, -1]) {
        for (let i = 0; i < m; i++) v[i] = nom[i] * (1 + dir * Math.sign(sens[i]) * tol[i]);
        evalCorner();
      }
    }
  }
  const sections = design.sections.map((s, k) => {
    const k0 = s.offset, np = s.variant.parts.length;
    const local = new Float64Array(nom);
    const f0 = { nominal: s.achieved.f0, min: s.achieved.f0, max: s.achieved.f0 };
    const q = { nominal: s.achieved.q, min: s.achieved.q, max: s.achieved.q };
    for (let mask = 0; mask < 1 << np; mask++) {
      for (let j = 0; j < np; j++) local[k0 + j] = nom[k0 + j] * (1 + ((mask >> j) & 1 ? tol[k0 + j] : -tol[k0 + j]));
      s.variant.coefficients(local, k0, c, 5 * k);
      const ff = sectionF0(c, k, s.variant.order), qq = sectionQ(c, k, s.variant.order);
      f0.min = Math.min(f0.min, ff); f0.max = Math.max(f0.max, ff);
      if (Number.isFinite(qq)) { q.min = Math.min(q.min, qq); q.max = Math.max(q.max, qq); }
    }
    return { method: "corners" as const, f0, q };
  });
  return { method, evaluations, frequency: freq, gain, sections, unstableCorners: unstable };
}
