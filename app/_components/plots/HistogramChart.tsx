"use client";
/**
 * Monte Carlo histogram: bars over the value axis, a count axis, markers as labelled vertical
 * lines (spec limits dashed, percentiles dotted, nominal/mean/target solid), and a read-out of
 * the bin under the pointer or selected with the arrow keys.
 */
import { useMemo, useState, type KeyboardEvent, type PointerEvent } from "react";
import type { HistogramPlot } from "@/lib/calc/core/types";
import { histogramTables } from "./dataTable";
import { readout } from "./format";
import { layoutHistogram, type MarkerKind } from "./histogramLayout";
import { cursorKeySteps } from "./LineChart";
import { r1 } from "./path";
import { AreaBackground, AreaFrame, AxisLabels, Grid, PlotFigure, svgRootProps, useContainerWidth, useSvgId } from "./parts";
import { summariseHistogram } from "./summary";
import { FONT } from "./theme";

/** Props of {@link HistogramView}. */
export interface HistogramViewProps {
  plot: HistogramPlot;
  /** Height of the drawing, px (default 250). */
  height?: number;
  showTitle?: boolean;
  showDataToggle?: boolean;
  className?: string;
}

const MARKER_STYLE: Record<MarkerKind, { className: string; width: number; dash?: string; words: string }> = {
  centre: { className: "stroke-ink", width: 1.25, words: "solid line" },
  limit: { className: "stroke-ink", width: 1.25, dash: "5 3", words: "dashed line" },
  percentile: { className: "stroke-ink-2", width: 1.25, dash: "1.5 2.5", words: "dotted line" },
};

/**
 * The key to the marker line styles, naming the markers of each style present, e.g.
 * "Dashed: lower spec limit, upper spec limit · dotted: …"; empty when all markers look alike.
 */
export function markerKey(markers: Array<{ label: string; kind: MarkerKind }>): string {
  const kinds: MarkerKind[] = ["limit", "percentile", "centre"];
  const words: Record<MarkerKind, string> = { limit: "dashed", percentile: "dotted", centre: "solid" };
  const parts = kinds
    .map((k) => ({ k, labels: markers.filter((m) => m.kind === k).map((m) => m.label) }))
    .filter((p) => p.labels.length > 0)
    .map((p) => `${words[p.k]}: ${p.labels.join(", ")}`);
  if (parts.length < 2) return "";
  const text = parts.join(" · ");
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** Text of the read-out for one bin. */
export function binReadout(plot: HistogramPlot, index: number, total: number): string {
  const unit = plot.x.unit;
  const c = plot.counts[index];
  const share = total > 0 ? ` (${readout((c / total) * 100, "%", 3)})` : "";
  return `${readout(plot.edges[index], unit)} to ${readout(plot.edges[index + 1], unit)}: ${c} ${c === 1 ? "sample" : "samples"}${share}`;
}

/** A histogram with markers, bin read-out and an optional data table. */
export function HistogramView({ plot, height = 250, showTitle = true, showDataToggle = true, className }: HistogramViewProps) {
  const [ref, width] = useContainerWidth();
  const [bin, setBin] = useState<number | null>(null);
  const [announce, setAnnounce] = useState("");
  const liveId = useSvgId("plot-live");
  const clipId = useSvgId("plot-clip");
  const layout = useMemo(() => layoutHistogram(plot, { width, height }), [plot, width, height]);
  const { area, x, y, bars, markers } = layout;
  const pos = bin === null ? -1 : bars.findIndex((b) => b.index === bin);

  const select = (next: number | null, viaKeyboard: boolean) => {
    setBin(next);
    if (viaKeyboard) setAnnounce(next === null ? "" : binReadout(plot, next, layout.total));
  };
  const onPointerMove = (e: PointerEvent<SVGSVGElement>) => {
    const rect = e.currentTarget.getBoundingClientRect();
    if (rect.width <= 0) return;
    const px = (e.clientX - rect.left) * (width / rect.width);
    const hit = bars.find((b) => px >= b.x && px <= b.x + b.w);
    select(hit ? hit.index : null, false);
  };
  const onKeyDown = (e: KeyboardEvent<SVGSVGElement>) => {
    if (e.key === "Escape") return select(null, true);
    const steps = cursorKeySteps(e.key, e.shiftKey);
    if (steps === null || bars.length === 0) return;
    e.preventDefault();
    let j: number;
    if (steps === Infinity) j = bars.length - 1;
    else if (steps === -Infinity) j = 0;
    else if (pos < 0) j = steps > 0 ? 0 : bars.length - 1;
    else j = Math.max(0, Math.min(bars.length - 1, pos + steps));
    select(bars[j].index, true);
  };

  const key = markerKey(markers);
  return (
    <PlotFigure title={plot.title} showTitle={showTitle} showDataToggle={showDataToggle && !layout.empty} tables={() => histogramTables(plot)} className={className}>
      <div className={layout.empty ? "hidden" : "flex min-h-[22px] flex-wrap items-center gap-x-4 text-[12.5px]"} data-readout="">
        {bin === null ? (
          <span className="text-ink-3">Point at a bar, or focus the plot and use ← →, to read its count.</span>
        ) : (
          <span className="num text-ink">{binReadout(plot, bin, layout.total)}</span>
        )}
      </div>
      <div ref={ref} className="mt-1">
        <svg
          {...svgRootProps(width, height)}
          style={{ ...svgRootProps(width, height).style, touchAction: "pan-y" }}
          role="img"
          aria-label={summariseHistogram(plot)}
          aria-describedby={liveId}
          tabIndex={0}
          onPointerMove={onPointerMove}
          onPointerDown={onPointerMove}
          onPointerLeave={() => select(null, false)}
          onBlur={() => select(null, false)}
          onKeyDown={onKeyDown}
          data-plot-kind="histogram"
        >
          <defs>
            <clipPath id={clipId}>
              <rect x={area.left} y={area.top} width={area.right - area.left} height={area.bottom - area.top} />
            </clipPath>
          </defs>
          <AreaBackground area={area} />
          <Grid area={area} x={x} y={y} />
          {pos >= 0 ? (
            <rect x={r1(bars[pos].x)} y={area.top} width={r1(Math.max(1, bars[pos].w))} height={area.bottom - area.top} className="fill-ink/8" aria-hidden="true" data-selected-bin="" />
          ) : null}
          <g clipPath={`url(#${clipId})`} data-bars="">
            {bars.map((b) => (
              <rect
                key={b.index}
                x={r1(b.x)}
                y={r1(b.y)}
                width={r1(Math.max(0.5, b.w))}
                height={r1(Math.max(0, b.h))}
                className={`${b.index === bin ? "fill-ink-2/70" : "fill-ink-3/40"} ${b.w >= 4 ? "stroke-sheet" : ""}`}
                strokeWidth={b.w >= 4 ? 1 : 0}
                data-count={b.count}
              />
            ))}
          </g>
          <g data-markers="">
            {markers.map((m, i) => {
              const st = MARKER_STYLE[m.kind];
              return <line key={i} x1={r1(m.px)} x2={r1(m.px)} y1={area.top} y2={area.bottom} className={st.className} strokeWidth={st.width} strokeDasharray={st.dash} data-marker={m.label} />;
            })}
            {markers.map((m, i) =>
              m.text ? (
                <text key={`t${i}`} x={r1(m.textX)} y={r1(m.textY)} textAnchor={m.anchor} className="fill-ink stroke-white" strokeWidth={3} paintOrder="stroke" strokeLinejoin="round" style={{ fontSize: FONT.tick }}>
                  {m.text}
                </text>
              ) : null,
            )}
          </g>
          <AreaFrame area={area} />
          <AxisLabels area={area} x={x} y={y} width={width} showXAxis />
          {layout.empty ? (
            <text x={r1((area.left + area.right) / 2)} y={r1((area.top + area.bottom) / 2)} textAnchor="middle" dy="0.34em" className="fill-ink-3" style={{ fontSize: FONT.label }}>
              No samples to plot
            </text>
          ) : null}
        </svg>
      </div>
      {key ? <p className="mt-1 text-[12px] text-ink-3">{key}</p> : null}
      <p id={liveId} className="sr-only" aria-live="polite">
        {announce}
      </p>
    </PlotFigure>
  );
}
