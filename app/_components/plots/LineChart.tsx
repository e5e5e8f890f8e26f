"use client";
/**
 * Line plots on linear or log axes (Bode magnitude and phase, group delay, dissipation against
 * amplitude …) with a crosshair read-out that follows the pointer or the arrow keys.
 */
import { useMemo, useState, type KeyboardEvent, type PointerEvent } from "react";
import type { LinePlot } from "@/lib/calc/core/types";
import { lineTables } from "./dataTable";
import { readout, readoutOnAxis } from "./format";
import { layoutLine, type LineLayout } from "./lineLayout";
import { cursorGrid, interpolateAt, nearestIndex, r1, stepCursor } from "./path";
import { extent, isPlottable } from "./scale";
import { AreaBackground, AreaFrame, AxisLabels, Grid, PlotFigure, Swatch, crisp, svgRootProps, useContainerWidth, useSvgId } from "./parts";
import { summariseLine } from "./summary";
import { FONT, seriesStyle, type SeriesStyle } from "./theme";

/** Props of {@link LinePlotView}. */
export interface LinePlotViewProps {
  plot: LinePlot;
  /** Height of the drawing, px (default 260). */
  height?: number;
  /** Show the plot's title above it (default true; off when the page titles it). */
  showTitle?: boolean;
  /** Offer the "Show data" table (default true). */
  showDataToggle?: boolean;
  className?: string;
}

/**
 * The x values a cursor steps along: the samples of the fullest series that is not a limit
 * line (a limit line is usually two points), or of all series together when there is none.
 * @param plots plots sharing the x axis; the first one's series are searched first
 */
export function primaryGrid(plots: LinePlot[]): number[] {
  const kind = plots[0]?.x.scale ?? "linear";
  let best: number[] = [];
  for (const p of plots) {
    for (const s of p.series) {
      if (s.role === "limit") continue;
      const g = cursorGrid(s.x, s.y, kind);
      if (g.length > best.length) best = g;
    }
    if (best.length > 0) return best;
  }
  const all = plots.flatMap((p) => p.series.flatMap((s) => cursorGrid(s.x, s.y, kind)));
  return cursorGrid(all, all.map(() => 0), kind);
}

/** One entry of a legend with its read-out values (one per plot of a pair). */
export interface LegendEntry {
  name: string;
  style: SeriesStyle;
  values: string[];
  /** True when the series has no drawable point in any of the plots. */
  empty: boolean;
}

/**
 * Legend entries of one or more plots sharing the x axis: series with the same name and role
 * are one entry; each entry gets, per plot, the series' value at the cursor.
 * @param plots the plots (a Bode pair: magnitude, phase)
 * @param cursor the cursor's x (data units) or null
 */
export function legendEntries(plots: LinePlot[], cursor: number | null): LegendEntry[] {
  const entries: Array<LegendEntry & { key: string }> = [];
  const drawable = (plot: LinePlot, s: LinePlot["series"][number]) => s.x.some((x, i) => i < s.y.length && isPlottable(x, plot.x.scale) && isPlottable(s.y[i], plot.y.scale));
  plots.forEach((plot, pi) => {
    const ye = plot.y.scale === "linear" ? extent(plot.series.flatMap((s) => s.y), "linear") : null;
    const span = ye ? ye[1] - ye[0] : NaN;
    let otherIndex = 0;
    for (const s of plot.series) {
      const role = s.role ?? "other";
      const style = seriesStyle(role, role === "other" ? otherIndex++ : 0);
      const key = `${role}\u0000${s.name}`;
      let e = entries.find((x) => x.key === key);
      if (!e) {
        e = { key, name: s.name, style, values: plots.map(() => ""), empty: true };
        entries.push(e);
      }
      if (e.empty && drawable(plot, s)) e.empty = false;
      if (cursor !== null) {
        const v = interpolateAt(s.x, s.y, cursor, plot.x.scale);
        if (Number.isFinite(v)) e.values[pi] = readoutOnAxis(v, plot.y.unit, span);
      }
    }
  });
  return entries.map(({ name, style, values, empty }) => ({ name, style, values, empty }));
}

/** The legend: one swatch and name per series. */
export function Legend({ entries }: { entries: LegendEntry[] }) {
  if (entries.length === 0) return null;
  return (
    <ul className="m-0 flex list-none flex-wrap items-center gap-x-5 gap-y-1 p-0 text-[12.5px] text-ink-2" aria-label="Legend">
      {entries.map((e, i) => (
        <li key={i} className="inline-flex items-center gap-1.5">
          <Swatch style={e.style} />
          <span>{e.name}</span>
          {e.empty ? <span className="text-ink-3">(no points)</span> : <span className="sr-only">({e.style.words})</span>}
        </li>
      ))}
    </ul>
  );
}

/**
 * The read-out line under the legend: the cursor's x, then each series' value(s) after its
 * swatch; a hint when there is no cursor. Fixed height, so the plot does not jump.
 */
export function Readout({ xText, entries, hint }: { xText: string | null; entries: LegendEntry[]; hint: string }) {
  return (
    <div className="flex min-h-[22px] flex-wrap items-center gap-x-4 gap-y-0.5 text-[12.5px]" data-readout="">
      {xText === null ? (
        <span className="text-ink-3">{hint}</span>
      ) : (
        <>
          <span className="num font-medium text-ink">{xText}</span>
          {entries.map((e, i) =>
            e.values.some((v) => v !== "") ? (
              <span key={i} className="inline-flex items-center gap-1.5">
                <Swatch style={e.style} width={18} />
                <span className="sr-only">{e.name}:</span>
                <span className="num text-ink">{e.values.filter((v) => v !== "").join(" · ")}</span>
              </span>
            ) : null,
          )}
        </>
      )}
    </div>
  );
}

/** Props of the interactive drawing of one laid-out line plot. */
export interface LineSvgProps {
  layout: LineLayout;
  plot: LinePlot;
  cursor: number | null;
  /** Called with the new cursor x (null: none); `viaKeyboard` when an arrow key moved it. */
  onCursor(x: number | null, viaKeyboard: boolean): void;
  /** The x values the cursor snaps to and steps along. */
  grid: number[];
  ariaLabel: string;
  describedBy?: string;
}

/** Keys that move a cursor, and by how many samples. */
export function cursorKeySteps(key: string, shift: boolean): number | null {
  switch (key) {
    case "ArrowRight":
      return shift ? 10 : 1;
    case "ArrowLeft":
      return shift ? -10 : -1;
    case "PageUp":
      return 10;
    case "PageDown":
      return -10;
    case "Home":
      return -Infinity;
    case "End":
      return Infinity;
    default:
      return null;
  }
}

/** The SVG of one line plot: grid, series, crosshair. Focusable; arrow keys move the cursor. */
export function LineSvg({ layout, plot, cursor, onCursor, grid, ariaLabel, describedBy }: LineSvgProps) {
  const clipId = useSvgId("plot-clip");
  const { area, x, y, width, height } = layout;
  const kind = plot.x.scale;

  const onPointerMove = (e: PointerEvent<SVGSVGElement>) => {
    const rect = e.currentTarget.getBoundingClientRect();
    if (rect.width <= 0) return;
    const px = (e.clientX - rect.left) * (width / rect.width);
    if (px < area.left - 12 || px > area.right + 12) return onCursor(null, false);
    const xv = x.scale.invert(Math.max(area.left, Math.min(area.right, px)));
    if (grid.length === 0) return onCursor(Number.isFinite(xv) ? xv : null, false);
    const i = nearestIndex(grid, xv, kind);
    onCursor(i >= 0 ? grid[i] : null, false);
  };
  const onKeyDown = (e: KeyboardEvent<SVGSVGElement>) => {
    if (e.key === "Escape") {
      if (cursor !== null) onCursor(null, true);
      return;
    }
    const steps = cursorKeySteps(e.key, e.shiftKey);
    if (steps === null || grid.length === 0) return;
    e.preventDefault();
    onCursor(stepCursor(grid, cursor, steps, kind), true);
  };

  const cursorPx = cursor === null ? NaN : x.scale.map(cursor);
  const showCursor = Number.isFinite(cursorPx) && cursorPx >= area.left - 0.5 && cursorPx <= area.right + 0.5;

  return (
    <svg
      {...svgRootProps(width, height)}
      role="img"
      aria-label={ariaLabel}
      {...(describedBy ? { "aria-describedby": describedBy } : {})}
      tabIndex={0}
      onPointerMove={onPointerMove}
      onPointerDown={onPointerMove}
      onPointerLeave={() => onCursor(null, false)}
      onKeyDown={onKeyDown}
      onBlur={() => onCursor(null, false)}
      style={{ ...svgRootProps(width, height).style, touchAction: "pan-y" }}
      data-plot-kind="line"
    >
      <defs>
        <clipPath id={clipId}>
          <rect x={area.left} y={area.top} width={area.right - area.left} height={area.bottom - area.top} />
        </clipPath>
      </defs>
      <AreaBackground area={area} />
      <Grid area={area} x={x} y={y} />
      <g clipPath={`url(#${clipId})`} fill="none" strokeLinejoin="round" strokeLinecap="round" data-series-group="">
        {layout.series.map((s) =>
          s.d ? (
            <path key={`p${s.index}`} d={s.d} className={s.style.stroke} strokeWidth={s.style.width} strokeDasharray={s.style.dash} data-role={s.role} data-series={s.name} vectorEffect="non-scaling-stroke" />
          ) : null,
        )}
        {layout.series.flatMap((s) =>
          s.dots.map((p, i) => <circle key={`d${s.index}-${i}`} cx={r1(p.x)} cy={r1(p.y)} r={2.5} className={s.style.fill} data-role={s.role} data-dot="" />),
        )}
      </g>
      <AreaFrame area={area} />
      <AxisLabels area={area} x={x} y={y} width={width} showXAxis={layout.showXAxis} />
      {layout.empty ? (
        <text x={r1((area.left + area.right) / 2)} y={r1((area.top + area.bottom) / 2)} textAnchor="middle" dy="0.34em" className="fill-ink-3" style={{ fontSize: FONT.label }}>
          No points to plot
        </text>
      ) : null}
      {layout.note ? (
        <text x={area.left + 6} y={area.bottom - 6} className="fill-ink-3" style={{ fontSize: FONT.tick }}>
          {layout.note}
        </text>
      ) : null}
      {showCursor ? (
        <g aria-hidden="true" data-cursor="">
          <line x1={crisp(cursorPx)} x2={crisp(cursorPx)} y1={area.top} y2={area.bottom} className="stroke-ink/55" strokeWidth={1} />
          {layout.series.map((s) => {
            const src = plot.series[s.index];
            const yv = interpolateAt(src.x, src.y, cursor as number, kind);
            const py = y.scale.map(yv);
            if (!Number.isFinite(py) || py < area.top - 0.5 || py > area.bottom + 0.5) return null;
            return <circle key={s.index} cx={r1(cursorPx)} cy={r1(py)} r={3.25} className={`fill-sheet ${s.style.stroke}`} strokeWidth={1.5} />;
          })}
        </g>
      ) : null}
    </svg>
  );
}

/** Hint shown in the read-out line while there is no cursor. */
export const READOUT_HINT = "Point at the plot, or focus it and use ← →, to read values.";

/**
 * A line plot with legend, crosshair read-out and an optional data table.
 * Series roles: "ideal" graphite dashed, "real" copper solid, "limit" dotted reference line.
 */
export function LinePlotView({ plot, height = 260, showTitle = true, showDataToggle = true, className }: LinePlotViewProps) {
  const [ref, width] = useContainerWidth();
  const [cursor, setCursor] = useState<number | null>(null);
  const [announce, setAnnounce] = useState("");
  const liveId = useSvgId("plot-live");
  const layout = useMemo(() => layoutLine(plot, { width, height }), [plot, width, height]);
  const grid = useMemo(() => primaryGrid([plot]), [plot]);
  const entries = legendEntries([plot], cursor);
  const xText = cursor === null ? null : readout(cursor, plot.x.unit);
  const onCursor = (xv: number | null, viaKeyboard: boolean) => {
    setCursor(xv);
    if (viaKeyboard) {
      const e = legendEntries([plot], xv);
      setAnnounce(xv === null ? "" : `${readout(xv, plot.x.unit)}: ${e.filter((en) => en.values[0]).map((en) => `${en.name} ${en.values[0]}`).join(", ")}`);
    }
  };
  return (
    <PlotFigure title={plot.title} showTitle={showTitle} showDataToggle={showDataToggle && !layout.empty} tables={() => lineTables(plot)} className={className} legend={<Legend entries={entries} />}>
      {layout.empty ? null : <Readout xText={xText} entries={entries} hint={READOUT_HINT} />}
      <div ref={ref} className="mt-1">
        <LineSvg layout={layout} plot={plot} cursor={cursor} onCursor={onCursor} grid={grid} ariaLabel={summariseLine(plot)} describedBy={liveId} />
      </div>
      <p id={liveId} className="sr-only" aria-live="polite">
        {announce}
      </p>
    </PlotFigure>
  );
}
