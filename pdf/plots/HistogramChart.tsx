/**
 * Monte Carlo histogram as vector graphics: all bars in one Path, markers (nominal, limits,
 * percentiles) as dashed verticals with their labels staggered so they never overlap.
 */
import { Path, Rect } from "@react-pdf/renderer";
import type { HistogramPlot } from "../../lib/calc/core/types";
import { colors } from "../theme";
import { axisScale, decimalsFor, fixed, linearAxis } from "./axes";
import { PlotCanvas, estimateTextWidth, r2, type CanvasLabel } from "./canvas";
import { formatQuantity } from "../../lib/calc/core/units";

const PAD = { left: 36, right: 10, top: 14, bottom: 16 };
const MARKER_ROW = 9;

/** Unit printed in the x axis title (prefixed as the ticks are). */
export function histogramAxisUnit(plot: HistogramPlot): string {
  const all = [...plot.edges, ...(plot.markers ?? []).map((m) => m.value)].map(Math.abs);
  return axisScale(Math.max(...all), plot.x.unit).unit;
}

export function HistogramChart(props: { plot: HistogramPlot; width: number; height: number }) {
  const { plot, width, height } = props;
  const markers = plot.markers ?? [];
  const xsAll = [...plot.edges, ...markers.map((m) => m.value)];
  const ax = linearAxis(Math.min(...xsAll), Math.max(...xsAll), 8);
  const sc = axisScale(Math.max(...xsAll.map(Math.abs)), plot.x.unit);
  const dec = decimalsFor(ax.step / sc.factor);
  const maxCount = Math.max(1, ...plot.counts);
  const ay = linearAxis(0, maxCount, 4);

  const left = PAD.left;
  const right = width - PAD.right;
  const mapX = (v: number) => left + ((v - ax.min) / (ax.max - ax.min)) * (right - left);

  // Markers: sort by x, put each label in the first row where it does not collide.
  const rowsEnd: number[] = [];
  const placed = [...markers]
    .sort((a, b) => a.value - b.value)
    .map((m) => {
      const x = mapX(m.value);
      const text = `${m.label} ${formatQuantity(m.value, plot.x.unit, { digits: 4 })}`;
      const w = estimateTextWidth(text, 6.4) + 4;
      let align: "left" | "center" | "right" = "center";
      let x0 = x - w / 2;
      if (x0 < left) {
        align = "left";
        x0 = x - 2;
      } else if (x + w / 2 > right) {
        align = "right";
        x0 = x - w + 2;
      }
      let row = rowsEnd.findIndex((end) => end + 3 <= x0);
      if (row < 0) {
        row = rowsEnd.length;
        rowsEnd.push(-Infinity);
      }
      rowsEnd[row] = x0 + w;
      return { x, text, w, align, row };
    });

  const top = PAD.top + Math.max(0, rowsEnd.length - 1) * MARKER_ROW;
  const bottom = height - PAD.bottom;
  const mapY = (v: number) => bottom - ((v - ay.min) / (ay.max - ay.min)) * (bottom - top);

  const labels: CanvasLabel[] = [];
  const grid: string[] = [];
  for (const t of ax.ticks) labels.push({ x: mapX(t), y: bottom + 7, text: fixed(t / sc.factor, dec), width: 40 });
  for (const t of ay.ticks) {
    grid.push(`M${r2(left)} ${r2(mapY(t))}H${r2(right)}`);
    labels.push({ x: left - 4, y: mapY(t), text: fixed(t, decimalsFor(ay.step)), align: "right", width: 34 });
  }

  let bars = "";
  plot.counts.forEach((c, i) => {
    if (c <= 0) return;
    const x0 = mapX(plot.edges[i]);
    const x1 = mapX(plot.edges[i + 1]);
    bars += `M${r2(x0)} ${r2(bottom)}V${r2(mapY(c))}H${r2(x1)}V${r2(bottom)}Z`;
  });

  let markerPath = "";
  for (const p of placed) {
    // Row 0 sits just above the frame, later rows stack upwards; labels have an opaque
    // background, so a marker line passing behind a lower label is hidden by it.
    const ly = top - 6 - p.row * MARKER_ROW;
    markerPath += `M${r2(p.x)} ${r2(ly + 3.5)}V${r2(bottom)}`;
    const ax0 = p.align === "left" ? p.x - 2 : p.align === "right" ? p.x + 2 : p.x;
    labels.push({ x: ax0, y: ly, text: p.text, align: p.align, size: 6.4, color: colors.ink, width: p.w, background: colors.paper });
  }

  return (
    <PlotCanvas width={width} height={height} labels={labels}>
      <Rect x={left} y={top} width={right - left} height={bottom - top} fill="#FFFFFF" />
      <Path d={grid.join("")} stroke={colors.ruleLight} strokeWidth={0.4} fill="none" />
      {bars ? <Path d={bars} fill={colors.copperLight} stroke={colors.copper} strokeWidth={0.5} /> : null}
      {markerPath ? <Path d={markerPath} stroke={colors.ink} strokeWidth={0.6} strokeDasharray="2 1.5" fill="none" /> : null}
      <Rect x={left} y={top} width={right - left} height={bottom - top} fill="none" stroke={colors.ink2} strokeWidth={0.6} />
    </PlotCanvas>
  );
}
