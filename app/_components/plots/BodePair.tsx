"use client";
/**
 * A Bode pair: magnitude (dB) above phase (°), one log frequency axis, aligned plot areas, one
 * legend and one crosshair read-out for both. Which plots pair up: see ./bode.ts.
 */
import { useMemo, useState } from "react";
import type { LinePlot } from "@/lib/calc/core/types";
import { lineTables } from "./dataTable";
import { readout } from "./format";
import { Legend, LineSvg, READOUT_HINT, Readout, legendEntries, primaryGrid } from "./LineChart";
import { layoutLine, lineXDomain, yAxisSpec, yMargin } from "./lineLayout";
import { PlotFigure, useContainerWidth, useSvgId } from "./parts";
import { summariseLine } from "./summary";

/** Props of {@link BodePair}. */
export interface BodePairProps {
  /** Magnitude plot: y in dB against log frequency. */
  magnitude: LinePlot;
  /** Phase plot: y in degrees against the same frequency axis. */
  phase: LinePlot;
  /** Title above the pair (default "Frequency response"). */
  title?: string;
  /** Heights of the magnitude and phase drawings, px (default 230 and 200). */
  heights?: [number, number];
  showTitle?: boolean;
  showDataToggle?: boolean;
  className?: string;
}

/** Vertical space the upper drawing leaves out at its foot (no x labels), px. */
const BARE_FOOT = 8;
const TOP = 22;
const AXIS_FOOT = 40;

/** Magnitude above phase with a shared frequency axis and crosshair. */
export function BodePair({ magnitude, phase, title = "Frequency response", heights = [230, 200], showTitle = true, showDataToggle = true, className }: BodePairProps) {
  const [ref, width] = useContainerWidth();
  const [cursor, setCursor] = useState<number | null>(null);
  const [announce, setAnnounce] = useState("");
  const liveId = useSvgId("plot-live");
  const [hMag, hPh] = heights;
  const plots = useMemo(() => [magnitude, phase], [magnitude, phase]);
  const layouts = useMemo(() => {
    const xDomain = lineXDomain(plots);
    const marginLeft = Math.max(yMargin(yAxisSpec(magnitude, hMag - TOP - BARE_FOOT)), yMargin(yAxisSpec(phase, hPh - TOP - AXIS_FOOT)));
    return [
      layoutLine(magnitude, { width, height: hMag, xDomain, marginLeft, showXAxis: false }),
      layoutLine(phase, { width, height: hPh, xDomain, marginLeft, showXAxis: true }),
    ] as const;
  }, [plots, magnitude, phase, width, hMag, hPh]);
  const grid = useMemo(() => primaryGrid(plots), [plots]);
  const entries = legendEntries(plots, cursor);
  const unit = magnitude.x.unit;
  const onCursor = (xv: number | null, viaKeyboard: boolean) => {
    setCursor(xv);
    if (viaKeyboard) {
      const e = legendEntries(plots, xv);
      setAnnounce(xv === null ? "" : `${readout(xv, unit)}: ${e
              .filter((en) => en.values.some(Boolean))
              .map((en) => `${en.name} ${en.values.filter(Boolean).join(", ")}`)
              .join("; ")}`);
    }
  };
  const tables = () =>
    plots.flatMap((p) => lineTables(p).map((t) => ({ ...t, caption: `${p.title}: ${t.caption}` })));
  return (
    <PlotFigure title={title} showTitle={showTitle} showDataToggle={showDataToggle} tables={tables} className={className} legend={<Legend entries={entries} />}>
      <Readout xText={cursor === null ? null : readout(cursor, unit)} entries={entries} hint={READOUT_HINT} />
      <div ref={ref} className="mt-1 flex flex-col gap-1" data-bode-pair="">
        <LineSvg layout={layouts[0]} plot={magnitude} cursor={cursor} onCursor={onCursor} grid={grid} ariaLabel={summariseLine(magnitude)} describedBy={liveId} />
        <LineSvg layout={layouts[1]} plot={phase} cursor={cursor} onCursor={onCursor} grid={grid} ariaLabel={summariseLine(phase)} describedBy={liveId} />
      </div>
      <p id={liveId} className="sr-only" aria-live="polite">
        {announce}
      </p>
    </PlotFigure>
  );
}
