"use client";
/**
 * The sheet's plots, through the plots module (app/_components/plots): Bode halves drawn as one
 * pair, every other plot by its kind. One place to adapt if that module's API changes.
 */
import type { Plot } from "@/lib/calc/core/types";
import { BodePair, PlotView, groupPlots, type SheetPlotItem } from "../plots";

export { groupPlots, type SheetPlotItem };

/** One item of the sheet's plot list: a Bode pair or a single plot. */
export function SheetPlot({ item }: { item: SheetPlotItem }) {
  return item.kind === "bode" ? <BodePair magnitude={item.magnitude} phase={item.phase} /> : <PlotView plot={item.plot} />;
}

/** A single plot (e.g. the streamed Monte Carlo histograms). */
export function SinglePlot({ plot }: { plot: Plot }) {
  return <PlotView plot={plot} />;
}
