/**
 * Normalised low-pass prototypes: the poles of Butterworth, Bessel (Thomson) and Chebyshev
 * (type I) responses of order 1 to 8, computed (not copied from tables), grouped into one
 * first-order section (odd orders) and second-order sections ordered by rising Q.
 *
 * Normalisation: the prototype cutoff is ω = 1 rad/s.
 * - "-3db": |H(j1)| is 3.0103 dB (a factor 1/√2) below the passband reference gain, which is
 *   the DC gain. For even-order Chebyshev filters the DC gain sits at the bottom of the ripple
 *   band, so the response rises above it by the ripple; this is the normalisation of the tables
 *   in Carter & Mancini, Op Amps for Everyone, 5th ed., ch. 16.
 * - "ripple-edge" (Chebyshev only): ω = 1 is the edge of the equiripple band, where the response
 *   last leaves the ripple band (the classical Chebyshev normalisation).
 *
 * Each section is stated as a normalised natural frequency w0 (rad/s at cutoff 1) and quality
 * factor Q, i.e. the low-pass section 1/(1 + a·s + b·s²) with b = 1/w0², a = 1/(w0·Q), and the
 * first-order section 1/(1 + a·s) with a = 1/w0 (the form of the coefficient tables).
 *
 * References:
 * [1] B. Carter, R. Mancini, Op Amps for Everyone, 5th ed., Newnes 2017, ch. 16 (coefficient form).
 * [2] W. E. Thomson, Proc. IEE 96 (1949) 487–490 (Bessel–Thomson delay networks).
 * [3] Chebyshev pole positions: the usual closed form with ε = √(10^(r/10) − 1),
 *     α = asinh(1/ε)/n, p_k = −sinh α·sin θ_k + j·cosh α·cos θ_k, θ_k = (2k − 1)π/(2n).
 */
import { polyRoots, reverseBesselPolynomial, type Cx } from "./polynomial";

/** Response families offered. */
export type ResponseFamily = "butterworth" | "bessel" | "chebyshev";
/** Chebyshev passband ripples offered, dB. */
export const CHEBYSHEV_RIPPLES_DB = [0.5, 1, 2, 3] as const;
/** One of the offered Chebyshev ripples, dB. */
export type ChebyshevRippleDb = (typeof CHEBYSHEV_RIPPLES_DB)[number];
/** Meaning of the cutoff frequency (see the module doc). */
export type CutoffNormalisation = "-3db" | "ripple-edge";

/** One section of a normalised prototype. */
export type PrototypeSection =
  | { order: 1; /** normalised pole frequency, rad/s */ w0: number }
  | { order: 2; /** normalised natural frequency, rad/s */ w0: number; /** quality factor */ q: number };

/** A normalised prototype: its poles and sections. */
export interface Prototype {
  family: ResponseFamily;
  order: number;
  rippleDb?: ChebyshevRippleDb;
  normalisation: CutoffNormalisation;
  /** Poles of the normalised prototype (left half plane), [re, im] in rad/s. */
  poles: Cx[];
  /** First-order section first (odd orders), then second-order sections by rising Q. */
  sections: PrototypeSection[];
  /** Ratio of the ripple-band edge to the −3 dB frequency (Chebyshev), else 1. Dimensionless. */
  rippleEdgeOverMinus3dB: number;
}

/** What to design. */
export interface PrototypeSpec {
  family: ResponseFamily;
  /** Filter order, 1 … 8. */
  order: number;
  /** Chebyshev passband ripple, dB (required for Chebyshev). */
  rippleDb?: ChebyshevRippleDb;
  /** Default "-3db". "ripple-edge" is only meaningful for Chebyshev. */
  normalisation?: CutoffNormalisation;
}

/** Butterworth poles, −3 dB at 1 rad/s: p_k = exp(jπ(2k + n − 1)/(2n)), k = 1 … n. */
function butterworthPoles(n: number): Cx[] {
  const p: Cx[] = [];
  for (let k = 1; k <= n; k++) {
    const a = (Math.PI * (2 * k + n - 1)) / (2 * n);
    p.push([Math.cos(a), Math.sin(a)]);
  }
  return p;
}

/** Chebyshev type I poles, normalised to the ripple-band edge at 1 rad/s [3]. */
function chebyshevPoles(n: number, rippleDb: number): Cx[] {
  const eps = Math.sqrt(10 ** (rippleDb / 10) - 1);
  const alpha = Math.asinh(1 / eps) / n;
  const p: Cx[] = [];
  for (let k = 1; k <= n; k++) {
    const theta = ((2 * k - 1) * Math.PI) / (2 * n);
    p.push([-Math.sinh(alpha) * Math.sin(theta), Math.cosh(alpha) * Math.cos(theta)]);
  }
  return p;
}

/**
 * Ratio of the Chebyshev −3 dB frequency to the ripple-band edge, with the −3 dB point taken
 * relative to the DC gain: T_n(ω) = 1/ε for odd n (DC at the top of the ripple band) and
 * T_n(ω) = √(1 + 2ε²)/ε for even n (DC at the bottom), so ω = cosh(acosh(T)/n).
 * @param n order; @param rippleDb ripple, dB. @returns ω₋₃dB / ω_ripple-edge (≥ 1)
 */
export function chebyshevMinus3dBOverRippleEdge(n: number, rippleDb: number): number {
  const eps = Math.sqrt(10 ** (rippleDb / 10) - 1);
  const t = n % 2 === 1 ? 1 / eps : Math.sqrt(1 + 2 * eps * eps) / eps;
  return t <= 1 ? 1 : Math.cosh(Math.acosh(t) / n);
}

/** |H(jω)|² / |H(0)|² of an all-pole filter with these poles. */
function allPoleMag2Ratio(poles: readonly Cx[], w: number): number {
  let r = 1;
  for (const [re, im] of poles) {
    const m0 = re * re + im * im;
    const m = re * re + (w - im) * (w - im);
    r *= m0 / m;
  }
  return r;
}

/**
 * Highest frequency ω (rad/s) where an all-pole response is 1/√2 of its DC gain: scans down
 * from above every pole magnitude, then bisects to machine precision.
 */
export function allPoleMinus3dB(poles: readonly Cx[]): number {
  let hi = 1;
  for (const [re, im] of poles) hi = Math.max(hi, 4 * Math.hypot(re, im));
  while (allPoleMag2Ratio(poles, hi) >= 0.5) hi *= 2;
  let lo = hi;
  while (allPoleMag2Ratio(poles, lo) < 0.5 && lo > 1e-9) lo *= 0.98;
  hi = lo / 0.98;
  for (let i = 0; i < 200 && hi - lo > 1e-15 * hi; i++) {
    const mid = 0.5 * (lo + hi);
    if (allPoleMag2Ratio(poles, mid) >= 0.5) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** Group poles into sections: real poles → first order; conjugate pairs → (w0, Q); rising Q. */
export function polesToSections(poles: readonly Cx[]): PrototypeSection[] {
  const tolIm = 1e-9;
  const first: PrototypeSection[] = [];
  const second: Array<{ order: 2; w0: number; q: number }> = [];
  for (const [re, im] of poles) {
    if (Math.abs(im) <= tolIm * Math.max(1, Math.abs(re))) first.push({ order: 1, w0: -re });
    else if (im > 0) {
      const w0 = Math.hypot(re, im);
      second.push({ order: 2, w0, q: w0 / (-2 * re) });
    }
  }
  second.sort((a, b) => a.q - b.q);
  return [...first, ...second];
}

/**
 * Design the normalised low-pass prototype (cutoff 1 rad/s).
 *
 * @param spec family, order 1 … 8, Chebyshev ripple (dB), cutoff normalisation
 * @returns poles and sections (first-order first, then rising Q)
 * @example designPrototype({ family: "butterworth", order: 2 }).sections // [{ order: 2, w0: 1, q: 0.7071 }]
 */
export function designPrototype(spec: PrototypeSpec): Prototype {
  const n = spec.order;
  if (!Number.isInteger(n) || n < 1 || n > 8) throw new RangeError("order must be an integer from 1 to 8");
  const normalisation: CutoffNormalisation = spec.family === "chebyshev" ? (spec.normalisation ?? "-3db") : "-3db";
  let poles: Cx[];
  let rippleEdgeOverMinus3dB = 1;
  if (spec.family === "butterworth") {
    poles = butterworthPoles(n);
  } else if (spec.family === "chebyshev") {
    const r = spec.rippleDb;
    if (r === undefined || !CHEBYSHEV_RIPPLES_DB.includes(r)) throw new RangeError("rippleDb must be 0.5, 1, 2 or 3 dB");
    poles = chebyshevPoles(n, r);
    const k = chebyshevMinus3dBOverRippleEdge(n, r);
    rippleEdgeOverMinus3dB = 1 / k;
    if (normalisation === "-3db") poles = poles.map(([re, im]) => [re / k, im / k] as Cx);
  } else {
    // Bessel: roots of the reverse Bessel polynomial, then scaled so |H(j1)| = 1/√2 (numerically).
    const roots = polyRoots(reverseBesselPolynomial(n)).map(([re, im]) => [re, Math.abs(im) < 1e-12 ? 0 : im] as Cx);
    const w3 = allPoleMinus3dB(roots);
    poles = roots.map(([re, im]) => [re / w3, im / w3] as Cx);
  }
  return {
    family: spec.family,
    order: n,
    rippleDb: spec.family === "chebyshev" ? spec.rippleDb : undefined,
    normalisation,
    poles,
    sections: polesToSections(poles),
    rippleEdgeOverMinus3dB,
  };
}

/** Table form of a section: 1/(1 + a·s + b·s²) (b = 0 for first order), dimensionless. */
export function sectionCoefficientsAB(s: PrototypeSection): { a: number; b: number } {
  if (s.order === 1) return { a: 1 / s.w0, b: 0 };
  return { a: 1 / (s.w0 * s.q), b: 1 / (s.w0 * s.w0) };
}
