"use client";
/**
 * One entry point for the calculation sheet: <PlotView plot={plot} /> draws any engine plot by
 * its kind; <PlotList plots={plots} /> draws a compute's plots in order with Bode halves joined
 * into one <BodePair> (matching rules in ./bode.ts).
 */
import type { Plot } from "@/lib/calc/core/types";
import { BodePair } from "./BodePair";
import { groupPlots } from "./bode";
import { HistogramView } from "./HistogramChart";
import { LevelsView } from "./LevelsChart";
import { LinePlotView } from "./LineChart";
import { cx } from "../ui";

/** Props of {@link PlotView}. */
export interface PlotViewProps {
  plot: Plot;
  /** Height of the drawing, px (defaults: line 260, histogram 250, levels 300). */
  height?: number;
  /** Show the plot's title above it (default true). */
  showTitle?: boolean;
  /** Offer the "Show data" table (default true). */
  showDataToggle?: boolean;
  className?: string;
}

/** Draw one plot by its kind. */
export function PlotView({ plot, ...rest }: PlotViewProps) {
  switch (plot.kind) {
    case "line":
      return <LinePlotView plot={plot} {...rest} />;
    case "histogram":
      return <HistogramView plot={plot} {...rest} />;
    case "levels":
      return <LevelsView plot={plot} {...rest} />;
  }
}

/** Props of {@link PlotList}. */
export interface PlotListProps {
  plots: Plot[];
  /** Classes of the list container (default: a column with gaps). */
  className?: string;
  /** Classes of each item's wrapper. */
  itemClassName?: string;
  showDataToggle?: boolean;
}

/** A compute's plots, in order, Bode halves drawn as one pair. */
export function PlotList({ plots, className, itemClassName, showDataToggle = true }: PlotListProps) {
  return (
    <div className={cx("flex flex-col gap-6", className)} data-plot-list="">
      {groupPlots(plots).map((item) => (
        <div key={item.key} className={itemClassName}>
          {item.kind === "bode" ? (
            <BodePair magnitude={item.magnitude} phase={item.phase} showDataToggle={showDataToggle} />
          ) : (
            <PlotView plot={item.plot} showDataToggle={showDataToggle} />
          )}
        </div>
      ))}
    </div>
  );
}
