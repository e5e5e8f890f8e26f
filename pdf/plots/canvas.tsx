/**
 * A plot canvas: one react-pdf Svg for the vector drawing plus an overlay of positioned text
 * labels (real react-pdf Text, so labels use the report fonts and tabular digits).
 */
import type { ReactNode } from "react";
import { Svg, Text, View } from "@react-pdf/renderer";
import { colors, TABULAR } from "../theme";
import { looksNumeric } from "../text";
import { textWidth } from "../fonts";

/** A text label placed on the canvas, in points from the canvas's top-left corner. */
export interface CanvasLabel {
  x: number;
  /** Vertical centre of the text line. */
  y: number;
  text: string;
  align?: "left" | "center" | "right";
  size?: number;
  color?: string;
  weight?: 400 | 500 | 600;
  /** Box width the label is aligned in (default 80 pt). */
  width?: number;
  /** Opaque background behind the text (hides lines drawn under it). */
  background?: string;
  /** Print with tabular digits (numbers); default: only when the text is a number. */
  numeric?: boolean;
}

/** Width a label of `text` takes at `size` pt (Inter's own advances once the fonts are loaded). */
export function estimateTextWidth(text: string, size: number): number {
  return textWidth(text, size, { tabular: looksNumeric(text) });
}

/** Rounds a coordinate for path data (0.01 pt is far below print resolution). */
export function r2(v: number): string {
  return (Math.round(v * 100) / 100).toString();
}

export function PlotCanvas(props: { width: number; height: number; labels: CanvasLabel[]; children: ReactNode }) {
  const { width, height, labels, children } = props;
  return (
    <View style={{ position: "relative", width, height }}>
      <Svg width={width} height={height} viewBox={`0 0 ${r2(width)} ${r2(height)}`}>
        {children}
      </Svg>
      {labels.map((l, i) => {
        const size = l.size ?? 6.6;
        const w = l.width ?? 80;
        let left = l.align === "right" ? l.x - w : l.align === "left" ? l.x : l.x - w / 2;
        // Keep the printed text inside the canvas (e.g. the last tick label at the right edge).
        const tw = Math.min(w, estimateTextWidth(l.text, size) + 1);
        const inkLeft = l.align === "right" ? left + w - tw : l.align === "left" ? left : left + (w - tw) / 2;
        if (inkLeft < 0) left -= inkLeft;
        else if (inkLeft + tw > width) left -= inkLeft + tw - width;
        return (
          <Text
            key={i}
            style={{
              position: "absolute",
              left,
              top: l.y - size * 0.62,
              width: w,
              fontSize: size,
              lineHeight: 1.15,
              textAlign: l.align ?? "center",
              color: l.color ?? colors.ink2,
              fontWeight: l.weight ?? 400,
              ...((l.numeric ?? looksNumeric(l.text)) ? { fontFeatureSettings: TABULAR } : {}),
              ...(l.background ? { backgroundColor: l.background } : {}),
            }}
          >
            {l.text}
          </Text>
        );
      })}
    </View>
  );
}
