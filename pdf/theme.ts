/**
 * The report's look: a calm engineering calculation sheet. Graphite ink on warm white paper,
 * one copper accent, and the three state colours kept for check severities only (always
 * printed with their word). Sizes in PDF points (1 pt = 1/72 in).
 */
import { StyleSheet, type Styles } from "@react-pdf/renderer";
import type { Severity } from "../lib/calc/core/types";
import { FONT_MONO, FONT_SANS, TABULAR_FEATURES, TEXT_FEATURES } from "./fonts";

/** One react-pdf style object. */
export type PdfStyle = Styles[string];

export const colors = {
  paper: "#FFFEFB",
  ink: "#25282B",
  ink2: "#4B5055",
  muted: "#7B8085",
  rule: "#CDC8BE",
  ruleLight: "#E7E3DA",
  fill: "#F5F2EC",
  fillLight: "#FAF8F4",
  copper: "#A3582B",
  copperLight: "#EAD3C2",
  copperFaint: "#F6EBE3",
} as const;

/** Check severity colours: ink, tint, the printed word and a glyph (never colour alone). */
export const severityStyle: Record<Severity, { ink: string; tint: string; word: string; glyph: string }> = {
  pass: { ink: "#2B7449", tint: "#E6F1EA", word: "PASS", glyph: "✓" },
  warning: { ink: "#9A6200", tint: "#FBEFD9", word: "WARNING", glyph: "!" },
  fail: { ink: "#B3261E", tint: "#FAE5E3", word: "FAIL", glyph: "✗" },
};

export const page = {
  width: 595.28,
  height: 841.89,
  marginX: 50,
  marginTop: 62,
  marginBottom: 66,
};
/** Width of the text block. */
export const contentWidth = page.width - 2 * page.marginX;

const TNUM = TABULAR_FEATURES;

/** Tabular digits, with the same feature set as all text. */
export const TABULAR = TABULAR_FEATURES;
export { TEXT_FEATURES };

export const s = StyleSheet.create({
  page: {
    backgroundColor: colors.paper,
    color: colors.ink,
    fontFamily: FONT_SANS,
    fontSize: 8.8,
    lineHeight: 1.38,
    fontFeatureSettings: TEXT_FEATURES,
    paddingTop: page.marginTop,
    paddingBottom: page.marginBottom,
    paddingHorizontal: page.marginX,
  },
  // running header and footer
  header: {
    position: "absolute",
    top: 26,
    left: page.marginX,
    right: page.marginX,
    flexDirection: "row",
    justifyContent: "space-between",
    borderBottomWidth: 0.6,
    borderBottomColor: colors.rule,
    paddingBottom: 4,
    fontSize: 7.4,
    color: colors.ink2,
  },
  footer: {
    position: "absolute",
    bottom: 26,
    left: page.marginX,
    right: page.marginX,
    flexDirection: "row",
    alignItems: "flex-end",
    justifyContent: "space-between",
    borderTopWidth: 0.6,
    borderTopColor: colors.rule,
    paddingTop: 5,
    fontSize: 7.2,
    color: colors.ink2,
  },
  mono: { fontFamily: FONT_MONO },
  tnum: { fontFeatureSettings: TNUM },
  // headings
  h1: { flexDirection: "row", alignItems: "baseline", marginBottom: 6, borderBottomWidth: 0.8, borderBottomColor: colors.ink, paddingBottom: 2.5 },
  h1Num: { width: 22, fontSize: 10.5, fontWeight: 600, color: colors.copper, fontFeatureSettings: TNUM },
  h1Text: { fontSize: 10.5, fontWeight: 600, letterSpacing: 0.1 },
  h2: { fontSize: 9, fontWeight: 600, marginBottom: 3, color: colors.ink },
  para: { color: colors.ink },
  small: { fontSize: 7.6, color: colors.ink2 },
  label: { fontSize: 7, color: colors.muted, textTransform: "uppercase", letterSpacing: 0.6 },
  // tables (the header row carries the top rule, the last row the bottom rule)
  thead: { flexDirection: "row", backgroundColor: colors.fill, borderTopWidth: 0.8, borderTopColor: colors.ink, borderBottomWidth: 0.6, borderBottomColor: colors.rule },
  th: { paddingVertical: 3, paddingHorizontal: 4, fontSize: 7.2, fontWeight: 600, color: colors.ink2, letterSpacing: 0.2 },
  tr: { flexDirection: "row", borderBottomWidth: 0.4, borderBottomColor: colors.ruleLight },
  trLast: { flexDirection: "row", borderBottomWidth: 0.8, borderBottomColor: colors.ink },
  td: { paddingVertical: 2.3, paddingHorizontal: 4, fontSize: 8.2 },
  tdNum: { paddingVertical: 2.3, paddingHorizontal: 4, fontSize: 8.2, textAlign: "right" },
  groupRow: { flexDirection: "row", backgroundColor: colors.fillLight, borderBottomWidth: 0.4, borderBottomColor: colors.ruleLight },
  groupCell: { paddingVertical: 2.4, paddingHorizontal: 4, fontSize: 7.4, fontWeight: 600, color: colors.ink2, letterSpacing: 0.3 },
});
