/**
 * Line geometry and read-out lookup: pure functions, no React.
 */
import { isPlottable, toScaleSpace, type Scale, type ScaleKind } from "./scale";

/** A point in pixels. */
export interface Pt {
  x: number;
  y: number;
}

/** Pixel coordinates beyond this (either sign) are pulled in, so SVG never gets absurd numbers
 * from a value far outside the view (the plot area clips anyway; the slope error inside the view
 * is below 0.01 px for plots a few hundred pixels high). */
const PX_LIMIT = 1e5;

/** Round a pixel coordinate to 0.1 px (enough for screens, keeps the markup small). */
export function r1(v: number): number {
  return Math.round(v * 10) / 10;
}

/**
 * Split a series into drawable runs: a point whose x or y cannot be shown on its scale (not
 * finite, or ≤ 0 on a log axis) ends the current run and is left out.
 * @param xs x values (data units)
 * @param ys y values (data units), same length as xs (extra entries of either are ignored)
 * @param sx scale of the x axis
 * @param sy scale of the y axis
 * @returns runs of pixel points, each with at least one point
 */
export function segments(xs: readonly number[], ys: readonly number[], sx: Scale, sy: Scale): Pt[][] {
  const runs: Pt[][] = [];
  let run: Pt[] = [];
  const n = Math.min(xs.length, ys.length);
  for (let i = 0; i < n; i++) {
    const px = sx.map(xs[i]);
    const py = sy.map(ys[i]);
    if (!Number.isFinite(px) || !Number.isFinite(py)) {
      if (run.length > 0) runs.push(run);
      run = [];
      continue;
    }
    run.push({ x: Math.max(-PX_LIMIT, Math.min(PX_LIMIT, px)), y: Math.max(-PX_LIMIT, Math.min(PX_LIMIT, py)) });
  }
  if (run.length > 0) runs.push(run);
  return runs;
}

/**
 * SVG path data of the runs with two or more points: "M x y L x y …" per run.
 * Runs of a single point are left to {@link isolatedPoints} (a path of one point draws nothing).
 * @param runs from {@link segments}
 */
export function pathData(runs: Pt[][]): string {
  return runs
    .filter((r) => r.length >= 2)
    .map((r) => r.map((p, i) => `${i === 0 ? "M" : "L"}${r1(p.x)} ${r1(p.y)}`).join(""))
    .join("");
}

/**
 * The points that stand alone (a run of one point), drawn as dots so a single sample or a
 * sample between two breaks stays visible.
 * @param runs from {@link segments}
 */
export function isolatedPoints(runs: Pt[][]): Pt[] {
  return runs.filter((r) => r.length === 1).map((r) => r[0]);
}

/**
 * Index of the sample nearest to x, distance measured in the axis' own space (log10 x on a log
 * axis, so on a frequency axis "nearest" means nearest in ratio).
 * @param xs sample x values (any order; undrawable ones are skipped)
 * @param x the pointer's x (data units)
 * @param kind the x axis kind
 * @returns the index, or −1 when no sample can be drawn
 */
export function nearestIndex(xs: readonly number[], x: number, kind: ScaleKind): number {
  const t = toScaleSpace(x, kind);
  if (!Number.isFinite(t)) return -1;
  let best = -1;
  let bestD = Infinity;
  for (let i = 0; i < xs.length; i++) {
    const ti = toScaleSpace(xs[i], kind);
    if (!Number.isFinite(ti)) continue;
    const d = Math.abs(ti - t);
    if (d < bestD) {
      bestD = d;
      best = i;
    }
  }
  return best;
}

/**
 * The series' y at x, interpolated linearly in the axis' own x space (log10 x on a log axis, which
 * is how a straight segment of a Bode plot is drawn) between the two samples that bracket x.
 * @param xs sample x values (data units)
 * @param ys sample y values (data units)
 * @param x where to read (data units)
 * @param kind the x axis kind
 * @returns y, or NaN when x lies outside the samples or next to an undrawable sample (a break)
 * @example interpolateAt([10, 100], [0, 20], 31.6227766, "log") // ≈ 10
 */
export function interpolateAt(xs: readonly number[], ys: readonly number[], x: number, kind: ScaleKind): number {
  const t = toScaleSpace(x, kind);
  if (!Number.isFinite(t)) return NaN;
  const n = Math.min(xs.length, ys.length);
  for (let i = 0; i < n; i++) {
    if (xs[i] === x && Number.isFinite(ys[i])) return ys[i];
  }
  for (let i = 0; i + 1 < n; i++) {
    const a = toScaleSpace(xs[i], kind);
    const b = toScaleSpace(xs[i + 1], kind);
    if (!Number.isFinite(a) || !Number.isFinite(b) || a === b) continue;
    if ((t - a) * (t - b) > 0) continue;
    const y0 = ys[i];
    const y1 = ys[i + 1];
    if (!Number.isFinite(y0) || !Number.isFinite(y1)) return NaN;
    const f = (t - a) / (b - a);
    return y0 + f * (y1 - y0);
  }
  return NaN;
}

/**
 * The drawable x values of a series, ascending and without repeats: the grid a keyboard cursor
 * steps along.
 * @param xs sample x values
 * @param ys sample y values (a sample with an undrawable y is not a stop)
 * @param kind the x axis kind
 */
export function cursorGrid(xs: readonly number[], ys: readonly number[], kind: ScaleKind): number[] {
  const out: number[] = [];
  const n = Math.min(xs.length, ys.length);
  for (let i = 0; i < n; i++) if (isPlottable(xs[i], kind) && Number.isFinite(ys[i])) out.push(xs[i]);
  out.sort((a, b) => a - b);
  return out.filter((v, i) => i === 0 || v !== out[i - 1]);
}

/**
 * Move a cursor along a grid by `steps` samples from the sample nearest to `current`; from no
 * cursor, a step forward starts at the first sample and a step back at the last.
 * @param grid ascending x values
 * @param current current cursor x, or null
 * @param steps samples to move (negative: back); ±Infinity jumps to the ends
 * @param kind the x axis kind (for "nearest")
 * @returns the new cursor x, or null for an empty grid
 */
export function stepCursor(grid: readonly number[], current: number | null, steps: number, kind: ScaleKind): number | null {
  if (grid.length === 0) return null;
  if (steps === Infinity) return grid[grid.length - 1];
  if (steps === -Infinity) return grid[0];
  if (current === null) return steps >= 0 ? grid[0] : grid[grid.length - 1];
  const i = nearestIndex(grid, current, kind);
  const j = Math.max(0, Math.min(grid.length - 1, (i < 0 ? 0 : i) + steps));
  return grid[j];
}
