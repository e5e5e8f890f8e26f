/**
 * Geometry of a levels plot (output swing against the rails): one vertical axis in the plot's
 * unit, horizontal level lines labelled in a column on the right (labels spread apart so they
 * never overlap, each joined to its line), the allowed band as a wide box and the required band
 * as a narrower box inside it, with any part of the required band outside the allowed band
 * marked. Pure.
 */
import type { LevelsPlot } from "@/lib/calc/core/types";
import { axisTitle, linearTickFormat, sharedFormat } from "./format";
import type { Area, AxisLayout } from "./lineLayout";
import { bandFit, type BandFit } from "./summary";
import { extent, linearTicks, makeScale } from "./scale";
import { textWidth } from "./theme";

/** Smallest vertical distance between two level labels, px. */
export const LABEL_GAP = 15;

/**
 * Spread label positions so neighbours are at least `gap` apart, moving each as little as the
 * order allows, within [lo, hi] where possible.
 * @param ys wanted positions, px (any order)
 * @param gap smallest distance, px
 * @param lo top limit, px
 * @param hi bottom limit, px
 * @returns positions in the same order as `ys`
 * @example spreadLabels([100, 102, 104], 10, 0, 300) // [92, 102, 112]
 */
export function spreadLabels(ys: number[], gap: number, lo: number, hi: number): number[] {
  const order = ys.map((_, i) => i).sort((a, b) => ys[a] - ys[b] || a - b);
  const n = order.length;
  if (n === 0) return [];
  // Clusters of labels closer than the gap are centred on their wanted mean, then pushed apart.
  type Cluster = { start: number; end: number; top: number };
  const clusters: Cluster[] = [];
  for (let k = 0; k < n; k++) {
    clusters.push({ start: k, end: k, top: ys[order[k]] });
    for (;;) {
      const c = clusters[clusters.length - 1];
      const prev = clusters[clusters.length - 2];
      if (!prev || prev.top + (prev.end - prev.start + 1) * gap <= c.top) break;
      const members = order.slice(prev.start, c.end + 1).map((i) => ys[i]);
      const size = members.length;
      const mean = members.reduce((a, v) => a + v, 0) / size;
      clusters.splice(clusters.length - 2, 2, { start: prev.start, end: c.end, top: mean - ((size - 1) * gap) / 2 });
    }
  }
  const pos = new Array<number>(n);
  for (const c of clusters) for (let k = c.start; k <= c.end; k++) pos[k] = c.top + (k - c.start) * gap;
  // Keep inside [lo, hi] where the labels fit.
  const span = (n - 1) * gap;
  if (span <= hi - lo) {
    const shiftDown = Math.max(0, lo - pos[0]);
    for (let k = 0; k < n; k++) pos[k] += shiftDown;
    for (let k = n - 1; k >= 0; k--) {
      const limit = k === n - 1 ? hi : pos[k + 1] - gap;
      if (pos[k] > limit) pos[k] = limit;
    }
  }
  const out = new Array<number>(n);
  order.forEach((orig, k) => (out[orig] = pos[k]));
  return out;
}

/** A level line with its label. */
export interface LevelLayout {
  label: string;
  value: number;
  role: LevelsPlot["levels"][number]["role"];
  /** Line y, px. */
  y: number;
  /** Label baseline centre y, px (after spreading). */
  labelY: number;
  valueText: string;
}

/** A band box, px. */
export interface BandLayout {
  label: string;
  role: "allowed" | "required";
  from: number;
  to: number;
  x: number;
  y: number;
  w: number;
  h: number;
}

/** A part of the required band outside the allowed band, px. */
export interface OvershootLayout {
  side: "top" | "bottom";
  /** How far outside, data units. */
  by: number;
  x: number;
  y: number;
  w: number;
  h: number;
}

/** A laid-out levels plot. */
export interface LevelsLayout {
  width: number;
  height: number;
  area: Area;
  y: AxisLayout;
  levels: LevelLayout[];
  bands: BandLayout[];
  overshoots: OvershootLayout[];
  fit: BandFit | null;
  /** x where level labels start, px; their values end at `width - 2`. */
  labelX: number;
  /** Formats values the way the level labels show them (one prefix, aligned decimals). */
  format(value: number): string;
  /** Highest and lowest rail lines, px (for the hatching beyond them). */
  railTop?: number;
  railBottom?: number;
  empty: boolean;
}

/**
 * Lay out a levels plot.
 * @param plot the plot (values in its unit, SI base)
 * @param opts.width SVG width, px
 * @param opts.height SVG height, px
 */
export function layoutLevels(plot: LevelsPlot, opts: { width: number; height: number }): LevelsLayout {
  const { width, height } = opts;
  const unit = plot.unit;
  const bandsIn = (plot.bands ?? []).filter((b) => Number.isFinite(b.from) && Number.isFinite(b.to));
  const levelsIn = plot.levels.filter((l) => Number.isFinite(l.value));
  const e = extent([...levelsIn.map((l) => l.value), ...bandsIn.flatMap((b) => [b.from, b.to])], "linear");
  let [lo, hi] = e ?? [0, 1];
  if (lo === hi) {
    const pad = lo === 0 ? 1 : Math.abs(lo) * 0.1;
    lo -= pad;
    hi += pad;
  }
  const pad = (hi - lo) * 0.07;
  const domain: [number, number] = [lo - pad, hi + pad];

  const top = 24;
  const bottom = height - 12;
  const lt = linearTicks(lo, hi, Math.max(2, Math.round((bottom - top) / 40)));
  const ticks = lt.ticks.filter((v) => v >= domain[0] && v <= domain[1]);
  const fmt = linearTickFormat(ticks, lt.step, unit);
  const tickText = ticks.map((v) => fmt.format(v));
  const left = Math.ceil(Math.max(30, ...tickText.map((t) => textWidth(t) + 12)));

  const fmtValue = sharedFormat([...levelsIn.map((l) => l.value), ...bandsIn.flatMap((b) => [b.from, b.to])], unit);
  const values = levelsIn.map((l) => fmtValue(l.value));
  const labelW = Math.max(0, ...levelsIn.map((l, i) => textWidth(l.label) + 10 + textWidth(values[i])));
  const labelCol = Math.min(Math.max(labelW + 8, 150), Math.max(150, width * 0.5));
  const labelX = width - labelCol;
  const right = labelX - 28;
  const area: Area = { left, top, right, bottom };
  const scale = makeScale("linear", domain, [bottom, top]);
  const y: AxisLayout = {
    kind: "linear",
    scale,
    title: axisTitle(unit === "V" ? "Voltage" : "Level", fmt.unitText),
    unit,
    ticks: ticks.map((v, i) => ({ value: v, px: scale.map(v), major: true, text: tickText[i] })),
  };

  const ly = levelsIn.map((l) => scale.map(l.value));
  const spread = spreadLabels(ly, LABEL_GAP, top + 4, bottom - 4);
  const levels: LevelLayout[] = levelsIn.map((l, i) => ({ label: l.label, value: l.value, role: l.role, y: ly[i], labelY: spread[i], valueText: values[i] }));

  const pw = right - left;
  const box = (role: "allowed" | "required") => (role === "allowed" ? { x: left + pw * 0.1, w: pw * 0.8 } : { x: left + pw * 0.27, w: pw * 0.46 });
  const bands: BandLayout[] = bandsIn.map((b) => {
    const yTop = scale.map(Math.max(b.from, b.to));
    const yBot = scale.map(Math.min(b.from, b.to));
    return { label: b.label, role: b.role, from: Math.min(b.from, b.to), to: Math.max(b.from, b.to), ...box(b.role), y: yTop, h: Math.max(1, yBot - yTop) };
  });

  const fit = bandFit(plot);
  const overshoots: OvershootLayout[] = [];
  if (fit && !fit.fits) {
    const b = box("required");
    if (fit.spareTop < 0) {
      const yTop = scale.map(fit.required.hi);
      const yEdge = scale.map(Math.max(fit.allowed.hi, fit.required.lo));
      overshoots.push({ side: "top", by: -fit.spareTop, x: b.x, w: b.w, y: yTop, h: Math.max(1, yEdge - yTop) });
    }
    if (fit.spareBottom < 0) {
      const yEdge = scale.map(Math.min(fit.allowed.lo, fit.required.hi));
      const yBot = scale.map(fit.required.lo);
      overshoots.push({ side: "bottom", by: -fit.spareBottom, x: b.x, w: b.w, y: yEdge, h: Math.max(1, yBot - yEdge) });
    }
  }

  const rails = levelsIn.filter((l) => l.role === "rail").map((l) => l.value);
  const railTop = rails.length ? scale.map(Math.max(...rails)) : undefined;
  const railBottom = rails.length >= 2 ? scale.map(Math.min(...rails)) : undefined;

  return {
    width,
    height,
    area,
    y,
    levels,
    bands,
    overshoots,
    fit,
    labelX,
    format: fmtValue,
    ...(railTop !== undefined ? { railTop } : {}),
    ...(railBottom !== undefined ? { railBottom } : {}),
    empty: levelsIn.length === 0 && bandsIn.length === 0,
  };
}
