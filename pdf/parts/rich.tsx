/**
 * Symbols with subscripts. Engine symbols are plain Unicode ("f₀", "Vos,out"); where Unicode
 * has no subscript letter they may be written with an underscore ("f_c", "GBW_req",
 * "e_n,out"). This prints the part after the underscore as a true subscript.
 */
import type { ReactNode } from "react";
import { Text } from "@react-pdf/renderer";
import { FONT_SANS } from "../fonts";

const SUBSCRIPT = /([A-Za-z0-9Δα-ωΑ-Ω)′])_([A-Za-z0-9+−-]+(?:,[A-Za-z0-9+−-]+)*)/g;

/**
 * Text with every "X_sub" turned into X followed by a subscript run.
 *
 * @param text the text, e.g. "f_FP = SR / (2π · V_p)".
 * @param size font size of the surrounding text, pt (the subscript is printed at 72 %).
 */
export function withSubscripts(text: string, size: number): ReactNode {
  if (!text.includes("_")) return text;
  const out: ReactNode[] = [];
  let last = 0;
  let k = 0;
  for (const m of text.matchAll(SUBSCRIPT)) {
    const at = m.index ?? 0;
    out.push(text.slice(last, at + m[1].length));
    out.push(
      <Text key={k++} style={{ fontSize: size * 0.72, verticalAlign: "sub" }}>
        {m[2]}
      </Text>,
    );
    last = at + m[0].length;
  }
  out.push(text.slice(last));
  return out;
}

/**
 * Children for a Text set in the monospaced font. The shipped IBM Plex Mono files have a space
 * glyph fontkit cannot read (laying out any text with a space in it throws), so spaces are set
 * in Inter.
 */
export function monoText(text: string): ReactNode {
  if (!text.includes(" ")) return text;
  return text.split(/( +)/).map((part, i) =>
    part.startsWith(" ") ? (
      <Text key={i} style={{ fontFamily: FONT_SANS }}>
        {part}
      </Text>
    ) : (
      part
    ),
  );
}
