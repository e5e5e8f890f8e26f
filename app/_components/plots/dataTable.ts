/**
 * The "Show data" tables of each plot kind: the numbers behind the drawing, formatted with their
 * units. Long sweeps are thinned to at most `maxRows` rows (every n-th sample, the last always
 * kept), and the table says so. Pure.
 */
import type { HistogramPlot, LevelsPlot, LinePlot } from "@/lib/calc/core/types";
import { readout, sharedFormat } from "./format";

/** One small table. Cells are pre-formatted text. */
export interface DataTable {
  caption: string;
  columns: Array<{ label: string; numeric: boolean }>;
  rows: string[][];
  /** E.g. "Every 10th of 401 samples." */
  note?: string;
}

/** Indices 0, k, 2k, … and the last, with k chosen so there are at most maxRows of them. */
export function thinIndices(n: number, maxRows: number): number[] {
  if (n <= 0) return [];
  if (n <= maxRows) return Array.from({ length: n }, (_, i) => i);
  const k = Math.ceil((n - 1) / Math.max(1, maxRows - 1));
  const out: number[] = [];
  for (let i = 0; i < n - 1; i += k) out.push(i);
  out.push(n - 1);
  return out;
}

function ordinal(k: number): string {
  const s = k % 100 >= 11 && k % 100 <= 13 ? "th" : ({ 1: "st", 2: "nd", 3: "rd" } as Record<number, string>)[k % 10] ?? "th";
  return `${k}${s}`;
}

function sameX(a: readonly number[], b: readonly number[]): boolean {
  return a.length === b.length && a.every((v, i) => Object.is(v, b[i]));
}

/**
 * Tables of a line plot: series that share their x samples share one table.
 * @param plot the plot
 * @param maxRows most rows per table, default 41
 */
export function lineTables(plot: LinePlot, maxRows = 41): DataTable[] {
  const groups: Array<{ x: number[]; members: number[] }> = [];
  plot.series.forEach((s, i) => {
    const x = s.x.slice(0, Math.min(s.x.length, s.y.length));
    const g = groups.find((gr) => sameX(gr.x, x));
    if (g) g.members.push(i);
    else groups.push({ x, members: [i] });
  });
  return groups.map((g) => {
    const idx = thinIndices(g.x.length, maxRows);
    const names = g.members.map((m) => plot.series[m].name);
    return {
      caption: names.join(", "),
      columns: [{ label: plot.x.label, numeric: true }, ...names.map((label) => ({ label, numeric: true }))],
      rows: idx.map((i) => [readout(g.x[i], plot.x.unit, 5), ...g.members.map((m) => readout(plot.series[m].y[i], plot.y.unit, 5))]),
      ...(idx.length < g.x.length ? { note: `Every ${ordinal(idx[1] - idx[0])} of ${g.x.length} samples, and the last.` } : {}),
    };
  });
}

/**
 * Tables of a histogram: the bins (from, to, count, share) and the markers.
 * @param plot the plot
 */
export function histogramTables(plot: HistogramPlot): DataTable[] {
  const bins = Math.min(plot.counts.length, Math.max(0, plot.edges.length - 1));
  const total = plot.counts.slice(0, bins).reduce((a, c) => a + c, 0);
  const unit = plot.x.unit;
  // One prefix and aligned decimals down each column (bin edges are all of one magnitude).
  const edge = sharedFormat(plot.edges.slice(0, bins + 1), unit, 5);
  const shares = plot.counts.slice(0, bins).map((c) => (total > 0 ? (c / total) * 100 : NaN));
  const share = sharedFormat(shares, "%", 3);
  const tables: DataTable[] = [
    {
      caption: `${plot.x.label}: ${total} samples in ${bins} bins`,
      columns: [
        { label: "From", numeric: true },
        { label: "To", numeric: true },
        { label: "Count", numeric: true },
        { label: "Share", numeric: true },
      ],
      rows: Array.from({ length: bins }, (_, i) => [edge(plot.edges[i]), edge(plot.edges[i + 1]), String(plot.counts[i]), share(shares[i])]),
    },
  ];
  if (plot.markers && plot.markers.length > 0) {
    tables.push({
      caption: "Markers",
      columns: [
        { label: "Marker", numeric: false },
        { label: "Value", numeric: true },
      ],
      rows: plot.markers.map((m) => [m.label, readout(m.value, unit, 5)]),
    });
  }
  return tables;
}

/**
 * Tables of a levels plot: levels (top to bottom) and bands.
 * @param plot the plot
 */
export function levelsTables(plot: LevelsPlot): DataTable[] {
  const value = sharedFormat([...plot.levels.map((l) => l.value), ...(plot.bands ?? []).flatMap((b) => [b.from, b.to])], plot.unit, 4);
  const tables: DataTable[] = [
    {
      caption: "Levels",
      columns: [
        { label: "Level", numeric: false },
        { label: "Kind", numeric: false },
        { label: "Value", numeric: true },
      ],
      rows: [...plot.levels].sort((a, b) => b.value - a.value).map((l) => [l.label, l.role, value(l.value)]),
    },
  ];
  if (plot.bands && plot.bands.length > 0) {
    tables.push({
      caption: "Bands",
      columns: [
        { label: "Band", numeric: false },
        { label: "Kind", numeric: false },
        { label: "From", numeric: true },
        { label: "To", numeric: true },
      ],
      rows: plot.bands.map((b) => [b.label, b.role, value(Math.min(b.from, b.to)), value(Math.max(b.from, b.to))]),
    });
  }
  return tables;
}
