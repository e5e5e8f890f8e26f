/**
 * Geometry of a Monte Carlo histogram: bars from edges and counts, a count axis, and markers
 * (nominal, spec limits, percentiles) as labelled vertical lines whose labels never overlap.
 * Pure.
 */
import type { HistogramPlot } from "@/lib/calc/core/types";
import { axisTitle, linearTickFormat, readout } from "./format";
import { xTicks, type Area, type AxisLayout } from "./lineLayout";
import { extent, isPlottable, logDomain, makeScale, niceLinearDomain } from "./scale";
import { FONT, textWidth } from "./theme";

/** How a marker line is drawn, read from its label. */
export type MarkerKind = "limit" | "percentile" | "centre";

/**
 * The kind of a marker from its label: spec limits and bounds are "limit" (dashed),
 * percentiles "percentile" (dotted), anything else (nominal, mean, target) "centre" (solid).
 * @param label the marker's label, e.g. "99.865 % percentile", "upper spec limit", "nominal"
 */
export function markerKind(label: string): MarkerKind {
  if (/limit|spec|bound|toleran|\bmin\b|\bmax\b/i.test(label)) return "limit";
  if (/percentile|^p\s?\d|\d\s*%/i.test(label)) return "percentile";
  return "centre";
}

/** A bar, px. */
export interface Bar {
  index: number;
  x: number;
  y: number;
  w: number;
  h: number;
  count: number;
}

/** A marker, px, with its label placed. */
export interface MarkerLayout {
  label: string;
  value: number;
  kind: MarkerKind;
  px: number;
  /** Label text: the label and the value. */
  text: string;
  /** Label anchor x, px, and which side of the line the label sits. */
  textX: number;
  anchor: "start" | "end";
  /** Label baseline y, px. */
  textY: number;
}

/** A laid-out histogram. */
export interface HistogramLayout {
  width: number;
  height: number;
  area: Area;
  x: AxisLayout;
  y: AxisLayout;
  bars: Bar[];
  markers: MarkerLayout[];
  /** Sum of the counts of the drawn bins. */
  total: number;
  empty: boolean;
}

const ROW = 14;
const MARGIN = { top: 22, right: 22, bottom: 40 };

/**
 * Place marker labels beside their lines in rows from the top of the plot area: a label goes to
 * the right of its line (to the left where it would leave the area), in the first row where it
 * overlaps no label already placed.
 * @param items marker x (px) and label text
 * @param left plot area left, px
 * @param right plot area right, px
 * @returns per item (same order) the row, the anchor and the anchor x
 */
export function placeMarkerLabels(items: Array<{ px: number; text: string }>, left: number, right: number): Array<{ row: number; anchor: "start" | "end"; textX: number }> {
  const order = items.map((_, i) => i).sort((a, b) => items[a].px - items[b].px);
  const rows: Array<Array<[number, number]>> = [];
  const out = new Array<{ row: number; anchor: "start" | "end"; textX: number }>(items.length);
  for (const i of order) {
    const { px, text } = items[i];
    const w = textWidth(text);
    let anchor: "start" | "end" = px + 4 + w <= right - 2 ? "start" : "end";
    let textX = anchor === "start" ? px + 4 : px - 4;
    if (anchor === "end" && textX - w < left + 2) {
      // Fits on neither side of its line: as far right as it fits, starting inside the area.
      anchor = "start";
      textX = Math.max(left + 2, right - 2 - w);
    }
    const span: [number, number] = anchor === "start" ? [px - 1, textX + w + 6] : [textX - w - 6, px + 1];
    if (span[0] < left) span[0] = left;
    let row = rows.findIndex((r) => r.every(([a, b]) => span[1] <= a || span[0] >= b));
    if (row < 0) {
      rows.push([]);
      row = rows.length - 1;
    }
    rows[row].push(span);
    out[i] = { row, anchor, textX };
  }
  return out;
}

/** Markers closer than this on the axis share one label, px. */
export const MARKER_MERGE_PX = 3;

/**
 * Markers that fall within {@link MARKER_MERGE_PX} of each other on the axis, as label groups:
 * one label at the group's leftmost marker: "nominal 20 kHz · mean 20.01 kHz", or
 * "target · nominal 20 kHz" when the values read the same.
 * @param markers the markers (drawable ones)
 * @param map value → px
 * @param unit the axis unit
 * @returns groups in axis order, each with its member indices (into `markers`), px and text
 */
export function groupMarkers(markers: Array<{ label: string; value: number }>, map: (v: number) => number, unit: string): Array<{ px: number; text: string; members: number[] }> {
  const order = markers.map((_, i) => i).sort((a, b) => map(markers[a].value) - map(markers[b].value) || a - b);
  const groups: Array<{ px: number; members: number[] }> = [];
  for (const i of order) {
    const px = map(markers[i].value);
    const last = groups[groups.length - 1];
    if (last && Math.abs(px - map(markers[last.members[last.members.length - 1]].value)) < MARKER_MERGE_PX) last.members.push(i);
    else groups.push({ px, members: [i] });
  }
  return groups.map((g) => {
    const values = g.members.map((i) => readout(markers[i].value, unit));
    // Markers that read the same value share it: "target · nominal 1 kHz".
    const text = values.every((v) => v === values[0])
      ? `${g.members.map((i) => markers[i].label).join(" · ")} ${values[0]}`
      : g.members.map((i, k) => `${markers[i].label} ${values[k]}`).join(" · ");
    return { ...g, text };
  });
}

/**
 * Lay out a histogram.
 * @param plot the plot (x in SI base units)
 * @param opts.width SVG width, px
 * @param opts.height SVG height, px
 */
export function layoutHistogram(plot: HistogramPlot, opts: { width: number; height: number }): HistogramLayout {
  const { width, height } = opts;
  const kind = plot.x.scale;
  const unit = plot.x.unit;
  const bins = Math.min(plot.counts.length, Math.max(0, plot.edges.length - 1));
  const drawable: number[] = [];
  for (let i = 0; i < bins; i++) {
    if (isPlottable(plot.edges[i], kind) && isPlottable(plot.edges[i + 1], kind) && Number.isFinite(plot.counts[i]) && plot.counts[i] >= 0) drawable.push(i);
  }
  const markers = (plot.markers ?? []).filter((m) => isPlottable(m.value, kind));
  const total = drawable.reduce((a, i) => a + plot.counts[i], 0);
  const maxCount = drawable.reduce((m, i) => Math.max(m, plot.counts[i]), 0);

  // x domain: the bins, widened to show every marker (with a little room).
  const edgeValues = drawable.flatMap((i) => [plot.edges[i], plot.edges[i + 1]]);
  const ex = extent([...edgeValues, ...markers.map((m) => m.value)], kind);
  let xDomain: [number, number];
  if (!ex) xDomain = kind === "log" ? [1, 10] : [0, 1];
  else if (kind === "log") xDomain = logDomain(ex[0], ex[1]);
  else if (ex[0] === ex[1]) xDomain = [ex[0] - (Math.abs(ex[0]) * 0.1 || 1), ex[1] + (Math.abs(ex[0]) * 0.1 || 1)];
  else {
    const be = extent(edgeValues, kind);
    const pad = (ex[1] - ex[0]) * 0.03;
    xDomain = [be && ex[0] >= be[0] ? ex[0] : ex[0] - pad, be && ex[1] <= be[1] ? ex[1] : ex[1] + pad];
  }

  const left0 = 44;
  const right = width - MARGIN.right;
  const xScale0 = makeScale(kind, xDomain, [left0, right]);
  const placed = placeMarkerLabels(groupMarkers(markers, xScale0.map.bind(xScale0), unit), left0, right);
  const rows = placed.reduce((m, p) => Math.max(m, p.row + 1), 0);

  // Count axis with room above the tallest bar for the marker label rows.
  const top = MARGIN.top;
  const bottom = height - MARGIN.bottom;
  const plotH = bottom - top;
  const labelRoom = rows > 0 ? rows * ROW + 8 : 6;
  const need = maxCount > 0 ? (maxCount * plotH) / Math.max(plotH * 0.35, plotH - labelRoom) : 1;
  let yNice = niceLinearDomain(0, need, Math.max(2, Math.round(plotH / 36)));
  if (yNice.step < 1) yNice = { domain: [0, Math.max(1, Math.ceil(need))], step: 1, ticks: Array.from({ length: Math.max(1, Math.ceil(need)) + 1 }, (_, k) => k) };
  const yFmt = linearTickFormat(yNice.ticks, yNice.step, "");
  const yLabels = yNice.ticks.map((v) => yFmt.format(v));
  const left = Math.ceil(Math.max(30, Math.max(...yLabels.map((t) => textWidth(t)), 0) + 12));

  const xScale = makeScale(kind, xDomain, [left, right]);
  const yScale = makeScale("linear", yNice.domain, [bottom, top]);
  const xt = xTicks(kind, xDomain, unit, xScale, right - left);
  const x: AxisLayout = { kind, scale: xScale, title: axisTitle(plot.x.label, xt.unitText), unit, ticks: xt.ticks };
  const y: AxisLayout = {
    kind: "linear",
    scale: yScale,
    title: total > 0 ? `Count (of ${total} samples)` : "Count",
    unit: "",
    ticks: yNice.ticks.map((v, i) => ({ value: v, px: yScale.map(v), major: true, text: yLabels[i] })),
  };

  const bars: Bar[] = drawable.map((i) => {
    const a = xScale.map(plot.edges[i]);
    const b = xScale.map(plot.edges[i + 1]);
    const yTop = yScale.map(plot.counts[i]);
    return { index: i, x: Math.min(a, b), w: Math.abs(b - a), y: yTop, h: bottom - yTop, count: plot.counts[i] };
  });
  const groups = groupMarkers(markers, (v) => xScale.map(v), unit);
  const relabel = placeMarkerLabels(groups, left, right);
  const markerLayouts: MarkerLayout[] = markers.map((m) => ({
    label: m.label,
    value: m.value,
    kind: markerKind(m.label),
    px: xScale.map(m.value),
    text: "",
    textX: 0,
    anchor: "start",
    textY: 0,
  }));
  groups.forEach((g, k) => {
    const lead = markerLayouts[g.members[0]];
    lead.text = g.text;
    lead.textX = relabel[k].textX;
    lead.anchor = relabel[k].anchor;
    lead.textY = top + 4 + FONT.tick + relabel[k].row * ROW;
  });
  if (total === 0) {
    x.ticks = [];
    y.ticks = [];
  }
  return { width, height, area: { left, top, right, bottom }, x, y, bars, markers: markerLayouts, total, empty: total === 0 };
}
