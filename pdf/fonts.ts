/**
 * Font registration for the report documents. Runs once per process (module scope): Inter for
 * text (it has Ω µ √ ° ± − and the sub- and superscript digits), IBM Plex Mono for codes and
 * hashes. Fonts are read from public/fonts by file path (TTF; react-pdf cannot read WOFF2).
 */
import fs from "node:fs";
import path from "node:path";
import { Font } from "@react-pdf/renderer";

/**
 * OpenType features for all text. Inter's contextual lookups (calt, ccmp, mark …) cost shaping
 * time and do nothing for our Latin and Greek text, so only kerning stays on.
 */
export const TEXT_FEATURES = Object.freeze({ kern: true, calt: false, ccmp: false, locl: false, rlig: false, mark: false, mkmk: false, clig: false, liga: false, rclt: false, curs: false } as const);
/** The same, with tabular (monospaced) digits for numbers in tables and results. */
export const TABULAR_FEATURES = Object.freeze({ ...TEXT_FEATURES, tnum: true } as const);

/** Family names used by the styles. */
export const FONT_SANS = "Inter";
export const FONT_MONO = "IBM Plex Mono";

/** Folder the TTF files are read from: `<cwd>/public/fonts`, or LOOPWRIGHT_FONT_DIR. */
export function fontDir(): string {
  return process.env.LOOPWRIGHT_FONT_DIR ?? path.join(process.cwd(), "public", "fonts");
}

let registered = false;

/** Words up to this many characters are never broken. */
const LONGEST_WHOLE_WORD = 28;

/**
 * Word-breaking rule: no hyphenation of ordinary words, symbols, part names or values
 * ("LW-OA320", "Sallen-Key"); only a word too long for any cell (a long code or address) may be
 * broken, in pieces of about 14 characters, so it can never run out of its box.
 */
export function breakOnlyLongWords(word: string): string[] {
  if (word.length <= LONGEST_WHOLE_WORD) return [word];
  const pieces: string[] = [];
  let rest = word;
  while (rest.length > 14) {
    let cut = 14;
    // Never next to a hyphen: react-pdf adds one where it breaks ("--" or a leading "-").
    while (cut > 2 && (/[-‐]/.test(rest[cut - 1]) || /[-‐]/.test(rest[cut]))) cut--;
    pieces.push(rest.slice(0, cut));
    rest = rest.slice(cut);
  }
  pieces.push(rest);
  return pieces;
}

/** The weights and styles registered, for loading and shaping-cache set-up. */
const VARIANTS: Array<{ fontFamily: string; fontWeight: number; fontStyle?: "italic" }> = [
  { fontFamily: FONT_SANS, fontWeight: 400 },
  { fontFamily: FONT_SANS, fontWeight: 400, fontStyle: "italic" },
  { fontFamily: FONT_SANS, fontWeight: 500 },
  { fontFamily: FONT_SANS, fontWeight: 600 },
  { fontFamily: FONT_SANS, fontWeight: 700 },
  { fontFamily: FONT_MONO, fontWeight: 400 },
  { fontFamily: FONT_MONO, fontWeight: 500 },
];

interface ShapedRun {
  glyphs: unknown[];
  positions: Array<Record<string, number>>;
}
type LayoutFn = (text: string, features?: unknown, script?: string, language?: string, direction?: string) => ShapedRun;
interface FontkitFont {
  layout: LayoutFn;
  unitsPerEm: number;
  __lwShapingMemo?: true;
}

/**
 * Width of `text` set in Inter at `size` pt, from the font's own advances and kerning (the same
 * shaping react-pdf does). Before the fonts are loaded (see startShapingCache) it falls back to
 * an estimate of 0.56 em per character.
 *
 * @param text one line of text
 * @param size font size, pt
 * @param opts.weight 400, 500, 600 or 700; opts.tabular for tabular digits
 * @returns width in pt
 */
export function textWidth(text: string, size: number, opts: { weight?: number; tabular?: boolean } = {}): number {
  const source = Font.getFont({ fontFamily: FONT_SANS, fontWeight: opts.weight ?? 400 });
  const font = source?.data as unknown as FontkitFont | null;
  if (!font || !text) return text.length * size * 0.56;
  const run = font.layout(text, opts.tabular ? TABULAR_FEATURES : TEXT_FEATURES, undefined, undefined, "ltr");
  let advance = 0;
  for (const p of run.positions) advance += p.xAdvance ?? 0;
  return (advance * size) / font.unitsPerEm;
}

/**
 * Gives back their code points to glyphs that lost them. fontkit keeps one glyph object per
 * glyph id, and its code points are those of the first request; when a PDF subset pulls a glyph
 * in first as a component of another glyph, the object is created with none, and every later
 * report loses that character from its text layer (copy and paste, search, pdftotext) and
 * miscounts string positions: seen with the tabular superscripts of "×10⁻²³". With the features
 * the report uses (kerning and tabular digits: single substitutions only) every character gives
 * exactly one glyph, so the run tells which character each glyph stands for.
 */
function repairCodePoints(text: string, run: ShapedRun): void {
  const glyphs = run.glyphs as Array<{ codePoints?: number[] }>;
  if (!glyphs.some((g) => !g.codePoints || g.codePoints.length === 0)) return;
  const cps = Array.from(text, (ch) => ch.codePointAt(0) ?? 0);
  if (cps.length !== glyphs.length) return;
  glyphs.forEach((g, i) => {
    if (!g.codePoints || g.codePoints.length === 0) g.codePoints = [cps[i]];
  });
}

/** Shaped runs of the current report, per font (see {@link startShapingCache}). */
const shapingCaches = new Map<object, Map<string, ShapedRun>>();
const MAX_CACHED_RUNS = 20_000;

/**
 * Loads the report fonts and puts a shaping memo in front of each: the report lays its text out
 * twice (measuring, then printing), and OpenType shaping (kerning lookups) is the costliest step
 * of text layout. A cached run is handed out as a copy, so nothing downstream shares state.
 * Call once per report; it also clears the memo of the previous report.
 */
export async function startShapingCache(): Promise<void> {
  registerReportFonts();
  for (const v of VARIANTS) {
    const source = Font.getFont(v);
    await source.load();
    const font = source.data as unknown as FontkitFont | null;
    if (!font) continue;
    if (!font.__lwShapingMemo) {
      const original = font.layout.bind(font);
      const cache = new Map<string, ShapedRun>();
      shapingCaches.set(font, cache);
      font.layout = (text, features, script, language, direction) => {
        const key = `${text}\u0000${features ? JSON.stringify(features) : ""}\u0000${script ?? ""}\u0000${language ?? ""}\u0000${direction ?? ""}`;
        let run = cache.get(key);
        if (!run) {
          // fontkit writes every feature it planned back into the object it is given (frac,
          // numr, dnom … all true), which would switch them on for the next run that shares
          // it: hand it a copy.
          const own = features && typeof features === "object" && !Array.isArray(features) ? { ...features } : features;
          run = original(text, own, script, language, direction);
          repairCodePoints(text, run);
          if (cache.size >= MAX_CACHED_RUNS) cache.clear();
          cache.set(key, run);
        }
        return { ...run, glyphs: run.glyphs.slice(), positions: run.positions.map((p) => ({ ...p })) };
      };
      font.__lwShapingMemo = true;
    }
    shapingCaches.get(font)?.clear();
  }
}

/** Registers the report fonts (idempotent) and turns off word hyphenation. */
export function registerReportFonts(): void {
  if (registered) return;
  const dir = fontDir();
  const file = (name: string) => {
    const p = path.join(dir, name);
    if (!fs.existsSync(p)) throw new Error(`report font missing: ${p} (run from the project root or set LOOPWRIGHT_FONT_DIR)`);
    return p;
  };
  Font.register({
    family: FONT_SANS,
    fonts: [
      { src: file("Inter_400Regular.ttf"), fontWeight: 400 },
      { src: file("Inter_400Regular_Italic.ttf"), fontWeight: 400, fontStyle: "italic" },
      { src: file("Inter_500Medium.ttf"), fontWeight: 500 },
      { src: file("Inter_600SemiBold.ttf"), fontWeight: 600 },
      { src: file("Inter_700Bold.ttf"), fontWeight: 700 },
    ],
  });
  Font.register({
    family: FONT_MONO,
    fonts: [
      { src: file("IBMPlexMono_400Regular.ttf"), fontWeight: 400 },
      { src: file("IBMPlexMono_500Medium.ttf"), fontWeight: 500 },
    ],
  });
  Font.registerHyphenationCallback(breakOnlyLongWords);
  registered = true;
}

registerReportFonts();
