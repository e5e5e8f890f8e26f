/**
 * x-y line plot (Bode magnitude and phase, group delay …) as vector graphics: one Path per
 * series, decade grid lines with labelled ticks on log axes, 1-2-5 grids on linear axes.
 */
import { Line, Path, Rect } from "@react-pdf/renderer";
import type { LinePlot, LineSeries } from "../../lib/calc/core/types";
import { colors } from "../theme";
import { axisScale, decadeLabel, decimalsFor, fixed, linearAxis, logAxis, niceStep } from "./axes";
import { PlotCanvas, r2, type CanvasLabel } from "./canvas";

/** Stroke style of a series by role; "other" series cycle through dash patterns. */
export function seriesStyle(role: LineSeries["role"], index: number): { stroke: string; width: number; dash?: string } {
  switch (role) {
    case "real":
      return { stroke: colors.copper, width: 1.3 };
    case "ideal":
      return { stroke: colors.ink2, width: 0.8, dash: "3.2 2" };
    case "limit":
      return { stroke: colors.ink, width: 0.8, dash: "1.2 1.6" };
    default: {
      const dashes = [undefined, "5 2", "1.5 1.5", "6 2 1.5 2"];
      return { stroke: colors.ink, width: 0.9, dash: dashes[index % dashes.length] };
    }
  }
}

interface Mapped {
  x: (v: number) => number;
  y: (v: number) => number;
}

const PAD = { left: 36, right: 10, top: 6, bottom: 16 };

/** Axis on the first of `steps` giving at most 9 intervals (degrees: 15°…; decibels: 1 dB … 20 dB …). */
function stepAxis(lo: number, hi: number, steps: number[]) {
  const span = Math.max(hi - lo, 1e-9);
  const step = steps.find((s) => span / s <= 9) ?? niceStep(span, 6);
  const min = Math.floor(lo / step + 1e-3) * step;
  let max = Math.ceil(hi / step - 1e-3) * step;
  if (max <= min) max = min + step;
  const ticks: number[] = [];
  for (let v = min; v <= max + step * 1e-6; v += step) ticks.push(Math.abs(v) < step * 1e-9 ? 0 : Number(v.toPrecision(12)));
  return { min, max, step, ticks };
}

/** The plot drawn into a canvas `width` × `height` points (axis titles are printed outside). */
export function LinePlotChart(props: { plot: LinePlot; width: number; height: number }) {
  const { plot, width, height } = props;
  const xs = plot.series.flatMap((s) => s.x);
  const ys = plot.series.flatMap((s) => s.y);
  const left = PAD.left;
  const right = width - PAD.right;
  const top = PAD.top;
  const bottom = height - PAD.bottom;
  const labels: CanvasLabel[] = [];
  const grid: string[] = [];
  const gridMinor: string[] = [];

  // x axis
  let mapX: Mapped["x"];
  if (plot.x.scale === "log") {
    const ax = logAxis(Math.min(...xs), Math.max(...xs));
    const l0 = Math.log10(ax.min);
    const l1 = Math.log10(ax.max);
    mapX = (v) => left + ((Math.log10(v) - l0) / (l1 - l0)) * (right - left);
    for (const m of ax.minors) gridMinor.push(`M${r2(mapX(m))} ${r2(top)}V${r2(bottom)}`);
    for (const m of ax.majors) {
      grid.push(`M${r2(mapX(m))} ${r2(top)}V${r2(bottom)}`);
      labels.push({ x: mapX(m), y: bottom + 7, text: decadeLabel(m, plot.x.unit), width: 40 });
    }
  } else {
    const sc = axisScale(Math.max(...xs.map(Math.abs)), plot.x.unit);
    const ax = linearAxis(Math.min(...xs), Math.max(...xs), 8);
    mapX = (v) => left + ((v - ax.min) / (ax.max - ax.min)) * (right - left);
    const dec = decimalsFor(ax.step / sc.factor);
    for (const t of ax.ticks) {
      grid.push(`M${r2(mapX(t))} ${r2(top)}V${r2(bottom)}`);
      labels.push({ x: mapX(t), y: bottom + 7, text: fixed(t / sc.factor, dec), width: 40 });
    }
  }

  // y axis
  let mapY: Mapped["y"];
  if (plot.y.scale === "log") {
    const ax = logAxis(Math.min(...ys), Math.max(...ys));
    const l0 = Math.log10(ax.min);
    const l1 = Math.log10(ax.max);
    mapY = (v) => bottom - ((Math.log10(v) - l0) / (l1 - l0)) * (bottom - top);
    for (const m of ax.minors) gridMinor.push(`M${r2(left)} ${r2(mapY(m))}H${r2(right)}`);
    for (const m of ax.majors) {
      grid.push(`M${r2(left)} ${r2(mapY(m))}H${r2(right)}`);
      labels.push({ x: left - 4, y: mapY(m), text: decadeLabel(m, plot.y.unit), align: "right", width: 34 });
    }
  } else {
    const lo = Math.min(...ys);
    const hi = Math.max(...ys);
    const ax = plot.y.unit === "°" ? stepAxis(lo, hi, [15, 30, 45, 90, 180]) : plot.y.unit === "dB" ? stepAxis(lo, hi, [1, 2, 3, 5, 10, 20, 40, 60, 100]) : linearAxis(lo, hi, 5);
    const sc = axisScale(Math.max(...ys.map(Math.abs)), plot.y.unit);
    mapY = (v) => bottom - ((v - ax.min) / (ax.max - ax.min)) * (bottom - top);
    const dec = decimalsFor(ax.step / sc.factor);
    for (const t of ax.ticks) {
      grid.push(`M${r2(left)} ${r2(mapY(t))}H${r2(right)}`);
      labels.push({ x: left - 4, y: mapY(t), text: fixed(t / sc.factor, dec), align: "right", width: 34 });
    }
  }

  const curves = plot.series.map((s, i) => {
    const st = seriesStyle(s.role, i);
    let d = "";
    for (let k = 0; k < s.x.length; k++) d += `${k === 0 ? "M" : "L"}${r2(mapX(s.x[k]))} ${r2(mapY(s.y[k]))}`;
    return <Path key={i} d={d} fill="none" stroke={st.stroke} strokeWidth={st.width} strokeDasharray={st.dash} strokeLinejoin="round" />;
  });

  return (
    <PlotCanvas width={width} height={height} labels={labels}>
      <Rect x={left} y={top} width={right - left} height={bottom - top} fill="#FFFFFF" />
      {gridMinor.length > 0 ? <Path d={gridMinor.join("")} stroke={colors.ruleLight} strokeWidth={0.35} fill="none" /> : null}
      <Path d={grid.join("")} stroke={colors.rule} strokeWidth={0.5} fill="none" />
      {curves}
      <Rect x={left} y={top} width={right - left} height={bottom - top} fill="none" stroke={colors.ink2} strokeWidth={0.6} />
      <Line x1={left} y1={bottom} x2={right} y2={bottom} stroke={colors.ink2} strokeWidth={0.6} />
    </PlotCanvas>
  );
}

/** Axis title as printed: "Frequency, Hz"; log axes with prefixed tick labels keep the base unit. */
export function axisTitle(label: string, unit: string): string {
  return unit ? `${label}, ${unit}` : label;
}

/** Units printed in the axis titles of a line plot (prefixed on linear axes, as the ticks are). */
export function lineAxisUnits(plot: LinePlot): { x: string; y: string } {
  const xs = plot.series.flatMap((s) => s.x.map(Math.abs));
  const ys = plot.series.flatMap((s) => s.y.map(Math.abs));
  return {
    x: plot.x.scale === "log" ? plot.x.unit : axisScale(Math.max(...xs), plot.x.unit).unit,
    y: plot.y.scale === "log" ? plot.y.unit : axisScale(Math.max(...ys), plot.y.unit).unit,
  };
}
