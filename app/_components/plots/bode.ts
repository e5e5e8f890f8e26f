/**
 * Which line plots are the two halves of a Bode plot, so the sheet can draw them as one pair
 * (magnitude above phase, one frequency axis, one crosshair). Pure.
 *
 * What is matched:
 * 1. Both are line plots whose x axes are log scale with the same unit (Hz for every engine
 *    plot), the magnitude's y unit is "dB" and the phase's y unit is "°".
 * 2. Their ids are "<stem><sep>magnitude" and "<stem><sep>phase" with the same stem, where
 *    <sep> is ".", "-" or "_" (the filter engine writes "bode.magnitude" / "bode.phase";
 *    "bode-magnitude" / "bode-phase" match too). Id matching is case-insensitive.
 * 3. Failing an id match, a magnitude plot immediately followed in the list by a phase plot
 *    (both per rule 1, neither matched by id) is a pair.
 * A pair takes the place of its first member in the list; all other plots stay as they are.
 */
import type { LinePlot, Plot } from "@/lib/calc/core/types";

/** The Bode half a plot can be, from its axes alone (rule 1), or null. */
export function bodeRole(plot: Plot): "magnitude" | "phase" | null {
  if (plot.kind !== "line" || plot.x.scale !== "log") return null;
  if (plot.y.unit === "dB") return "magnitude";
  if (plot.y.unit === "°") return "phase";
  return null;
}

/** The id's stem and half for ids like "bode.magnitude", "loop-phase", or null. */
export function bodeIdParts(id: string): { stem: string; half: "magnitude" | "phase" } | null {
  const m = /^(.*?)[._-](magnitude|phase)$/i.exec(id);
  if (!m) return null;
  return { stem: m[1].toLowerCase(), half: m[2].toLowerCase() as "magnitude" | "phase" };
}

/**
 * Whether two plots may be drawn as a Bode pair (rule 1): magnitude in dB and phase in degrees
 * against the same log x axis unit.
 */
export function canPair(magnitude: Plot, phase: Plot): boolean {
  return bodeRole(magnitude) === "magnitude" && bodeRole(phase) === "phase" && magnitude.kind === "line" && phase.kind === "line" && magnitude.x.unit === phase.x.unit;
}

/** One item of a calculation sheet's plot list. */
export type SheetPlotItem =
  | { kind: "plot"; key: string; plot: Plot }
  | { kind: "bode"; key: string; magnitude: LinePlot; phase: LinePlot };

/**
 * Group a compute's plots for the sheet: Bode halves (see the file comment for the rules) become
 * one "bode" item, every other plot one "plot" item, in the original order.
 * @param plots the compute's plots
 */
export function groupPlots(plots: Plot[]): SheetPlotItem[] {
  const partner = new Map<number, number>();
  // Rule 2: ids with a shared stem.
  plots.forEach((p, i) => {
    const ip = bodeIdParts(p.id);
    if (!ip || ip.half !== "magnitude" || partner.has(i)) return;
    const j = plots.findIndex((q, k) => {
      const iq = bodeIdParts(q.id);
      return k !== i && !partner.has(k) && iq?.half === "phase" && iq.stem === ip.stem && canPair(p, q);
    });
    if (j >= 0) {
      partner.set(i, j);
      partner.set(j, i);
    }
  });
  // Rule 3: neighbours.
  for (let i = 0; i + 1 < plots.length; i++) {
    if (partner.has(i) || partner.has(i + 1)) continue;
    if (canPair(plots[i], plots[i + 1])) {
      partner.set(i, i + 1);
      partner.set(i + 1, i);
    }
  }
  const items: SheetPlotItem[] = [];
  const done = new Set<number>();
  plots.forEach((p, i) => {
    if (done.has(i)) return;
    const j = partner.get(i);
    if (j === undefined) {
      items.push({ kind: "plot", key: p.id || `plot-${i}`, plot: p });
      return;
    }
    done.add(i);
    done.add(j);
    const mag = bodeRole(p) === "magnitude" ? p : plots[j];
    const ph = mag === p ? plots[j] : p;
    items.push({ kind: "bode", key: `${mag.id}+${ph.id}`, magnitude: mag as LinePlot, phase: ph as LinePlot });
  });
  return items;
}
