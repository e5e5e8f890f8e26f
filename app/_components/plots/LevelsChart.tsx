"use client";
/**
 * Levels on one voltage axis (output swing against the rails): rails, output limits, signal
 * peaks and bias as labelled horizontal lines; the part's allowed output band as a wide box and
 * the required signal band as a narrower box inside it. Whether the required band fits is said
 * in words under the drawing (and in the SVG's label), and any part outside is marked and
 * labelled in the drawing, so it never rests on colour alone.
 */
import { useMemo } from "react";
import type { LevelsPlot } from "@/lib/calc/core/types";
import { levelsTables } from "./dataTable";
import { keepUnits, readout } from "./format";
import { layoutLevels, type LevelLayout } from "./levelsLayout";
import { r1 } from "./path";
import { AreaBackground, AreaFrame, PlotFigure, crisp, svgRootProps, useContainerWidth, useSvgId } from "./parts";
import { fitSentence, summariseLevels } from "./summary";
import { FONT } from "./theme";

/** Props of {@link LevelsView}. */
export interface LevelsViewProps {
  plot: LevelsPlot;
  /** Height of the drawing, px (default 300). */
  height?: number;
  showTitle?: boolean;
  showDataToggle?: boolean;
  className?: string;
}

const LEVEL_STYLE: Record<LevelLayout["role"], { className: string; width: number; dash?: string }> = {
  rail: { className: "stroke-ink", width: 2 },
  limit: { className: "stroke-ink-2", width: 1, dash: "5 3" },
  signal: { className: "stroke-copper", width: 1.25 },
  bias: { className: "stroke-ink-2", width: 1, dash: "1.5 2.5" },
};

const BAND_STYLE = {
  allowed: { fill: "fill-ink-3/15", stroke: "stroke-ink-3", width: 1 },
  required: { fill: "fill-copper/20", stroke: "stroke-copper", width: 1.25 },
} as const;

/** A small box in a band's style, for the legend under the drawing. */
function BandSwatch({ role }: { role: "allowed" | "required" }) {
  const st = BAND_STYLE[role];
  return (
    <svg width={22} height={12} viewBox="0 0 22 12" aria-hidden="true" className="inline-block shrink-0 align-middle">
      <rect x={1} y={1} width={20} height={10} className={`${st.fill} ${st.stroke}`} strokeWidth={st.width} />
    </svg>
  );
}

/** The levels plot with its band legend, fit sentence and optional data table. */
export function LevelsView({ plot, height = 300, showTitle = true, showDataToggle = true, className }: LevelsViewProps) {
  const [ref, width] = useContainerWidth();
  const hatchId = useSvgId("rail-hatch");
  const outId = useSvgId("out-hatch");
  const layout = useMemo(() => layoutLevels(plot, { width, height }), [plot, width, height]);
  const { area, y, levels, bands, overshoots, fit, labelX } = layout;
  const sentence = fit ? keepUnits(fitSentence(fit, plot.unit, false)) : null;
  const [word, rest] = sentence ? [sentence.slice(0, sentence.indexOf(":")), sentence.slice(sentence.indexOf(":") + 1)] : ["", ""];

  return (
    <PlotFigure
      title={plot.title}
      showTitle={showTitle}
      showDataToggle={showDataToggle}
      tables={() => levelsTables(plot)}
      className={className}
      footer={
        <div className="mt-1.5 text-[12.5px]">
          {bands.length > 0 ? (
            <ul className="m-0 flex list-none flex-wrap gap-x-5 gap-y-1 p-0 text-ink-2" aria-label="Bands">
              {bands.map((b, i) => (
                <li key={i} className="inline-flex items-center gap-1.5">
                  <BandSwatch role={b.role} />
                  <span>{b.label}</span>
                  <span className="num text-ink">
                    {layout.format(b.from)} to {layout.format(b.to)}
                  </span>
                </li>
              ))}
            </ul>
          ) : null}
        </div>
      }
    >
      {sentence ? (
        <p className="m-0 mb-1.5 text-[13px] text-ink" data-fit={fit?.fits ? "fits" : "does-not-fit"}>
          <strong className="font-semibold">{word}</strong>:{rest}
        </p>
      ) : null}
      <div ref={ref}>
        <svg {...svgRootProps(width, height)} role="img" aria-label={summariseLevels(plot)} data-plot-kind="levels">
          <defs>
            <pattern id={hatchId} width={6} height={6} patternUnits="userSpaceOnUse" patternTransform="rotate(45)">
              <line x1={0} y1={0} x2={0} y2={6} className="stroke-rule-strong" strokeWidth={1.5} />
            </pattern>
            <pattern id={outId} width={5} height={5} patternUnits="userSpaceOnUse" patternTransform="rotate(-45)">
              <line x1={0} y1={0} x2={0} y2={5} className="stroke-fail" strokeWidth={1.5} />
            </pattern>
          </defs>
          <AreaBackground area={area} />
          {layout.railTop !== undefined && layout.railTop > area.top ? (
            <rect x={area.left} y={area.top} width={area.right - area.left} height={layout.railTop - area.top} fill={`url(#${hatchId})`} data-rail-hatch="top" />
          ) : null}
          {layout.railBottom !== undefined && layout.railBottom < area.bottom ? (
            <rect x={area.left} y={layout.railBottom} width={area.right - area.left} height={area.bottom - layout.railBottom} fill={`url(#${hatchId})`} data-rail-hatch="bottom" />
          ) : null}
          {y.ticks.map((t, i) => (
            <g key={i}>
              <line x1={area.left - 4} x2={area.left} y1={crisp(t.px)} y2={crisp(t.px)} className="stroke-ink-3" strokeWidth={1} />
              <text x={area.left - 7} y={r1(t.px)} dy="0.34em" textAnchor="end" className="fill-ink-2" style={{ fontSize: FONT.tick }}>
                {t.text}
              </text>
            </g>
          ))}
          <text x={2} y={area.top - 10} className="fill-ink-2" style={{ fontSize: FONT.title, fontWeight: 500 }}>
            {y.title}
          </text>
          <g data-bands="">
            {bands.map((b, i) => {
              const st = BAND_STYLE[b.role];
              return <rect key={i} x={r1(b.x)} y={r1(b.y)} width={r1(b.w)} height={r1(b.h)} className={`${st.fill} ${st.stroke}`} strokeWidth={st.width} data-band={b.role} />;
            })}
            {overshoots.map((o, i) => (
              <g key={i} data-overshoot={o.side}>
                <rect x={r1(o.x)} y={r1(o.y)} width={r1(o.w)} height={r1(o.h)} fill={`url(#${outId})`} className="stroke-fail" strokeWidth={1.25} />
                <text
                  x={r1(o.x + o.w / 2)}
                  y={r1(o.side === "top" ? o.y + o.h + 4 : o.y - 4)}
                  dy={o.side === "top" ? "0.8em" : "-0.1em"}
                  textAnchor="middle"
                  className="fill-fail"
                  style={{ fontSize: FONT.tick, fontWeight: 600 }}
                >
                  {`${o.side === "top" ? "▲" : "▼"} ${readout(o.by, plot.unit)} outside`}
                </text>
              </g>
            ))}
          </g>
          <g data-levels="">
            {levels.map((l, i) => {
              const st = LEVEL_STYLE[l.role];
              const ly = l.role === "rail" ? r1(l.y) : crisp(l.y);
              return (
                <g key={i} data-level={l.role}>
                  <line x1={area.left} x2={area.right} y1={ly} y2={ly} className={st.className} strokeWidth={st.width} strokeDasharray={st.dash} />
                  <polyline
                    points={`${r1(area.right)},${ly} ${r1(area.right + 8)},${ly} ${r1(labelX - 8)},${r1(l.labelY)} ${r1(labelX - 3)},${r1(l.labelY)}`}
                    fill="none"
                    className="stroke-ink-3"
                    strokeWidth={0.75}
                  />
                  <text x={r1(labelX)} y={r1(l.labelY)} dy="0.34em" className={l.role === "rail" ? "fill-ink" : "fill-ink-2"} style={{ fontSize: FONT.label, fontWeight: l.role === "rail" ? 500 : 400 }}>
                    {l.label}
                  </text>
                  <text x={width - 2} y={r1(l.labelY)} dy="0.34em" textAnchor="end" className="fill-ink" style={{ fontSize: FONT.label }}>
                    {l.valueText}
                  </text>
                </g>
              );
            })}
          </g>
          <AreaFrame area={area} />
          {layout.empty ? (
            <text x={r1((area.left + area.right) / 2)} y={r1((area.top + area.bottom) / 2)} textAnchor="middle" dy="0.34em" className="fill-ink-3" style={{ fontSize: FONT.label }}>
              No levels to plot
            </text>
          ) : null}
        </svg>
      </div>
    </PlotFigure>
  );
}
