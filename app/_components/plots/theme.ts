/**
 * The look of the sheet's plots, in one place. Colours are the app's theme colours (Tailwind
 * classes over the CSS variables of app/globals.css), so plots follow the page.
 *
 * Series roles are drawn the same everywhere (and as in the PDF report): "real" copper solid,
 * "ideal" graphite dashed, "limit" thin graphite dotted reference line; "other" series graphite
 * with a dash pattern each.
 */
import type { LineSeries } from "@/lib/calc/core/types";

/** Stroke of one series. */
export interface SeriesStyle {
  /** Tailwind stroke colour class. */
  stroke: string;
  /** Tailwind fill colour class of the same colour (hover dots, swatches). */
  fill: string;
  /** Stroke width in px. */
  width: number;
  /** SVG stroke-dasharray, absent for solid. */
  dash?: string;
  /** How the style reads in words (legend for screen readers, data table headings). */
  words: string;
}

const OTHER_DASHES: Array<string | undefined> = [undefined, "8 3", "2 2", "8 3 2 3"];

/**
 * Style of a series by role; "other" series take the n-th dash pattern.
 * @param role the series role (undefined is "other")
 * @param otherIndex index among the plot's "other" series
 */
export function seriesStyle(role: LineSeries["role"], otherIndex = 0): SeriesStyle {
  switch (role) {
    case "real":
      return { stroke: "stroke-copper", fill: "fill-copper", width: 1.75, words: "solid copper line" };
    case "ideal":
      return { stroke: "stroke-ink-2", fill: "fill-ink-2", width: 1.5, dash: "6 4", words: "dashed grey line" };
    case "limit":
      return { stroke: "stroke-ink", fill: "fill-ink", width: 1, dash: "1.5 2.5", words: "dotted reference line" };
    default: {
      const dash = OTHER_DASHES[otherIndex % OTHER_DASHES.length];
      return { stroke: "stroke-ink", fill: "fill-ink", width: 1.25, dash, words: dash ? "patterned line" : "solid dark line" };
    }
  }
}

/** Drawing order: reference lines first, then the real curve, the dashed ideal curve on top, so
 * where the two coincide both stay visible (copper between the grey dashes). */
export const ROLE_ORDER: Record<NonNullable<LineSeries["role"]>, number> = { limit: 0, other: 1, real: 2, ideal: 3 };

/** Font sizes in px. */
export const FONT = { tick: 11, title: 11.5, label: 11.5 } as const;

/** Estimated advance of one character of tick text at FONT.tick (Inter, tabular digits), px. */
export const CHAR_PX = 6.6;

/** Estimated width of a text in px at the tick font size. */
export function textWidth(text: string, size: number = FONT.tick): number {
  return text.length * CHAR_PX * (size / FONT.tick);
}
