/**
 * Seeded pseudo-random numbers for the Monte Carlo analysis: xoshiro128** 1.1 (D. Blackman,
 * S. Vigna, "Scrambled linear pseudorandom number generators", ACM TOMS 47 (2021); reference
 * code at the authors' site, 2018), with its 128-bit state filled from the 32-bit seed by
 * SplitMix32 (the seeding its authors recommend, a 32-bit variant of SplitMix64). Normal
 * variates by the Marsaglia polar method (G. Marsaglia, T. A. Bray, SIAM Review 6 (1964) 260–264).
 *
 * The same seed gives the same sequence on every platform (32-bit integer arithmetic only).
 */

/** A seeded generator. */
export interface Prng {
  /** Uniform on [0, 1). */
  next(): number;
  /** Uniform on [−1, 1). */
  symmetric(): number;
  /** Standard normal (mean 0, σ 1). */
  normal(): number;
  /** Fill out with uniform values on [−1, 1) (same sequence as repeated symmetric()). */
  fillSymmetric(out: Float64Array): void;
  /** Fill out with standard normal values (same sequence as repeated normal()). */
  fillNormal(out: Float64Array): void;
}

/** Create a xoshiro128** generator from a 32-bit integer seed. */
export function createPrng(seed: number): Prng {
  let x = seed >>> 0;
  const splitmix32 = (): number => {
    x = (x + 0x9e3779b9) >>> 0;
    let z = x;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    return (z ^ (z >>> 16)) >>> 0;
  };
  let s0 = splitmix32(), s1 = splitmix32(), s2 = splitmix32(), s3 = splitmix32();
  if ((s0 | s1 | s2 | s3) === 0) s0 = 1;
  const nextU32 = (): number => {
    const t = Math.imul(s1, 5);
    const result = Math.imul((t << 7) | (t >>> 25), 9) >>> 0;
    const sh = s1 << 9;
    s2 ^= s0;
    s3 ^= s1;
    s1 ^= s2;
    s0 ^= s3;
    s2 ^= sh;
    s3 = (s3 << 11) | (s3 >>> 21);
    return result;
  };
  let spare: number | null = null;
  const next = (): number => nextU32() / 4294967296;
  const normal = (): number => {
      if (spare !== null) {
        const v = spare;
        spare = null;
        return v;
      }
      let u: number, v: number, s: number;
      do {
        u = 2 * next() - 1;
        v = 2 * next() - 1;
        s = u * u + v * v;
      } while (s >= 1 || s === 0);
      const m = Math.sqrt((-2 * Math.log(s)) / s);
      spare = v * m;
      return u * m;
  };
  return {
    next,
    symmetric: () => 2 * next() - 1,
    normal,
    fillSymmetric(out: Float64Array) {
      for (let i = 0; i < out.length; i++) {
        const t = Math.imul(s1, 5);
        const r = Math.imul((t << 7) | (t >>> 25), 9) >>> 0;
        const sh = s1 << 9;
        s2 ^= s0;
        s3 ^= s1;
        s1 ^= s2;
        s0 ^= s3;
        s2 ^= sh;
        s3 = (s3 << 11) | (s3 >>> 21);
        out[i] = (2 * r) / 4294967296 - 1;
      }
    },
    fillNormal(out: Float64Array) {
      for (let i = 0; i < out.length; i++) out[i] = normal();
    },
  };
}
