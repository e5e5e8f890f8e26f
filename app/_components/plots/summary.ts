/**
 * Plain-English summaries of plots (the aria-label of each plot's SVG) and the fit of a required
 * band inside an allowed band (levels plots). Pure.
 */
import type { HistogramPlot, LevelsPlot, LinePlot } from "@/lib/calc/core/types";
import { readout } from "./format";
import { extent, isPlottable } from "./scale";

const ROLE_WORDS: Record<string, string> = { ideal: "ideal", real: "real", limit: "limit", other: "" };

/**
 * Summary of a line plot: what is plotted against what, over which range, and each series'
 * range of values.
 * @param plot the plot
 * @example "Magnitude response. Gain in dB against frequency (log scale), 10 Hz to 10 MHz. …"
 */
export function summariseLine(plot: LinePlot): string {
  const xs = plot.series.flatMap((s) => s.x);
  const xe = extent(xs, plot.x.scale);
  const scaleWords = plot.x.scale === "log" ? " (log scale)" : "";
  const unitWords = plot.y.unit ? ` in ${plot.y.unit}` : "";
  const head = `${plot.title}. ${plot.y.label}${unitWords} against ${plot.x.label.toLowerCase()}${scaleWords}`;
  const range = xe ? `, ${readout(xe[0], plot.x.unit)} to ${readout(xe[1], plot.x.unit)}` : "";
  if (plot.series.length === 0) return `${head}. No series.`;
  const parts = plot.series.map((s) => {
    const ys: number[] = [];
    const n = Math.min(s.x.length, s.y.length);
    for (let i = 0; i < n; i++) if (isPlottable(s.x[i], plot.x.scale)) ys.push(s.y[i]);
    const ye = extent(ys, plot.y.scale);
    const role = ROLE_WORDS[s.role ?? "other"];
    const name = role ? `${s.name} (${role})` : s.name;
    if (!ye) return `${name}: no points`;
    if (ye[0] === ye[1]) return `${name}: ${readout(ye[0], plot.y.unit)}`;
    return `${name}: ${readout(ye[0], plot.y.unit)} to ${readout(ye[1], plot.y.unit)}`;
  });
  return `${head}${range}. ${plot.series.length} series: ${parts.join("; ")}.`;
}

/**
 * Summary of a histogram: samples, bins, range, the fullest bin and the markers.
 * @param plot the plot
 */
export function summariseHistogram(plot: HistogramPlot): string {
  const bins = Math.min(plot.counts.length, Math.max(0, plot.edges.length - 1));
  const total = plot.counts.slice(0, bins).reduce((a, c) => a + (Number.isFinite(c) ? c : 0), 0);
  const unit = plot.x.unit;
  const head = `${plot.title}. Histogram of ${plot.x.label.toLowerCase()}`;
  if (bins === 0 || total === 0) return `${head}: no samples.`;
  let mode = 0;
  for (let i = 1; i < bins; i++) if (plot.counts[i] > plot.counts[mode]) mode = i;
  const markers = (plot.markers ?? []).map((m) => `${m.label} ${readout(m.value, unit)}`);
  return (
    `${head}: ${total} samples in ${bins} bins from ${readout(plot.edges[0], unit)} to ${readout(plot.edges[bins], unit)}; ` +
    `most samples (${plot.counts[mode]}) between ${readout(plot.edges[mode], unit)} and ${readout(plot.edges[mode + 1], unit)}.` +
    (markers.length ? ` Markers: ${markers.join(", ")}.` : "")
  );
}

/** How a required band sits in an allowed band. */
export interface BandFit {
  /** True when the required band lies inside the allowed band (edges may touch). */
  fits: boolean;
  /** Room between the required top and the allowed top (negative: the required band sticks out), data units. */
  spareTop: number;
  /** Room between the allowed bottom and the required bottom (negative: sticks out), data units. */
  spareBottom: number;
  required: { label: string; lo: number; hi: number };
  allowed: { label: string; lo: number; hi: number };
}

/**
 * Whether the first "required" band fits inside the first "allowed" band.
 * @param plot the levels plot
 * @returns the fit, or null when the plot lacks either band
 */
export function bandFit(plot: LevelsPlot): BandFit | null {
  const req = plot.bands?.find((b) => b.role === "required");
  const all = plot.bands?.find((b) => b.role === "allowed");
  if (!req || !all) return null;
  const r = { label: req.label, lo: Math.min(req.from, req.to), hi: Math.max(req.from, req.to) };
  const a = { label: all.label, lo: Math.min(all.from, all.to), hi: Math.max(all.from, all.to) };
  const spareTop = a.hi - r.hi;
  const spareBottom = r.lo - a.lo;
  return { fits: spareTop >= 0 && spareBottom >= 0, spareTop, spareBottom, required: r, allowed: a };
}

/**
 * The fit as one sentence, starting with "Fits" or "Does not fit".
 * @param fit from {@link bandFit}
 * @param unit the plot's unit, e.g. "V"
 * @param ranges name each band's range after its label (default true; off where a legend
 *   beside the sentence gives them)
 */
export function fitSentence(fit: BandFit, unit: string, ranges = true): string {
  const f = (v: number) => readout(v, unit);
  const req = ranges ? `${fit.required.label} (${f(fit.required.lo)} to ${f(fit.required.hi)})` : fit.required.label;
  const all = ranges ? `${fit.allowed.label} (${f(fit.allowed.lo)} to ${f(fit.allowed.hi)})` : fit.allowed.label;
  if (fit.fits) {
    return `Fits: ${req} lies inside ${all}, with ${f(fit.spareTop)} to spare at the top and ${f(fit.spareBottom)} at the bottom.`;
  }
  const out: string[] = [];
  if (fit.spareTop < 0) out.push(`${f(-fit.spareTop)} above`);
  if (fit.spareBottom < 0) out.push(`${f(-fit.spareBottom)} below`);
  return `Does not fit: ${req} reaches ${out.join(" and ")} ${all}.`;
}

/**
 * Summary of a levels plot: each level and band with its value, and the fit.
 * @param plot the plot
 */
export function summariseLevels(plot: LevelsPlot): string {
  const levels = [...plot.levels].sort((a, b) => b.value - a.value).map((l) => `${l.label} ${readout(l.value, plot.unit)}`);
  const bands = (plot.bands ?? []).map((b) => `${b.label} ${readout(Math.min(b.from, b.to), plot.unit)} to ${readout(Math.max(b.from, b.to), plot.unit)}`);
  const fit = bandFit(plot);
  const parts = [
    levels.length ? `Levels: ${levels.join(", ")}.` : "",
    bands.length ? `Bands: ${bands.join("; ")}.` : "",
    fit ? fitSentence(fit, plot.unit) : "",
  ].filter(Boolean);
  return `${plot.title}. ${parts.length ? parts.join(" ") : "No levels."}`;
}
