// Line geometry and read-out lookup. Interpolation in log x is checked against the closed form
// of a straight line in a Bode plot: y = y0 + (y1 − y0) · log10(x/x0) / log10(x1/x0).
import { describe, expect, it } from "vitest";
import { cursorGrid, interpolateAt, isolatedPoints, nearestIndex, pathData, segments, stepCursor } from "@/app/_components/plots/path";
import { makeScale } from "@/app/_components/plots/scale";

const lin = makeScale("linear", [0, 10], [0, 100]);
const linY = makeScale("linear", [0, 10], [100, 0]);

describe("segments and pathData", () => {
  it("break the line at non-finite points", () => {
    const runs = segments([1, 2, 3, 4, 5, 6], [0, 1, NaN, 3, 4, Infinity], lin, linY);
    expect(runs.map((r) => r.length)).toEqual([2, 2]);
    const d = pathData(runs);
    expect(d).toBe("M10 100L20 90M40 70L50 60");
    expect(d.match(/M/g)).toHaveLength(2);
  });
  it("keep lone points as dots, not as empty paths", () => {
    const runs = segments([1, 2, 3], [NaN, 5, NaN], lin, linY);
    expect(pathData(runs)).toBe("");
    expect(isolatedPoints(runs)).toEqual([{ x: 20, y: 50 }]);
  });
  it("drop zero and negative x on a log axis without breaking what follows", () => {
    const lx = makeScale("log", [10, 1000], [0, 200]);
    const runs = segments([0, -1, 10, 100, 1000], [1, 2, 3, 4, 5], lx, linY);
    expect(runs).toHaveLength(1);
    expect(runs[0].map((p) => p.x)).toEqual([0, 100, 200]);
  });
  it("pull far-away points in so the SVG never gets absurd coordinates", () => {
    const runs = segments([1, 2], [1, 1e300], lin, linY);
    expect(Math.abs(runs[0][1].y)).toBe(1e5);
  });
  it("handle empty and mismatched arrays", () => {
    expect(segments([], [], lin, linY)).toEqual([]);
    expect(segments([1, 2, 3], [1], lin, linY)).toEqual([[{ x: 10, y: 90 }]]);
  });
});

describe("nearestIndex", () => {
  it("measures distance in ratio on a log axis", () => {
    // 40 is nearer 100 in ratio (2.5×) than 10 (4×), but nearer 10 in difference
    expect(nearestIndex([10, 100, 1000], 40, "log")).toBe(1);
    expect(nearestIndex([10, 100, 1000], 40, "linear")).toBe(0);
  });
  it("skips samples that cannot be drawn and answers −1 when none can", () => {
    expect(nearestIndex([0, -5, 100], 1, "log")).toBe(2);
    expect(nearestIndex([0, -5], 1, "log")).toBe(-1);
    expect(nearestIndex([1, 2], NaN, "linear")).toBe(-1);
  });
});

describe("interpolateAt", () => {
  it("interpolates linearly in log x on a log axis", () => {
    // halfway in log between 10 and 100 is 10^1.5 = 31.62…; y halfway = 10
    expect(interpolateAt([10, 100], [0, 20], 10 ** 1.5, "log")).toBeCloseTo(10, 12);
    // at 55: 20 · log10(5.5) = 14.8072…
    expect(interpolateAt([10, 100], [0, 20], 55, "log")).toBeCloseTo(20 * Math.log10(5.5), 12);
  });
  it("interpolates linearly in x on a linear axis", () => {
    expect(interpolateAt([10, 100], [0, 20], 55, "linear")).toBe(10);
  });
  it("returns a sample exactly at its x", () => {
    expect(interpolateAt([10, 100, 1000], [1, 2, 3], 100, "log")).toBe(2);
  });
  it("answers NaN outside the samples and next to a break", () => {
    expect(interpolateAt([10, 100], [0, 20], 5, "log")).toBeNaN();
    expect(interpolateAt([10, 100], [0, 20], 200, "log")).toBeNaN();
    expect(interpolateAt([10, 100, 1000], [0, NaN, 5], 50, "log")).toBeNaN();
    expect(interpolateAt([10, 100], [0, 20], -1, "log")).toBeNaN();
    expect(interpolateAt([], [], 1, "linear")).toBeNaN();
  });
});

describe("cursor stepping", () => {
  it("builds an ascending grid without repeats or undrawable samples", () => {
    expect(cursorGrid([100, 10, 0, 10, 1000, 50], [1, 1, 1, 1, NaN, 1], "log")).toEqual([10, 50, 100]);
  });
  it("starts at an end and clamps at the ends", () => {
    const g = [1, 2, 3, 4, 5];
    expect(stepCursor(g, null, 1, "linear")).toBe(1);
    expect(stepCursor(g, null, -1, "linear")).toBe(5);
    expect(stepCursor(g, 2, 1, "linear")).toBe(3);
    expect(stepCursor(g, 2.2, -1, "linear")).toBe(1); // from the nearest sample, 2
    expect(stepCursor(g, 4, 10, "linear")).toBe(5);
    expect(stepCursor(g, 4, -Infinity, "linear")).toBe(1);
    expect(stepCursor(g, 1, Infinity, "linear")).toBe(5);
    expect(stepCursor([], 1, 1, "linear")).toBeNull();
  });
});
