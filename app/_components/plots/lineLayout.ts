/**
 * Geometry of a line plot (Bode magnitude and phase, group delay, dissipation against
 * amplitude …) for a given size: axes with their ticks and labels, one path per series, dots for
 * lone points. Pure: the React components only draw what this returns.
 */
import type { LinePlot, LineSeries } from "@/lib/calc/core/types";
import { axisTitle, linearTickFormat, logTickLabel } from "./format";
import { isolatedPoints, pathData, segments, type Pt } from "./path";
import { extent, linearTicks, logDomain, logTicks, makeScale, niceLinearDomain, stepKindFor, type Scale, type ScaleKind } from "./scale";
import { FONT, ROLE_ORDER, seriesStyle, textWidth, type SeriesStyle } from "./theme";

/** Widest span a dB axis shows below its top, in dB; deeper values are clipped, with a note. */
export const DB_SPAN_MAX = 200;

/** One tick of a laid-out axis. */
export interface AxisTick {
  value: number;
  /** Position along the axis, px. */
  px: number;
  major: boolean;
  /** Label text, absent for unlabelled grid lines. */
  text?: string;
}

/** One axis, ready to draw. */
export interface AxisLayout {
  kind: ScaleKind;
  scale: Scale;
  /** Title with unit, e.g. "Gain (dB)", "Group delay (µs)". */
  title: string;
  /** The data unit (SI), e.g. "Hz", "dB". */
  unit: string;
  ticks: AxisTick[];
}

/** A series, ready to draw. */
export interface SeriesLayout {
  /** Index in plot.series. */
  index: number;
  name: string;
  role: NonNullable<LineSeries["role"]>;
  style: SeriesStyle;
  /** SVG path data (empty when no two neighbouring points can be drawn). */
  d: string;
  /** Lone points, drawn as dots. */
  dots: Pt[];
  /** Number of drawable points. */
  points: number;
}

/** Plot area in px, within the SVG. */
export interface Area {
  left: number;
  top: number;
  right: number;
  bottom: number;
}

/** A laid-out line plot. */
export interface LineLayout {
  width: number;
  height: number;
  area: Area;
  x: AxisLayout;
  y: AxisLayout;
  series: SeriesLayout[];
  /** True when no series has a drawable point. */
  empty: boolean;
  /** A note drawn in the plot, e.g. that values below the view are clipped. */
  note?: string;
  /** Whether the x tick labels and title are drawn (false for the upper plot of a pair). */
  showXAxis: boolean;
}

/** Options of {@link layoutLine}. */
export interface LineLayoutOptions {
  /** SVG width, px. */
  width: number;
  /** SVG height, px. */
  height: number;
  /** Force the x domain (a Bode pair shares it). */
  xDomain?: [number, number] | null;
  /** Force the left margin, px (a Bode pair aligns its two plot areas). */
  marginLeft?: number;
  /** Draw x tick labels and the x title, default true. */
  showXAxis?: boolean;
}

const MARGIN = { top: 22, right: 22, bottomWithAxis: 40, bottomBare: 8 };

function xs(plot: LinePlot): number[] {
  return plot.series.flatMap((s) => s.x.slice(0, Math.min(s.x.length, s.y.length)));
}

/**
 * The x domain that shows every drawable point of the plots (one plot, or both of a Bode pair):
 * the data's extent, a single value given room around it.
 * @param plots the plots that share the axis (their x axes should agree in unit and scale)
 * @returns [low, high] in data units, or null when nothing can be drawn
 */
export function lineXDomain(plots: LinePlot[]): [number, number] | null {
  if (plots.length === 0) return null;
  const kind = plots[0].x.scale;
  const values: number[] = [];
  for (const p of plots) {
    for (const s of p.series) {
      const n = Math.min(s.x.length, s.y.length);
      for (let i = 0; i < n; i++) if (Number.isFinite(s.y[i]) && (p.y.scale === "linear" || s.y[i] > 0)) values.push(s.x[i]);
    }
  }
  const e = extent(values, kind) ?? extent(plots.flatMap(xs), kind);
  if (!e) return null;
  if (kind === "log") return logDomain(e[0], e[1]);
  if (e[0] === e[1]) {
    const pad = e[0] === 0 ? 1 : Math.abs(e[0]) * 0.1;
    return [e[0] - pad, e[1] + pad];
  }
  return e;
}

/** A y axis before it is placed: domain, labelled ticks and title. */
export interface YAxisSpec {
  kind: ScaleKind;
  domain: [number, number];
  ticks: Array<{ value: number; major: boolean; text?: string }>;
  title: string;
  note?: string;
}

/**
 * The y axis of a line plot: nice linear ticks (angles in 15°/30°/45°/90° steps) or decades, a
 * dB axis limited to {@link DB_SPAN_MAX} below its top.
 * @param plot the plot
 * @param lengthPx the plot area's height, px (sets how many ticks fit)
 */
export function yAxisSpec(plot: LinePlot, lengthPx: number): YAxisSpec {
  const kind = plot.y.scale;
  const unit = plot.y.unit;
  const ys: number[] = [];
  for (const s of plot.series) {
    const n = Math.min(s.x.length, s.y.length);
    for (let i = 0; i < n; i++) if (Number.isFinite(s.x[i]) && (plot.x.scale === "linear" || s.x[i] > 0)) ys.push(s.y[i]);
  }
  const e = extent(ys, kind);
  const target = Math.max(2, Math.round(lengthPx / (unit === "°" ? 34 : 40)));
  if (kind === "log") {
    const [lo, hi] = e ? logDomain(e[0], e[1]) : [1, 10];
    const ticks = logTicks(lo, hi, { maxLabels: Math.max(2, Math.floor(lengthPx / 24)), minors: lengthPx / Math.max(1, Math.log10(hi / lo)) >= 40 });
    return {
      kind,
      domain: [lo, hi],
      ticks: ticks.map((t) => ({ value: t.value, major: t.major, ...(t.label ? { text: logTickLabel(t.value, unit) } : {}) })),
      title: axisTitle(plot.y.label, unit),
    };
  }
  const hi = e ? e[1] : 1;
  let lo = e ? e[0] : 0;
  const clipped = unit === "dB" && hi - lo > DB_SPAN_MAX;
  if (clipped) lo = hi - DB_SPAN_MAX;
  const nice = niceLinearDomain(lo, hi, target, stepKindFor(unit));
  // A magnitude whose passband lies along the top edge would merge with the frame: one step of
  // headroom above it.
  if (unit === "dB" && Number.isFinite(nice.step) && nice.domain[1] - hi < 0.02 * (nice.domain[1] - nice.domain[0])) {
    const top = Number((nice.domain[1] + nice.step).toPrecision(12));
    nice.domain = [nice.domain[0], top];
    nice.ticks = [...nice.ticks, top];
  }
  const ticks = nice.ticks.length > 0 ? nice.ticks : [nice.domain[0], nice.domain[1]];
  const step = Number.isFinite(nice.step) ? nice.step : Math.abs(nice.domain[1] - nice.domain[0]);
  const fmt = linearTickFormat(ticks, step, unit);
  const note = clipped ? `Values below ${fmt.format(nice.domain[0])} dB are outside the view.` : undefined;
  return {
    kind,
    domain: nice.domain,
    ticks: ticks.map((v) => ({ value: v, major: true, text: fmt.format(v) })),
    title: axisTitle(plot.y.label, fmt.unitText),
    ...(note ? { note } : {}),
  };
}

/**
 * Left margin a y axis needs for its tick labels, px.
 * @param spec the axis
 */
export function yMargin(spec: YAxisSpec): number {
  const widest = spec.ticks.reduce((m, t) => Math.max(m, t.text ? textWidth(t.text) : 0), 0);
  return Math.ceil(Math.max(30, widest + 12));
}

/**
 * Ticks of an x axis of the given length: decades with 2…9 minors (minors when a decade is at
 * least 44 px wide) or nice linear ticks about every 90 px.
 * @param kind axis kind
 * @param domain [low, high] in data units
 * @param unit axis unit
 * @param scale the placed scale
 * @param lengthPx axis length, px
 */
export function xTicks(kind: ScaleKind, domain: [number, number], unit: string, scale: Scale, lengthPx: number): { ticks: AxisTick[]; unitText: string } {
  if (kind === "log") {
    const decades = Math.max(1e-9, Math.log10(domain[1] / domain[0]));
    const ticks = logTicks(domain[0], domain[1], { maxLabels: Math.max(2, Math.floor(lengthPx / 52)), minors: lengthPx / decades >= 44 });
    return { ticks: ticks.map((t) => ({ value: t.value, px: scale.map(t.value), major: t.major, ...(t.label ? { text: logTickLabel(t.value, unit) } : {}) })), unitText: unit };
  }
  const lt = linearTicks(domain[0], domain[1], Math.max(2, Math.round(lengthPx / 90)));
  const fmt = linearTickFormat(lt.ticks, lt.step, unit);
  return { ticks: lt.ticks.map((v) => ({ value: v, px: scale.map(v), major: true, text: fmt.format(v) })), unitText: fmt.unitText };
}

/**
 * Lay out a line plot.
 * @param plot the plot (data units: SI, as the engine returns them)
 * @param opts size and shared-axis options
 */
export function layoutLine(plot: LinePlot, opts: LineLayoutOptions): LineLayout {
  const { width, height } = opts;
  const showXAxis = opts.showXAxis ?? true;
  const top = MARGIN.top;
  const bottom = height - (showXAxis ? MARGIN.bottomWithAxis : MARGIN.bottomBare);
  const ySpec = yAxisSpec(plot, bottom - top);
  const left = opts.marginLeft ?? yMargin(ySpec);
  const right = width - MARGIN.right;
  const area: Area = { left, top, right, bottom };

  const xDomain = opts.xDomain ?? lineXDomain([plot]) ?? (plot.x.scale === "log" ? ([1, 10] as [number, number]) : ([0, 1] as [number, number]));
  const xScale = makeScale(plot.x.scale, xDomain, [left, right]);
  const yScale = makeScale(plot.y.scale, ySpec.domain, [bottom, top]);
  const xt = xTicks(plot.x.scale, xDomain, plot.x.unit, xScale, right - left);
  const x: AxisLayout = { kind: plot.x.scale, scale: xScale, title: axisTitle(plot.x.label, xt.unitText), unit: plot.x.unit, ticks: xt.ticks };
  const y: AxisLayout = {
    kind: plot.y.scale,
    scale: yScale,
    title: ySpec.title,
    unit: plot.y.unit,
    ticks: ySpec.ticks.map((t) => ({ ...t, px: yScale.map(t.value) })),
  };

  let otherIndex = 0;
  const series: SeriesLayout[] = plot.series.map((s, index) => {
    const role = s.role ?? "other";
    const style = seriesStyle(role, role === "other" ? otherIndex++ : 0);
    const runs = segments(s.x, s.y, xScale, yScale);
    return { index, name: s.name, role, style, d: pathData(runs), dots: isolatedPoints(runs), points: runs.reduce((n, r) => n + r.length, 0) };
  });
  series.sort((a, b) => ROLE_ORDER[a.role] - ROLE_ORDER[b.role] || a.index - b.index);
  const empty = series.every((s) => s.points === 0);
  // Without data, invented ticks would look like a scale: keep only the frame and titles.
  if (empty) {
    x.ticks = [];
    y.ticks = [];
  }
  return {
    width,
    height,
    area,
    x,
    y,
    series,
    empty,
    ...(ySpec.note ? { note: ySpec.note } : {}),
    showXAxis,
  };
}

/** Font size of the axis titles, px (re-exported for the components). */
export const TITLE_SIZE = FONT.title;
