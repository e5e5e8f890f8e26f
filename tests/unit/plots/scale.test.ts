// Scales and ticks of the sheet's plots. Expected values follow from the definitions (the 1-2-5
// step sequence and decade grids are common practice, no source; SI decades are exact).
import { describe, expect, it } from "vitest";
import { extent, linearTicks, logDomain, logTicks, makeScale, niceLinearDomain, niceStep, stepKindFor } from "@/app/_components/plots/scale";

describe("niceStep", () => {
  it("rounds up to 1, 2 or 5 × 10ⁿ", () => {
    expect(niceStep(0.23)).toBe(0.5);
    expect(niceStep(1)).toBe(1);
    expect(niceStep(1.01)).toBe(2);
    expect(niceStep(2)).toBe(2);
    expect(niceStep(7)).toBe(10);
    expect(niceStep(0.0031)).toBe(0.005);
    expect(niceStep(3.2e6)).toBe(5e6);
  });
  it("uses angle steps for degrees and 20/40/60 dB steps for decibels above 10", () => {
    expect(niceStep(36, "angle")).toBe(45);
    expect(niceStep(54, "angle")).toBe(90);
    expect(niceStep(18, "angle")).toBe(30);
    expect(niceStep(4, "angle")).toBe(5); // below 10 the 1-2-5 sequence again
    expect(niceStep(32, "dB")).toBe(40);
    expect(niceStep(45, "dB")).toBe(60);
    expect(niceStep(3, "dB")).toBe(5);
    expect(stepKindFor("°")).toBe("angle");
    expect(stepKindFor("dB")).toBe("dB");
    expect(stepKindFor("s")).toBe("decimal");
  });
  it("refuses steps that are not positive and finite", () => {
    expect(niceStep(0)).toBeNaN();
    expect(niceStep(-1)).toBeNaN();
    expect(niceStep(Infinity)).toBeNaN();
    expect(niceStep(NaN)).toBeNaN();
  });
});

describe("linearTicks", () => {
  it("gives exact decimal ticks without floating-point noise", () => {
    expect(linearTicks(0, 1, 5)).toEqual({ step: 0.2, ticks: [0, 0.2, 0.4, 0.6, 0.8, 1] });
    // 0.1 + 0.2 style noise would show as 0.6000000000000001
    expect(linearTicks(-0.3, 0.7, 5).ticks).toEqual([-0.2, 0, 0.2, 0.4, 0.6]);
  });
  it("never yields −0", () => {
    expect(linearTicks(-1, 1, 4).ticks).toEqual([-1, -0.5, 0, 0.5, 1]);
    // a low end a hair below zero makes Math.ceil return −0 for the first multiple
    const t = linearTicks(-1e-12, 1, 2).ticks;
    expect(t).toEqual([0, 0.5, 1]);
    expect(Object.is(t[0], 0)).toBe(true);
  });
  it("gives no ticks for an interval it cannot tick", () => {
    expect(linearTicks(NaN, 1).ticks).toEqual([]);
    expect(linearTicks(1, 1).ticks).toEqual([]);
  });
});

describe("niceLinearDomain", () => {
  it("widens to the enclosing ticks", () => {
    // range 127.3 dB over 4 intervals → 31.8 → 40 dB steps: −160 … 0
    expect(niceLinearDomain(-127.3, -0.5, 4, "dB").domain).toEqual([-160, 0]);
    // 270° over 5 intervals → 54 → 90° steps
    const ph = niceLinearDomain(-265, 0, 5, "angle");
    expect(ph.domain).toEqual([-270, 0]);
    expect(ph.ticks).toEqual([-270, -180, -90, 0]);
  });
  it("does not add a whole step for data a hair beyond a tick", () => {
    // a passband 0.0003 dB above 0 dB is within the 1.5 % slack of a 160 dB span
    expect(niceLinearDomain(-127.3, 0.0003, 4, "dB").domain).toEqual([-160, 0]);
    // 5 dB above is not
    expect(niceLinearDomain(-127.3, 5, 4, "dB").domain).toEqual([-160, 40]);
  });
  it("gives a single value room", () => {
    expect(niceLinearDomain(0, 0).domain).toEqual([-1, 1]);
    const d = niceLinearDomain(5, 5).domain;
    expect(d[0]).toBeLessThan(5);
    expect(d[1]).toBeGreaterThan(5);
  });
  it("survives values near the largest double", () => {
    const r = niceLinearDomain(-1e308, 1e308);
    expect(Number.isFinite(r.domain[0]) && Number.isFinite(r.domain[1])).toBe(true);
    expect(r.domain[0]).toBeLessThan(r.domain[1]);
  });
});

describe("logTicks", () => {
  it("puts a major tick on every decade and minors on 2…9 × 10ⁿ", () => {
    const t = logTicks(10, 1e7);
    const majors = t.filter((x) => x.major).map((x) => x.value);
    expect(majors).toEqual([10, 100, 1000, 1e4, 1e5, 1e6, 1e7]);
    // 6 full decades × 8 minors
    expect(t.filter((x) => !x.major)).toHaveLength(48);
    expect(t.filter((x) => !x.major).slice(0, 8).map((x) => x.value)).toEqual([20, 30, 40, 50, 60, 70, 80, 90]);
    expect(t.some((x) => x.value === 9e6)).toBe(true);
    expect(t.filter((x) => x.label).map((x) => x.value)).toEqual(majors);
  });
  it("labels every n-th decade, on multiples of n, when there are many", () => {
    // 7 decades, at most 3 labels → every 3rd decade: 10³ and 10⁶ (1 k, 1 M)
    expect(logTicks(10, 1e7, { maxLabels: 3 }).filter((x) => x.label).map((x) => x.value)).toEqual([1000, 1e6]);
  });
  it("can leave the minors out", () => {
    expect(logTicks(10, 1e4, { minors: false }).map((x) => x.value)).toEqual([10, 100, 1000, 1e4]);
  });
  it("labels 2 and 5 when no or one decade lies inside", () => {
    const t = logTicks(200, 800);
    expect(t.filter((x) => x.label).map((x) => x.value)).toEqual([200, 500]);
    expect(t.map((x) => x.value)).toEqual([200, 300, 400, 500, 600, 700, 800]);
  });
  it("falls back to linear ticks under about half a decade", () => {
    // no decade and no 2…9 × 10ⁿ between 1.1 k and 1.9 k; linear steps of 200
    expect(logTicks(1100, 1900).filter((x) => x.label).map((x) => x.value)).toEqual([1200, 1400, 1600, 1800]);
  });
  it("gives nothing for an interval a log axis cannot show", () => {
    expect(logTicks(0, 10)).toEqual([]);
    expect(logTicks(-1, 10)).toEqual([]);
    expect(logTicks(10, 10)).toEqual([]);
  });
});

describe("scales", () => {
  it("maps decades evenly on a log scale and refuses zero and negatives", () => {
    const s = makeScale("log", [10, 1e7], [0, 600]);
    expect(s.map(10)).toBe(0);
    expect(s.map(1e7)).toBeCloseTo(600, 9);
    expect(s.map(1e4)).toBeCloseTo(300, 9); // 3 of 6 decades
    expect(s.map(0)).toBeNaN();
    expect(s.map(-5)).toBeNaN();
    expect(s.map(NaN)).toBeNaN();
    expect(s.invert(300)).toBeCloseTo(1e4, 6);
  });
  it("maps a linear y scale upside down", () => {
    const s = makeScale("linear", [-160, 40], [200, 0]);
    expect(s.map(40)).toBe(0);
    expect(s.map(-160)).toBe(200);
    expect(s.map(0)).toBe(40);
    expect(s.invert(40)).toBe(0);
  });
  it("skips what cannot be drawn when taking the extent", () => {
    expect(extent([3, NaN, -2, Infinity, 7], "linear")).toEqual([-2, 7]);
    expect(extent([0, -1, 10, 1e6], "log")).toEqual([10, 1e6]);
    expect(extent([NaN, 0], "log")).toBeNull();
  });
  it("gives a single log value half a decade each side", () => {
    const [a, b] = logDomain(1000, 1000);
    expect(Math.log10(a)).toBeCloseTo(2.5, 12);
    expect(Math.log10(b)).toBeCloseTo(3.5, 12);
  });
});
