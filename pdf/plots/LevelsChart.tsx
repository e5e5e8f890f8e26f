/**
 * Levels on one voltage axis (output swing against the rails, common-mode range …): shaded bands
 * as side-by-side bars, levels as horizontal lines across them, labels in a column on the right,
 * spread apart where levels lie close together and tied back to their lines.
 */
import { Path, Rect } from "@react-pdf/renderer";
import type { LevelsPlot } from "../../lib/calc/core/types";
import { colors } from "../theme";
import { axisScale, decimalsFor, fixed, linearAxis } from "./axes";
import { PlotCanvas, r2, type CanvasLabel } from "./canvas";
import { formatQuantity } from "../../lib/calc/core/units";

const PAD = { left: 36, top: 8, bottom: 24 };
const LABEL_COLUMN = 170;
const LABEL_GAP = 8.6;

const LEVEL_STYLE: Record<LevelsPlot["levels"][number]["role"], { stroke: string; width: number; dash?: string }> = {
  rail: { stroke: colors.ink, width: 1.2 },
  limit: { stroke: colors.ink2, width: 0.7, dash: "3 1.8" },
  signal: { stroke: colors.copper, width: 1 },
  bias: { stroke: colors.ink2, width: 0.7, dash: "0.8 1.6" },
};

const BAND_STYLE: Record<"allowed" | "required", { fill: string; stroke: string }> = {
  allowed: { fill: "#ECEEEF", stroke: colors.ink2 },
  required: { fill: colors.copperFaint, stroke: colors.copper },
};

/** Spreads label centres (sorted top to bottom) at least `gap` apart inside [lo, hi]. */
export function spreadLabels(wanted: number[], gap: number, lo: number, hi: number): number[] {
  const y = wanted.map((v) => Math.min(Math.max(v, lo), hi));
  for (let i = 1; i < y.length; i++) if (y[i] - y[i - 1] < gap) y[i] = y[i - 1] + gap;
  if (y.length && y[y.length - 1] > hi) {
    y[y.length - 1] = hi;
    for (let i = y.length - 2; i >= 0; i--) if (y[i + 1] - y[i] < gap) y[i] = y[i + 1] - gap;
  }
  return y;
}

export function LevelsChart(props: { plot: LevelsPlot; width: number; height: number }) {
  const { plot, width, height } = props;
  const bands = plot.bands ?? [];
  const values = [...plot.levels.map((l) => l.value), ...bands.flatMap((b) => [b.from, b.to])];
  const ax = linearAxis(Math.min(...values), Math.max(...values), 6);
  const sc = axisScale(Math.max(...values.map(Math.abs)), plot.unit);
  const dec = decimalsFor(ax.step / sc.factor);

  const left = PAD.left;
  const right = width - LABEL_COLUMN;
  const top = PAD.top;
  const bottom = height - PAD.bottom;
  const mapY = (v: number) => bottom - ((v - ax.min) / (ax.max - ax.min)) * (bottom - top);

  const labels: CanvasLabel[] = [];
  let grid = "";
  for (const t of ax.ticks) {
    grid += `M${r2(left)} ${r2(mapY(t))}H${r2(right)}`;
    labels.push({ x: left - 4, y: mapY(t), text: fixed(t / sc.factor, dec), align: "right", width: 34 });
  }

  // Bands as bars, evenly spread across the plot area.
  const barW = Math.min(54, (right - left - 40) / Math.max(1, bands.length) - 24);
  const slot = (right - left) / Math.max(1, bands.length);
  const bandRects = bands.map((b, i) => {
    const cx = left + slot * (i + 0.5);
    const y0 = mapY(Math.max(b.from, b.to));
    const y1 = mapY(Math.min(b.from, b.to));
    const st = BAND_STYLE[b.role];
    labels.push({ x: cx, y: bottom + 8, text: b.label, width: slot - 6, size: 6.4 });
    return <Rect key={`b${i}`} x={cx - barW / 2} y={y0} width={barW} height={Math.max(0.5, y1 - y0)} fill={st.fill} stroke={st.stroke} strokeWidth={0.6} />;
  });

  // Levels, labelled in the right-hand column.
  const order = plot.levels.map((l, i) => ({ l, i, y: mapY(l.value) })).sort((a, b) => a.y - b.y);
  const ys = spreadLabels(order.map((o) => o.y), LABEL_GAP, top + 3, bottom - 3);
  const levelLines = order.map((o, k) => {
    const st = LEVEL_STYLE[o.l.role];
    const ly = ys[k];
    const lead = `M${r2(right)} ${r2(o.y)}L${r2(right + 8)} ${r2(o.y)}L${r2(right + 16)} ${r2(ly)}L${r2(right + 20)} ${r2(ly)}`;
    const ink = o.l.role === "signal" ? colors.copper : colors.ink;
    const weight = o.l.role === "rail" ? 600 : 400;
    labels.push({ x: right + 23, y: ly, text: o.l.label, align: "left", width: LABEL_COLUMN - 74, size: 6.8, color: ink, weight });
    labels.push({ x: width - 2, y: ly, text: formatQuantity(o.l.value, plot.unit, { digits: 3 }), align: "right", width: 50, size: 6.8, color: ink, weight, numeric: true });
    return [
      <Path key={`l${o.i}`} d={`M${r2(left)} ${r2(o.y)}H${r2(right)}`} stroke={st.stroke} strokeWidth={st.width} strokeDasharray={st.dash} fill="none" />,
      <Path key={`d${o.i}`} d={lead} stroke={colors.muted} strokeWidth={0.4} fill="none" />,
    ];
  });

  return (
    <PlotCanvas width={width} height={height} labels={labels}>
      <Rect x={left} y={top} width={right - left} height={bottom - top} fill="#FFFFFF" />
      <Path d={grid} stroke={colors.ruleLight} strokeWidth={0.4} fill="none" />
      {bandRects}
      {levelLines}
      <Rect x={left} y={top} width={right - left} height={bottom - top} fill="none" stroke={colors.ink2} strokeWidth={0.6} />
    </PlotCanvas>
  );
}

/** Unit printed in the axis title (prefixed as the ticks are). */
export function levelsAxisUnit(plot: LevelsPlot): string {
  const values = [...plot.levels.map((l) => l.value), ...(plot.bands ?? []).flatMap((b) => [b.from, b.to])];
  return axisScale(Math.max(...values.map(Math.abs)), plot.unit).unit;
}
