/**
 * The op-amp's small-signal model shared by the amplifier pack: a dominant pole
 * A(s) = A0 / (1 + s/ωp), ωp = 2π·GBW/A0, optionally followed by a second pole from the
 * open-loop output resistance and the load capacitance, f2 = 1 / (2π·Ro·CL).
 *
 * References: S. Franco, Design with Operational Amplifiers and Analog Integrated Circuits,
 * 4th ed., McGraw-Hill 2015, ch. 6 (closed-loop response, dominant-pole model) and ch. 8
 * (stability, phase margin, capacitive load, second-order equivalence).
 */

/** Open-loop and feedback description of a stage. Frequencies in Hz. */
export interface LoopModel {
  /** Open-loop DC gain A0, V/V. */
  a0: number;
  /** Dominant pole fp = GBW / A0, Hz. */
  fp: number;
  /** Second pole from Ro and CL, Hz; Infinity when there is none. */
  f2: number;
  /** Noise gain 1/β, V/V. */
  noiseGain: number;
  /** Ideal signal gain (sign included: negative for inverting), V/V. */
  idealGain: number;
}

/** Closed-loop response at f (Hz): magnitude (V/V) and phase (degrees, unwrapped from the ideal sign). */
export function closedLoopAt(m: LoopModel, f: number): { mag: number; phaseDeg: number } {
  // A(jf) = A0 / ((1 + j f/fp)(1 + j f/f2)); A_CL = G / (1 + NG / A)
  // 1 + NG/A = 1 + (NG/A0)(1 + j x)(1 + j y), x = f/fp, y = f/f2
  const x = f / m.fp;
  const y = Number.isFinite(m.f2) ? f / m.f2 : 0;
  const k = m.noiseGain / m.a0;
  // (1 + jx)(1 + jy) = (1 − xy) + j(x + y)
  const re = 1 + k * (1 - x * y);
  const im = k * (x + y);
  const den = Math.hypot(re, im);
  const mag = Math.abs(m.idealGain) / den;
  const base = m.idealGain < 0 ? 180 : 0;
  const phaseDeg = base - (Math.atan2(im, re) * 180) / Math.PI;
  return { mag, phaseDeg };
}

/**
 * Loop-gain crossover frequency: |T(fc)| = 1 with T = (A0/NG) / ((1 + jf/fp)(1 + jf/f2)).
 * Solved as a quadratic in f² (numerically stable form). Returns NaN when |T(0)| ≤ 1.
 */
export function crossover(m: LoopModel): number {
  const t0 = m.a0 / m.noiseGain;
  if (!(t0 > 1)) return NaN;
  const c = t0 * t0 - 1;
  if (!Number.isFinite(m.f2)) return m.fp * Math.sqrt(c);
  const a = 1 / (m.fp * m.fp * m.f2 * m.f2);
  const b = 1 / (m.fp * m.fp) + 1 / (m.f2 * m.f2);
  const x = (2 * c) / (b + Math.sqrt(b * b + 4 * a * c));
  return Math.sqrt(x);
}

/** Phase margin at the crossover, degrees: 180° − atan(fc/fp) − atan(fc/f2). */
export function phaseMargin(m: LoopModel, fc: number): number {
  const p2 = Number.isFinite(m.f2) ? Math.atan(fc / m.f2) : 0;
  return 180 - ((Math.atan(fc / m.fp) + p2) * 180) / Math.PI;
}

/**
 * Second-order equivalence of the two-pole loop: the closed loop has
 * ωn² = ωp·ω2·(1 + T0) and ζ = (ωp + ω2) / (2·√(ωp·ω2·(1 + T0))).
 * Peaking Mp = 1 / (2ζ√(1 − ζ²)) for ζ < 1/√2, overshoot = exp(−πζ/√(1 − ζ²)) for ζ < 1.
 */
export function secondOrder(m: LoopModel): { zeta: number; fn: number; peakingDb: number; overshoot: number } {
  const t0 = m.a0 / m.noiseGain;
  const zeta = (m.fp + m.f2) / (2 * Math.sqrt(m.fp * m.f2 * (1 + t0)));
  const fn = Math.sqrt(m.fp * m.f2 * (1 + t0));
  const peaking = zeta < Math.SQRT1_2 ? 1 / (2 * zeta * Math.sqrt(1 - zeta * zeta)) : 1;
  const overshoot = zeta < 1 ? Math.exp((-Math.PI * zeta) / Math.sqrt(1 - zeta * zeta)) : 0;
  return { zeta, fn, peakingDb: 20 * Math.log10(peaking), overshoot };
}

/**
 * Phase margin of an ideal two-pole loop (T0 → ∞) with damping ζ, the textbook relation
 * PM = atan(2ζ / √(√(1 + 4ζ⁴) − 2ζ²)), degrees. Used to cross-check the direct computation.
 */
export function phaseMarginFromZeta(zeta: number): number {
  return (Math.atan((2 * zeta) / Math.sqrt(Math.sqrt(1 + 4 * zeta ** 4) - 2 * zeta * zeta)) * 180) / Math.PI;
}

/**
 * The lowest second-pole frequency f2 ≥ fp (Hz) that still leaves a phase margin of at least
 * `pmTargetDeg`, found by bisection in log f2. Above fp the phase margin grows with f2. (Below
 * fp the roles of the poles swap and a very large CL can be stable again; that branch is not
 * searched, since a design should not rely on it.) The largest load capacitance is then
 * CL,max = 1 / (2π·R·f2) for the resistance R that forms the pole with CL.
 * @param m the loop without its second pole (m.f2 is ignored)
 * @param pmTargetDeg phase margin target, degrees (below the single-pole margin)
 * @returns f2 in Hz, or NaN when the loop has no crossover (|T(0)| ≤ 1) or the target holds
 *   even with f2 = fp (no limit on this branch)
 */
export function lowestSecondPole(m: LoopModel, pmTargetDeg: number): number {
  if (!(m.a0 / m.noiseGain > 1)) return NaN;
  const pmAt = (f2: number) => {
    const mm = { ...m, f2 };
    return phaseMargin(mm, crossover(mm));
  };
  let lo = Math.log(m.fp);
  let hi = Math.log(Math.max(m.fp, (m.fp * m.a0) / m.noiseGain) * 1e6);
  if (pmAt(Math.exp(lo)) >= pmTargetDeg || pmAt(Math.exp(hi)) < pmTargetDeg) return NaN;
  for (let i = 0; i < 80; i++) {
    const mid = (lo + hi) / 2;
    if (pmAt(Math.exp(mid)) >= pmTargetDeg) hi = mid;
    else lo = mid;
  }
  return Math.exp(hi);
}
