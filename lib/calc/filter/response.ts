/**
 * Frequency response of a designed filter from its actual component values: magnitude, phase and
 * group delay over a log sweep, with the ideal op-amp (from the section polynomials) and with the
 * single-pole op-amp model (by nodal analysis, mna.ts); and fast −3 dB / ripple-edge finders on
 * |H(jω)|² of the section polynomials (used for the nominal design and for every Monte Carlo
 * trial: a bracket scan followed by the Illinois false-position iteration in log ω, ~15
 * evaluations instead of a dense sweep).
 *
 * Units: frequencies in Hz unless named omega (rad/s); magnitude in V/V or dB; phase in degrees;
 * group delay in s.
 *
 * Reference for the Illinois method: M. Dowell, P. Jarratt, "A modified regula falsi method for
 * computing the root of an equation", BIT 11 (1971) 168–174.
 */
import { designCircuit, sectionCircuit, type FilterDesign } from "./design";
import { compileCircuit, type OpAmpModel } from "./mna";
import type { FilterKind } from "./topology";

const TWO_PI = 2 * Math.PI;

/** n log-spaced frequencies from fStart to fStop inclusive, Hz. */
export function logSweep(fStart: number, fStop: number, n: number): number[] {
  const out: number[] = [];
  const a = Math.log(fStart), b = Math.log(fStop);
  for (let i = 0; i < n; i++) out.push(Math.exp(a + ((b - a) * i) / Math.max(1, n - 1)));
  return out;
}

/**
 * |H(jω)|² of a cascade of sections given as packed coefficients
 * c[5k … 5k+4] = [b0, b1, b2, a1, a2] (a0 = 1), at ω (rad/s).
 */
export function cascadeMag2(c: ArrayLike<number>, nSections: number, omega: number): number {
  const w2 = omega * omega;
  let m = 1;
  for (let k = 0; k < nSections; k++) {
    const o = 5 * k;
    const nr = c[o] - c[o + 2] * w2, ni = c[o + 1] * omega;
    const dr = 1 - c[o + 4] * w2, di = c[o + 3] * omega;
    m *= (nr * nr + ni * ni) / (dr * dr + di * di);
  }
  return m;
}

/** Passband reference |H|² of a packed cascade: DC (low-pass) or ω → ∞ (high-pass), (V/V)². */
export function cascadeReferenceMag2(kind: FilterKind, c: ArrayLike<number>, nSections: number): number {
  let m = 1;
  for (let k = 0; k < nSections; k++) {
    const o = 5 * k;
    let g: number;
    if (kind === "lowpass") g = c[o];
    else if (c[o + 4] !== 0) g = c[o + 2] / c[o + 4];
    else g = c[o + 1] / c[o + 3];
    m *= g * g;
  }
  return m;
}

/**
 * The frequency (rad/s) where r(ω) = level, at the transition into the stopband: for a low-pass
 * the crossing next to the guess on the stopband side of the passband: scanning from the guess in
 * steps of 2 % until the level is bracketed, assuming (as for every response family offered)
 * that the response falls monotonically beyond the −3 dB point.
 *
 * @param ratio r(ω): |H(jω)|² relative to the passband reference
 * @param level target ratio, e.g. 0.5 for −3.0103 dB
 * @param guess starting estimate, rad/s
 * @param falling true for low-pass behaviour (r falls with ω at the edge)
 * @returns crossing, rad/s; NaN if none is found (unstable or degenerate response)
 */
export function findEdge(ratio: (omega: number) => number, level: number, guess: number, falling: boolean): number {
  // map to a "falling" problem in x = ±ln ω
  const sgn = falling ? 1 : -1;
  const f = (x: number): number => Math.log(ratio(Math.exp(sgn * x))) - Math.log(level);
  const x0 = sgn * Math.log(guess);
  const step = Math.log(1.02);
  let lo: number, hi: number, fl: number, fh: number;
  const f0 = f(x0);
  if (Number.isNaN(f0)) return NaN;
  if (f0 >= 0) {
    // at or inside the passband: step up until the response is below the level
    lo = x0; fl = f0;
    hi = lo + step; fh = f(hi);
    for (let i = 0; i < 4000 && fh >= 0; i++) {
      lo = hi; fl = fh;
      hi += step * (i < 20 ? 1 : 4);
      fh = f(hi);
    }
    if (!(fh < 0)) return NaN;
  } else {
    // beyond the edge: step down until the response is at or above the level
    hi = x0; fh = f0;
    lo = hi - step; fl = f(lo);
    for (let i = 0; i < 4000 && fl < 0; i++) {
      hi = lo; fh = fl;
      lo -= step * (i < 20 ? 1 : 4);
      fl = f(lo);
    }
    if (!(fl >= 0) || !Number.isFinite(fl)) return NaN;
  }
  // Illinois iteration on [lo, hi] with f(lo) ≥ 0 > f(hi)
  let side = 0;
  for (let i = 0; i < 60; i++) {
    const x = fl === fh ? 0.5 * (lo + hi) : (lo * fh - hi * fl) / (fh - fl);
    const fx = f(x);
    if (!Number.isFinite(fx)) return NaN;
    if (fx >= 0) {
      lo = x; fl = fx;
      if (side === 1) fh /= 2;
      side = 1;
    } else {
      hi = x; fh = fx;
      if (side === -1) fl /= 2;
      side = -1;
    }
    if (hi - lo < 1e-13 || Math.abs(fx) < 1e-14) break;
  }
  const x = fl === fh ? 0.5 * (lo + hi) : (lo * fh - hi * fl) / (fh - fl);
  return Math.exp(sgn * x);
}

/** ln |H(jω)|² of a packed cascade at u = ω² (rad²/s²). */
function logMag2AtU(c: ArrayLike<number>, n: number, u: number): number {
  let m = 1;
  for (let k = 0; k < n; k++) {
    const o = 5 * k;
    const nr = c[o] - c[o + 2] * u, dr = 1 - c[o + 4] * u;
    const b1 = c[o + 1], a1 = c[o + 3];
    m *= (nr * nr + b1 * b1 * u) / (dr * dr + a1 * a1 * u);
  }
  return Math.log(m);
}

/**
 * Fast edge finder on the section polynomials: the ω (rad/s) where |H(jω)|²/|H_ref|² = level,
 * next to the guess on the stopband side (as findEdge), solved in u = ω² where each section's
 * |N|² = (b0 − b2·u)² + b1²·u and |D|² = (1 − a2·u)² + a1²·u are quadratics: a bracket scan in
 * steps of 2 % in u, then the Illinois iteration on ln|H|² to a relative width of 1e-12.
 *
 * @param kind low-pass (falling edge) or high-pass (rising edge)
 * @param c packed coefficients (5 per section); @param n number of sections
 * @param level ratio to the passband reference, e.g. 0.5; @param guess rad/s
 * @param slope optional d ln|H|²/d ln u at the edge of a similar (nominal) design: a Newton step
 *   from the guess then brackets the crossing in about two evaluations (Monte Carlo trials)
 * @returns rad/s, NaN when no crossing is found
 */
export function polynomialEdge(kind: "lowpass" | "highpass", c: ArrayLike<number>, n: number, level: number, guess: number, slope?: number): number {
  const target = Math.log(cascadeReferenceMag2(kind, c, n) * level);
  if (slope !== undefined && slope !== 0 && Number.isFinite(slope)) {
    const u0 = guess * guess;
    const g0 = logMag2AtU(c, n, u0) - target;
    if (Number.isFinite(g0)) {
      const u1 = u0 * Math.exp(-g0 / slope) * (g0 >= 0 === slope < 0 ? 1.0005 : 1 / 1.0005);
      const g1 = logMag2AtU(c, n, u1) - target;
      if (g0 >= 0 !== g1 >= 0 && Number.isFinite(g1)) return illinois(c, n, target, g0 >= 0 ? u0 : u1, g0 >= 0 ? g0 : g1, g0 >= 0 ? u1 : u0, g0 >= 0 ? g1 : g0);
    }
  }
  // "up" = direction from the passband into the stopband, in u
  const up = kind === "lowpass" ? 1.02 : 1 / 1.02;
  let a = guess * guess; // inside (g ≥ 0)
  let ga = (logMag2AtU(c, n, a) - target);
  if (Number.isNaN(ga)) return NaN;
  let b: number, gb: number;
  if (ga >= 0) {
    b = a * up; gb = (logMag2AtU(c, n, b) - target);
    for (let i = 0; i < 2000 && gb >= 0; i++) {
      a = b; ga = gb;
      b = i < 40 ? b * up : b * up ** 8;
      gb = (logMag2AtU(c, n, b) - target);
    }
    if (!(gb < 0)) return NaN;
  } else {
    b = a; gb = ga;
    a = b / up; ga = (logMag2AtU(c, n, a) - target);
    for (let i = 0; i < 2000 && ga < 0; i++) {
      b = a; gb = ga;
      a = i < 40 ? a / up : a / up ** 8;
      ga = (logMag2AtU(c, n, a) - target);
    }
    if (!(ga >= 0) || !Number.isFinite(ga)) return NaN;
  }
  return illinois(c, n, target, a, ga, b, gb);
}

/** Illinois iteration in u on [a, b] with g(a) ≥ 0 > g(b); returns ω = √u, rad/s. */
function illinois(c: ArrayLike<number>, n: number, target: number, a: number, ga: number, b: number, gb: number): number {
  let side = 0;
  for (let i = 0; i < 100; i++) {
    const x = ga === gb ? 0.5 * (a + b) : (a * gb - b * ga) / (gb - ga);
    const gx = (logMag2AtU(c, n, x) - target);
    if (!Number.isFinite(gx)) return NaN;
    if (gx >= 0) {
      a = x; ga = gx;
      if (side === 1) gb /= 2;
      side = 1;
    } else {
      b = x; gb = gx;
      if (side === -1) ga /= 2;
      side = -1;
    }
    if (Math.abs(b - a) < 1e-11 * a || gx === 0) break;
  }
  return Math.sqrt(ga === gb ? 0.5 * (a + b) : (a * gb - b * ga) / (gb - ga));
}

/** Packed ideal coefficients of a design (5 per section). */
export function packedCoefficients(design: FilterDesign): Float64Array {
  const c = new Float64Array(5 * design.sections.length);
  design.sections.forEach((s, k) => c.set(s.coefficients, 5 * k));
  return c;
}

/**
 * −3.0103 dB frequency (Hz) of a low- or high-pass design from its ideal section polynomials,
 * relative to the passband reference (DC / ∞). For a band-pass design: its centre frequency.
 */
export function minus3dBFrequency(design: FilterDesign, c: ArrayLike<number> = packedCoefficients(design)): number {
  const n = design.sections.length;
  if (design.kind === "bandpass") return 1 / (TWO_PI * Math.sqrt(c[4]));
  return polynomialEdge(design.kind, c, n, 0.5, TWO_PI * design.targetFrequency) / TWO_PI;
}

/**
 * Achieved Chebyshev ripple-band edge (Hz): where the response last leaves the ripple band,
 * |H| = reference (even orders, DC at the ripple bottom) or reference − ripple (odd orders).
 */
export function rippleEdgeFrequency(design: FilterDesign, rippleDb: number, c: ArrayLike<number> = packedCoefficients(design)): number {
  const n = design.sections.length;
  if (design.kind === "bandpass") return NaN;
  const order = design.prototype?.order ?? 1;
  const level = order % 2 === 1 ? 10 ** (-rippleDb / 10) : 1 - 1e-12;
  return polynomialEdge(design.kind, c, n, level, TWO_PI * design.targetRippleEdge) / TWO_PI;
}

/** Response of a design over a sweep. */
export interface SweepResponse {
  /** Frequencies, Hz. */
  f: number[];
  /** |H|, V/V. */
  mag: number[];
  /** 20·log10|H|, dB. */
  db: number[];
  /** Unwrapped phase, degrees. */
  phase: number[];
  /** Group delay −dφ/dω, s. */
  delay: number[];
  /** |H| at the output of each section (cumulative), V/V: perSection[k][i]. */
  perSection: number[][];
}

/**
 * Evaluate a design over frequencies f (Hz) with an op-amp model, from the chosen component
 * values (or the given values). The ideal model with the design's own values is evaluated from
 * the section polynomials (group delay analytically); any other case by nodal analysis per section
 * (sections are driven by ideal op-amp outputs, so they do not load each other), with the group
 * delay from the exact derivative of the nodal solution (mna.ts solveWithDerivative).
 */
export function sweepResponse(design: FilterDesign, f: readonly number[], model: OpAmpModel, values: ArrayLike<number> = design.values): SweepResponse {
  const out: SweepResponse = { f: [...f], mag: [], db: [], phase: [], delay: [], perSection: design.sections.map(() => []) };
  const n = design.sections.length;
  // ideal op-amp with the design's own values: exact from the section polynomials (group delay
  // analytically, τ = Re(D'/D) − Re(N'/N) at s = jω); otherwise nodal analysis per section
  const usePolynomials = model.kind === "ideal" && values === design.values;
  const solvers = usePolynomials ? [] : design.sections.map((s) => compileCircuit(sectionCircuit(design, s, values), model));
  const c = packedCoefficients(design);
  let prevPhase = 0;
  let unwrap = 0;
  f.forEach((fi, i) => {
    const w = TWO_PI * fi;
    let re = 1, im = 0;
    let tau = 0;
    for (let k = 0; k < n; k++) {
      let a: number, b: number;
      if (usePolynomials) {
        const o = 5 * k;
        const nr = c[o] - c[o + 2] * w * w, ni = c[o + 1] * w;
        const dr = 1 - c[o + 4] * w * w, di = c[o + 3] * w;
        const dd = dr * dr + di * di;
        a = (nr * dr + ni * di) / dd;
        b = (ni * dr - nr * di) / dd;
        // derivatives d/dω of N(jω), D(jω): N' = j·b1 − 2·b2·ω, D' = j·a1 − 2·a2·ω
        const npr = -2 * c[o + 2] * w, npi = c[o + 1];
        const dpr = -2 * c[o + 4] * w, dpi = c[o + 3];
        // −d arg H/dω = −Im(N'/N) + Im(D'/D)
        const nn = nr * nr + ni * ni;
        const imN = nn > 0 ? (npi * nr - npr * ni) / nn : 0;
        const imD = (dpi * dr - dpr * di) / dd;
        tau += imD - imN;
      } else {
        const [hr, hi, dr, di] = solvers[k].solveWithDerivative(w);
        a = hr;
        b = hi;
        // τ = −d arg H/dω = −Im(H'/H)
        const hh = hr * hr + hi * hi;
        if (hh > 0) tau -= (di * hr - dr * hi) / hh;
      }
      const nr2 = re * a - im * b;
      im = re * b + im * a;
      re = nr2;
      out.perSection[k].push(Math.hypot(re, im));
    }
    const mag = Math.hypot(re, im);
    let ph = (Math.atan2(im, re) * 180) / Math.PI;
    if (i > 0) {
      while (ph + unwrap - prevPhase > 180) unwrap -= 360;
      while (ph + unwrap - prevPhase < -180) unwrap += 360;
    }
    ph += unwrap;
    prevPhase = ph;
    out.mag.push(mag);
    out.db.push(20 * Math.log10(Math.max(mag, 1e-300)));
    out.phase.push(ph);
    out.delay.push(tau);
  });
  return out;
}

/** Complex response [re, im] of the whole design at one frequency f (Hz) with an op-amp model. */
export function responseAt(design: FilterDesign, fHz: number, model: OpAmpModel, values: ArrayLike<number> = design.values): [number, number] {
  const sv = compileCircuit(designCircuit(design, values), model);
  return sv.solve(TWO_PI * fHz);
}

/** |H(j2πf)| (V/V) of the design with a model, as a function for repeated use. */
export function magnitudeFunction(design: FilterDesign, model: OpAmpModel, values: ArrayLike<number> = design.values): (fHz: number) => number {
  const solvers = design.sections.map((s) => compileCircuit(sectionCircuit(design, s, values), model));
  return (fHz: number) => {
    let m = 1;
    for (const sv of solvers) {
      const [a, b] = sv.solve(TWO_PI * fHz);
      m *= Math.hypot(a, b);
    }
    return m;
  };
}

/**
 * −3.0103 dB frequency (Hz) of a low- or high-pass design with an op-amp model, by nodal
 * analysis. Reference: for a low-pass the response at f_target/10,000 (DC within the model); for a
 * high-pass the ideal high-frequency gain |H(∞)| of the chosen values, because a finite-GBW
 * op-amp closes the passband at high frequency. NaN when no crossing is found.
 */
export function minus3dBFrequencyWithModel(design: FilterDesign, model: OpAmpModel): number {
  if (design.kind === "bandpass") return NaN;
  const mag = magnitudeFunction(design, model);
  const ref = design.kind === "lowpass" ? mag(design.targetFrequency * 1e-4) : Math.sqrt(cascadeReferenceMag2("highpass", packedCoefficients(design), design.sections.length));
  const guess = minus3dBFrequency(design);
  return findEdge((w) => (mag(w / TWO_PI) / ref) ** 2, 0.5, TWO_PI * guess, design.kind === "lowpass") / TWO_PI;
}
