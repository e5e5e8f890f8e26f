"use client";
/**
 * Pieces every plot component shares: the measured container width, the figure frame with its
 * title and "Show data" toggle, the axes and grid, series swatches.
 */
import { useEffect, useId, useRef, useState, type ReactNode, type RefObject } from "react";
import { buttonClass, cx } from "../ui";
import type { DataTable } from "./dataTable";
import type { Area, AxisLayout } from "./lineLayout";
import { r1 } from "./path";
import { FONT, textWidth, type SeriesStyle } from "./theme";

/** Width used before the container is measured (server render, first paint), px. */
export const DEFAULT_WIDTH = 640;

/**
 * Width of a container, px, followed with a ResizeObserver; DEFAULT_WIDTH until measured. The
 * SVG keeps a viewBox so it scales meanwhile; once measured, one SVG unit is one CSS pixel.
 */
export function useContainerWidth(): [RefObject<HTMLDivElement | null>, number] {
  const ref = useRef<HTMLDivElement | null>(null);
  const [width, setWidth] = useState(DEFAULT_WIDTH);
  useEffect(() => {
    const el = ref.current;
    if (!el || typeof ResizeObserver === "undefined") return;
    const measure = () => {
      const w = Math.round(el.getBoundingClientRect().width);
      if (w > 0) setWidth(Math.max(240, w));
    };
    measure();
    const ro = new ResizeObserver(measure);
    ro.observe(el);
    return () => ro.disconnect();
  }, []);
  return [ref, width];
}

/** An id usable in url(#…) references (React's ids may hold characters SVG urls dislike). */
export function useSvgId(prefix: string): string {
  return `${prefix}-${useId().replace(/[^a-zA-Z0-9_-]/g, "")}`;
}

/** Half-pixel alignment so 1 px lines are crisp. */
export function crisp(v: number): number {
  return Math.round(v - 0.5) + 0.5;
}

/** A short sample of a series' stroke, for legends and read-outs. */
export function Swatch({ style, width = 26 }: { style: SeriesStyle; width?: number }) {
  return (
    <svg width={width} height={10} viewBox={`0 0 ${width} 10`} aria-hidden="true" className="inline-block shrink-0 align-middle" focusable="false">
      <line x1={1} y1={5} x2={width - 1} y2={5} className={style.stroke} strokeWidth={style.width} strokeDasharray={style.dash} strokeLinecap="butt" />
    </svg>
  );
}

/** The figure around a plot: title, "Show data" toggle, the drawing, the table when shown. */
export function PlotFigure({
  title,
  showTitle,
  showDataToggle,
  tables,
  children,
  legend,
  footer,
  className,
}: {
  title: string;
  /** Legend: beside the "Show data" button when the title is hidden, else under the title. */
  legend?: ReactNode;
  showTitle: boolean;
  showDataToggle: boolean;
  tables: () => DataTable[];
  children: ReactNode;
  footer?: ReactNode;
  className?: string;
}) {
  const [open, setOpen] = useState(false);
  const tableId = useSvgId("plot-data");
  return (
    <figure className={cx("m-0 min-w-0", className)} data-plot-figure="">
      {showTitle || showDataToggle || legend ? (
        <figcaption className="mb-1 flex items-start justify-between gap-3">
          <div className="min-w-0 pt-1">{showTitle ? <span className="text-[13px] font-medium text-ink">{title}</span> : legend}</div>
          {showDataToggle ? (
            <button type="button" className={cx(buttonClass("quiet", "sm"), "-mr-2 shrink-0")} aria-expanded={open} aria-controls={tableId} onClick={() => setOpen((o) => !o)}>
              {open ? "Hide data" : "Show data"}
            </button>
          ) : null}
        </figcaption>
      ) : null}
      {showTitle && legend ? <div className="mb-0.5">{legend}</div> : null}
      {children}
      {footer}
      {showDataToggle && open ? (
        <div id={tableId} className="mt-2 max-h-80 overflow-auto rounded-md border border-rule bg-white/60">
          {tables().map((t, i) => (
            <table key={i} className="table-dense text-[12.5px]">
              <caption className="px-2.5 pt-2 pb-1 text-left text-[12px] text-ink-2">
                {t.caption}
                {t.note ? <span className="text-ink-3"> · {t.note}</span> : null}
              </caption>
              <thead>
                <tr>
                  {t.columns.map((c, j) => (
                    <th key={j} scope="col" className={c.numeric ? "num" : undefined}>
                      {c.label}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {t.rows.map((r, j) => (
                  <tr key={j}>
                    {r.map((cell, k) => (
                      <td key={k} className={t.columns[k]?.numeric ? "num" : undefined}>
                        {cell}
                      </td>
                    ))}
                  </tr>
                ))}
              </tbody>
            </table>
          ))}
        </div>
      ) : null}
    </figure>
  );
}

/** Plot area background and frame (drawn below the data). */
export function AreaBackground({ area }: { area: Area }) {
  return <rect x={crisp(area.left)} y={crisp(area.top)} width={Math.round(area.right - area.left)} height={Math.round(area.bottom - area.top)} className="fill-white/70" />;
}

/** Plot area frame (drawn above the data). */
export function AreaFrame({ area }: { area: Area }) {
  return <rect x={crisp(area.left)} y={crisp(area.top)} width={Math.round(area.right - area.left)} height={Math.round(area.bottom - area.top)} fill="none" className="stroke-rule-strong" strokeWidth={1} />;
}

/** Grid lines of both axes (below the data). */
export function Grid({ area, x, y }: { area: Area; x: AxisLayout; y: AxisLayout }) {
  return (
    <g aria-hidden="true">
      {x.ticks
        .filter((t) => Number.isFinite(t.px) && t.px > area.left + 0.5 && t.px < area.right - 0.5)
        .map((t, i) => (
          <line key={`x${i}`} x1={crisp(t.px)} x2={crisp(t.px)} y1={area.top} y2={area.bottom} className={t.major ? "stroke-rule-strong" : "stroke-rule/70"} strokeWidth={1} />
        ))}
      {y.ticks
        .filter((t) => Number.isFinite(t.px) && t.px > area.top + 0.5 && t.px < area.bottom - 0.5)
        .map((t, i) => (
          <line
            key={`y${i}`}
            x1={area.left}
            x2={area.right}
            y1={crisp(t.px)}
            y2={crisp(t.px)}
            className={t.value === 0 && y.kind === "linear" ? "stroke-ink-3/60" : t.major ? "stroke-rule-strong/80" : "stroke-rule/70"}
            strokeWidth={1}
          />
        ))}
    </g>
  );
}

/** Tick labels and titles of both axes. */
export function AxisLabels({ area, x, y, width, showXAxis }: { area: Area; x: AxisLayout; y: AxisLayout; width: number; showXAxis: boolean }) {
  return (
    <g className="fill-ink-2" style={{ fontSize: FONT.tick }}>
      {y.ticks
        .filter((t) => t.text !== undefined && Number.isFinite(t.px))
        .map((t, i) => (
          <text key={`yl${i}`} x={area.left - 6} y={r1(t.px)} dy="0.34em" textAnchor="end">
            {t.text}
          </text>
        ))}
      <text x={2} y={area.top - 9} textAnchor="start" className="fill-ink-2" style={{ fontSize: FONT.title, fontWeight: 500 }}>
        {y.title}
      </text>
      {showXAxis ? (
        <>
          {x.ticks
            .filter((t) => t.text !== undefined && Number.isFinite(t.px))
            .map((t, i) => {
              const w = textWidth(t.text ?? "");
              const anchor = t.px + w / 2 > width - 1 ? "end" : t.px - w / 2 < 1 ? "start" : "middle";
              return (
                <text key={`xl${i}`} x={anchor === "end" ? width - 1 : anchor === "start" ? 1 : r1(t.px)} y={area.bottom + 15} textAnchor={anchor}>
                  {t.text}
                </text>
              );
            })}
          <text x={r1((area.left + area.right) / 2)} y={area.bottom + 32} textAnchor="middle" className="fill-ink-2" style={{ fontSize: FONT.title, fontWeight: 500 }}>
            {x.title}
          </text>
        </>
      ) : null}
    </g>
  );
}

/** Root SVG attributes every plot shares: responsive, our font, tabular digits. */
export function svgRootProps(width: number, height: number) {
  return {
    viewBox: `0 0 ${width} ${height}`,
    width: "100%",
    preserveAspectRatio: "xMinYMin meet",
    className: "block h-auto w-full select-none overflow-visible",
    style: { fontFamily: "var(--font-sans)", fontVariantNumeric: "tabular-nums" as const },
  };
}
