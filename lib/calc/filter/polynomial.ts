/**
 * Small polynomial helpers for the filter prototypes: complex arithmetic on [re, im] pairs,
 * polynomial evaluation and all roots of a real polynomial by the Aberth–Ehrlich iteration.
 *
 * Pure numerics, no units. Coefficients are in ascending powers: c[0] + c[1]·s + … + c[n]·sⁿ.
 *
 * References:
 * [1] O. Aberth, "Iteration methods for finding all zeros of a polynomial simultaneously",
 *     Math. Comp. 27 (1973) 339–344.
 * [2] L. W. Ehrlich, "A modified Newton method for polynomials", Comm. ACM 10 (1967) 107–108.
 */

/** A complex number as [real, imaginary]. */
export type Cx = readonly [number, number];

/** Complex product a·b. */
export function cmul(a: Cx, b: Cx): Cx {
  return [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]];
}

/** Complex quotient a/b. */
export function cdiv(a: Cx, b: Cx): Cx {
  const d = b[0] * b[0] + b[1] * b[1];
  return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d];
}

/** Value and first derivative of a real polynomial (ascending coefficients) at complex z. */
export function polyEvalWithDerivative(c: readonly number[], z: Cx): { p: Cx; dp: Cx } {
  let p: Cx = [c[c.length - 1], 0];
  let dp: Cx = [0, 0];
  for (let k = c.length - 2; k >= 0; k--) {
    dp = [dp[0] * z[0] - dp[1] * z[1] + p[0], dp[0] * z[1] + dp[1] * z[0] + p[1]];
    p = [p[0] * z[0] - p[1] * z[1] + c[k], p[0] * z[1] + p[1] * z[0]];
  }
  return { p, dp };
}

/**
 * All complex roots of a real polynomial c[0] + c[1]·s + … + c[n]·sⁿ (c[n] ≠ 0) by the
 * Aberth–Ehrlich simultaneous iteration [1], [2], started on a circle of the Cauchy-bound radius.
 * Converges cubically for simple roots; the filter prototypes (n ≤ 8) have only simple roots.
 *
 * @param c ascending coefficients, length n + 1, n ≥ 1
 * @returns n roots as [re, im], in no particular order
 * @example polyRoots([2, 3, 1]) // ≈ [[-1, 0], [-2, 0]]
 */
export function polyRoots(c: readonly number[]): Cx[] {
  const n = c.length - 1;
  if (n < 1) return [];
  const lead = c[n];
  const monic = c.map((v) => v / lead);
  // Cauchy bound on the root moduli
  let radius = 0;
  for (let k = 0; k < n; k++) radius = Math.max(radius, Math.abs(monic[k]));
  radius = Math.min(1 + radius, 1e6);
  const z: Cx[] = [];
  for (let k = 0; k < n; k++) {
    const a = (2 * Math.PI * k) / n + 0.4; // offset keeps starts off the real axis
    z.push([radius * 0.5 * Math.cos(a), radius * 0.5 * Math.sin(a)]);
  }
  for (let iter = 0; iter < 500; iter++) {
    let maxStep = 0;
    for (let i = 0; i < n; i++) {
      const { p, dp } = polyEvalWithDerivative(monic, z[i]);
      if (p[0] === 0 && p[1] === 0) continue;
      const ratio = cdiv(p, dp); // Newton correction p/p'
      let sum: Cx = [0, 0];
      for (let j = 0; j < n; j++) {
        if (j === i) continue;
        const inv = cdiv([1, 0], [z[i][0] - z[j][0], z[i][1] - z[j][1]]);
        sum = [sum[0] + inv[0], sum[1] + inv[1]];
      }
      const denom: Cx = [1 - (ratio[0] * sum[0] - ratio[1] * sum[1]), -(ratio[0] * sum[1] + ratio[1] * sum[0])];
      const step = cdiv(ratio, denom);
      z[i] = [z[i][0] - step[0], z[i][1] - step[1]];
      maxStep = Math.max(maxStep, Math.hypot(step[0], step[1]) / Math.max(1, Math.hypot(z[i][0], z[i][1])));
    }
    if (maxStep < 1e-15) break;
  }
  return z;
}

/**
 * Coefficients (ascending) of the reverse Bessel polynomial θₙ(s) = Σₖ aₖ sᵏ with
 * aₖ = (2n − k)! / (2ⁿ⁻ᵏ · k! · (n − k)!), the denominator of the Bessel–Thomson filter
 * H(s) = θₙ(0)/θₙ(s) (maximally flat group delay, delay 1 s at DC).
 *
 * Reference: W. E. Thomson, "Delay networks having maximally flat frequency characteristics",
 * Proc. IEE 96 (1949) 487–490; the closed form of aₖ is the usual one for θₙ.
 * @example reverseBesselPolynomial(2) // [3, 3, 1]
 */
export function reverseBesselPolynomial(n: number): number[] {
  const fact = (m: number): number => {
    let f = 1;
    for (let i = 2; i <= m; i++) f *= i;
    return f;
  };
  const c: number[] = [];
  for (let k = 0; k <= n; k++) c.push(fact(2 * n - k) / (2 ** (n - k) * fact(k) * fact(n - k)));
  return c;
}
