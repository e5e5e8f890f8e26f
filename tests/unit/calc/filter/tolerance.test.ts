/**
 * Tolerance analysis against closed forms.
 * A first-order RC low-pass (buffered) has f = 1/(2π·R·C). With R = R₀(1 + t_R·u), C = C₀(1 + t_C·v),
 * u, v independent uniform on [−1, 1]:
 *   E[1/(1 + t·u)] = ln((1 + t)/(1 − t))/(2t),  E[1/(1 + t·u)²] = 1/(1 − t²)   (elementary integrals)
 * so the mean and variance of f are known exactly, and the worst case is f₀/((1 ± t_R)(1 ± t_C)).
 * Monte Carlo tolerance: 4 standard errors of the mean (σ/√N) and, for σ, 4·σ·√(1/(2N)).
 */
import { describe, expect, it } from "vitest";
import { designFilter, type ValuePicker } from "@/lib/calc/filter/design";
import { figureStats, monteCarlo, runMonteCarlo, worstCase, PERCENTILES } from "@/lib/calc/filter/tolerance";
import { createPrng } from "@/lib/calc/filter/prng";
import { seriesPicker } from "@/lib/calc/filter/compute";

const exact: ValuePicker = { capSeries: "exact", resSeries: "exact", capNearest: (x) => x, capAtLeast: (x) => x, resNearest: (x) => x };
const tR = 0.05, tC = 0.2;
const rc = designFilter({ kind: "lowpass", family: "butterworth", order: 1, cutoff: 1000, topology: "sk-unity", firstOrder: "rc-buffer", gain: 1, gainSharing: "equal", resistorLevel: 10e3, picker: exact, resistorTolerance: tR, capacitorTolerance: tC });
const e1 = (t: number) => Math.log((1 + t) / (1 - t)) / (2 * t);
const e2 = (t: number) => 1 / (1 - t * t);

describe("Monte Carlo, uniform, against the closed form of a first-order RC", () => {
  const N = 100_000;
  const mc = monteCarlo(rc, { trials: N, seed: 42, distribution: "uniform" });
  const mean = 1000 * e1(tR) * e1(tC);
  const variance = 1000 ** 2 * e2(tR) * e2(tC) - mean ** 2;
  it("mean of the −3 dB frequency within 4 standard errors", () => {
    expect(Math.abs(mc.frequency.mean - mean)).toBeLessThan((4 * Math.sqrt(variance)) / Math.sqrt(N));
  });
  it("standard deviation within 4·σ·√(1/(2N))", () => {
    expect(Math.abs(mc.frequency.std / Math.sqrt(variance) - 1)).toBeLessThan(4 * Math.sqrt(1 / (2 * N)));
  });
  it("extremes stay inside the worst case and the worst case is exact", () => {
    const wc = worstCase(rc);
    expect(wc.method).toBe("corners");
    expect(wc.frequency.min).toBeCloseTo(1000 / ((1 + tR) * (1 + tC)), 9);
    expect(wc.frequency.max).toBeCloseTo(1000 / ((1 - tR) * (1 - tC)), 9);
    expect(mc.frequency.min).toBeGreaterThanOrEqual(wc.frequency.min);
    expect(mc.frequency.max).toBeLessThanOrEqual(wc.frequency.max);
    expect(wc.sections[0].f0.min).toBeCloseTo(wc.frequency.min, 9);
  });
});

describe("Monte Carlo, normal (σ = tolerance/3)", () => {
  it("mean matches the second-order expansion E[1/(1+x)] ≈ 1 + σ² + 3σ⁴ and σ(f)/f ≈ √(σR² + σC²)", () => {
    const N = 100_000;
    const mc = monteCarlo(rc, { trials: N, seed: 7, distribution: "normal" });
    const sR = tR / 3, sC = tC / 3;
    const m = (s: number) => 1 + s * s + 3 * s ** 4; // truncation error 15σ⁶ < 2e-7 here
    const mean = 1000 * m(sR) * m(sC);
    const sd = 1000 * Math.sqrt(sR ** 2 + sC ** 2); // first order; the higher terms add < 2 %
    expect(Math.abs(mc.frequency.mean - mean)).toBeLessThan((4 * sd) / Math.sqrt(N) + 1e-3);
    expect(Math.abs(mc.frequency.std / sd - 1)).toBeLessThan(0.03);
  });
});

describe("Monte Carlo API", () => {
  const d8 = designFilter({ kind: "lowpass", family: "chebyshev", rippleDb: 0.5, order: 8, cutoff: 1000, topology: "sk-unity", firstOrder: "rc-buffer", gain: 1, gainSharing: "equal", resistorLevel: 10e3, picker: seriesPicker("E12", "E96"), resistorTolerance: 0.01, capacitorTolerance: 0.02 });
  it("is reproducible for a seed and differs between seeds", () => {
    const a = monteCarlo(d8, { trials: 500, seed: 3, distribution: "uniform" });
    const b = monteCarlo(d8, { trials: 500, seed: 3, distribution: "uniform" });
    const c = monteCarlo(d8, { trials: 500, seed: 4, distribution: "uniform" });
    expect(a).toEqual(b);
    expect(a.frequency.mean).not.toBe(c.frequency.mean);
  });
  it("runMonteCarlo gives the same numbers in chunks, reports progress and yields", async () => {
    const seen: Array<[number, number]> = [];
    const r = await runMonteCarlo(d8, { trials: 5000, seed: 9, distribution: "normal" }, { chunkSize: 1000, onProgress: (d, t) => seen.push([d, t]) });
    expect(r).toEqual(monteCarlo(d8, { trials: 5000, seed: 9, distribution: "normal" }));
    expect(seen).toEqual([1000, 2000, 3000, 4000, 5000].map((d) => [d, 5000]));
  });
  it("can be cancelled with an AbortSignal", async () => {
    const ctl = new AbortController();
    const p = runMonteCarlo(d8, { trials: 100_000, seed: 1, distribution: "uniform" }, { chunkSize: 1000, signal: ctl.signal, onProgress: (d) => d >= 2000 && ctl.abort() });
    await expect(p).rejects.toThrow(/abort/i);
  });
  it("caps the trial count at 100,000", () => {
    expect(monteCarlo(rc, { trials: 250_000, seed: 1, distribution: "uniform" }).trials).toBe(100_000);
  });
  it("uses sensitivity-directed corners beyond 12 parts; for a monotonic (Butterworth) response they bound the Monte Carlo", () => {
    // (For ripple responses the −3 dB point can jump when a ripple valley sags below −3 dB, so
    // there the corners are only an estimate; the module doc says so.)
    const bw8 = designFilter({ kind: "lowpass", family: "butterworth", order: 8, cutoff: 1000, topology: "sk-unity", firstOrder: "rc-buffer", gain: 1, gainSharing: "equal", resistorLevel: 10e3, picker: seriesPicker("E12", "E96"), resistorTolerance: 0.01, capacitorTolerance: 0.02 });
    const wc = worstCase(bw8);
    expect(worstCase(d8).method).toBe("sensitivity");
    expect(wc.method).toBe("sensitivity");
    const mc = monteCarlo(bw8, { trials: 20_000, seed: 2, distribution: "uniform" });
    expect(wc.frequency.min).toBeLessThanOrEqual(mc.frequency.min);
    expect(wc.frequency.max).toBeGreaterThanOrEqual(mc.frequency.max);
  });
});

describe("statistics", () => {
  it("percentiles by selection equal the sorted-array definition (linear interpolation, R type 7)", () => {
    const rng = createPrng(123);
    for (const n of [1, 2, 3, 10, 101, 5000]) {
      const x = Float64Array.from({ length: n }, () => rng.normal());
      const st = figureStats(x, n, 0, "");
      const s = Array.from(x).sort((a, b) => a - b);
      PERCENTILES.forEach((p, i) => {
        const h = (n - 1) * p, k = Math.floor(h);
        const v = s[k] + (h - k) * ((s[Math.min(n - 1, k + 1)]) - s[k]);
        expect(st.percentiles[i].value).toBeCloseTo(v, 12);
      });
      expect(st.histogram.counts.reduce((a, b) => a + b, 0)).toBe(n);
      expect(st.min).toBe(s[0]);
      expect(st.max).toBe(s[n - 1]);
    }
  });
  it("the generator's uniform and normal draws have the right moments (4 standard errors)", () => {
    const rng = createPrng(99);
    const N = 200_000;
    const u = new Float64Array(N), z = new Float64Array(N);
    rng.fillSymmetric(u);
    rng.fillNormal(z);
    const mean = (a: Float64Array) => a.reduce((s, v) => s + v, 0) / a.length;
    const varOf = (a: Float64Array) => { const m = mean(a); return a.reduce((s, v) => s + (v - m) ** 2, 0) / (a.length - 1); };
    expect(Math.abs(mean(u))).toBeLessThan(4 * Math.sqrt(1 / 3 / N)); // var of U(−1,1) = 1/3
    expect(Math.abs(varOf(u) - 1 / 3)).toBeLessThan(4 * Math.sqrt(4 / 45 / N)); // var(u²) = 1/5 − 1/9
    expect(Math.abs(mean(z))).toBeLessThan(4 / Math.sqrt(N));
    expect(Math.abs(varOf(z) - 1)).toBeLessThan(4 * Math.sqrt(2 / N));
  });
});
