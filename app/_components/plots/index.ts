/**
 * The calculation sheet's plots. Import from "@/app/_components/plots".
 *
 * - <PlotView plot /> any engine Plot by kind (line, histogram, levels)
 * - <PlotList plots /> a compute's plots in order, Bode halves joined (rules: ./bode.ts)
 * - <BodePair magnitude phase /> magnitude above phase, shared frequency axis and crosshair
 * - <LinePlotView plot />, <HistogramView plot />, <LevelsView plot /> the single kinds
 * Common props: height (px), showTitle (default true), showDataToggle (default true), className.
 */
export { PlotView, PlotList, type PlotViewProps, type PlotListProps } from "./PlotView";
export { BodePair, type BodePairProps } from "./BodePair";
export { LinePlotView, type LinePlotViewProps } from "./LineChart";
export { HistogramView, type HistogramViewProps } from "./HistogramChart";
export { LevelsView, type LevelsViewProps } from "./LevelsChart";
export { groupPlots, bodeRole, canPair, type SheetPlotItem } from "./bode";
