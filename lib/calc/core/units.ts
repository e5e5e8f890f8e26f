/**
 * Engineering values at the edges of the engine: parsing what an engineer types ("4k7",
 * "2.2 µF", "10 kHz", "1 %", "20 V/µs") into SI base units, and formatting SI values back
 * with an engineering prefix and the right symbol.
 *
 * Conventions:
 * - Input and output values are SI base units (V, A, Ω, F, Hz, s, W, V/s, V/√Hz, A/√Hz, V/°C).
 * - Fields with `scale: "percent"` or `"ppm"` are typed as a percentage / in ppm and stored as a
 *   fraction (1 % → 0.01, 10 ppm → 1e-5).
 * - Resistor and capacitor codes follow the letter-and-digit (RKM) code of IEC 60062:2016, where
 *   the letter stands for the decimal point and the multiplier ("4k7" = 4.7e3, "R47" = 0.47,
 *   "2n2" = 2.2e-9).
 * - Results whose unit is "%" or "ppm" (ResultValue) hold the number in that unit (1.5 means
 *   1.5 %); pass `scale` to formatQuantity when the value is a fraction.
 */

/** Separator between a number and its unit: one normal space, used everywhere. */
export const UNIT_SEPARATOR = " ";

/** Real minus sign (U+2212), used for negative numbers in formatted output. */
export const MINUS = "\u2212";

/** Micro sign used in formatted output (U+00B5). */
export const MICRO = "\u00b5";

/** SI prefixes this engine reads and writes, with their power of ten. */
const PREFIX_EXP: Record<string, number> = {
  f: -15,
  p: -12,
  n: -9,
  u: -6,
  [MICRO]: -6,
  m: -3,
  k: 3,
  K: 3,
  M: 6,
  G: 9,
  T: 12,
};

/** Formatting prefixes, from 1e-15 to 1e12. */
const FORMAT_PREFIXES: Array<{ exp: number; symbol: string }> = [
  { exp: -15, symbol: "f" },
  { exp: -12, symbol: "p" },
  { exp: -9, symbol: "n" },
  { exp: -6, symbol: MICRO },
  { exp: -3, symbol: "m" },
  { exp: 0, symbol: "" },
  { exp: 3, symbol: "k" },
  { exp: 6, symbol: "M" },
  { exp: 9, symbol: "G" },
  { exp: 12, symbol: "T" },
];

/** Units that are never given a prefix when formatted (and are not read with one). */
const NO_PREFIX_UNITS = new Set(["dB", "%", "ppm", "ppm/°C", "°C", "°", "K/W", "V/V", "LSB", "K", "J/K", "", "bit", "h"]);

/** Units that are read with a prefix although formatted without (a gain of "1k" is sensible). */
const PREFIX_READ_OK = new Set(["V/V", ""]);

/**
 * Accepted spellings of each field unit, with the factor that converts a value in that spelling
 * to the field's SI unit. The first entry is the canonical symbol.
 */
const UNIT_ALIASES: Record<string, Array<{ text: string; factor: number; prefixable: boolean }>> = {
  "Ω": [
    { text: "Ω", factor: 1, prefixable: true },
    { text: "ohm", factor: 1, prefixable: true },
    { text: "ohms", factor: 1, prefixable: true },
    { text: "Ohm", factor: 1, prefixable: true },
  ],
  F: [{ text: "F", factor: 1, prefixable: true }],
  H: [{ text: "H", factor: 1, prefixable: true }],
  Hz: [{ text: "Hz", factor: 1, prefixable: true }],
  V: [{ text: "V", factor: 1, prefixable: true }],
  A: [{ text: "A", factor: 1, prefixable: true }],
  W: [{ text: "W", factor: 1, prefixable: true }],
  s: [{ text: "s", factor: 1, prefixable: true }],
  h: [{ text: "h", factor: 1, prefixable: false }],
  "V/s": [
    { text: "V/s", factor: 1, prefixable: true },
    { text: "V/µs", factor: 1e6, prefixable: false },
    { text: "V/us", factor: 1e6, prefixable: false },
    { text: "V/ms", factor: 1e3, prefixable: false },
    { text: "V/ns", factor: 1e9, prefixable: false },
  ],
  "V/√Hz": [
    { text: "V/√Hz", factor: 1, prefixable: true },
    { text: "V/rtHz", factor: 1, prefixable: true },
    { text: "V/sqrt(Hz)", factor: 1, prefixable: true },
    { text: "V/Hz^0.5", factor: 1, prefixable: true },
  ],
  "A/√Hz": [
    { text: "A/√Hz", factor: 1, prefixable: true },
    { text: "A/rtHz", factor: 1, prefixable: true },
    { text: "A/sqrt(Hz)", factor: 1, prefixable: true },
    { text: "A/Hz^0.5", factor: 1, prefixable: true },
  ],
  "V/°C": [
    { text: "V/°C", factor: 1, prefixable: true },
    { text: "V/K", factor: 1, prefixable: true },
    { text: "V/degC", factor: 1, prefixable: true },
  ],
  "°C": [
    { text: "°C", factor: 1, prefixable: false },
    { text: "degC", factor: 1, prefixable: false },
  ],
  "°": [
    { text: "°", factor: 1, prefixable: false },
    { text: "deg", factor: 1, prefixable: false },
  ],
  "K/W": [
    { text: "K/W", factor: 1, prefixable: false },
    { text: "°C/W", factor: 1, prefixable: false },
  ],
  dB: [{ text: "dB", factor: 1, prefixable: false }],
  "V/V": [{ text: "V/V", factor: 1, prefixable: true }],
  LSB: [{ text: "LSB", factor: 1, prefixable: false }],
  bit: [
    { text: "bit", factor: 1, prefixable: false },
    { text: "bits", factor: 1, prefixable: false },
  ],
  K: [{ text: "K", factor: 1, prefixable: false }],
};

/** Units a "percent" or "ppm" field accepts, as fraction factors. */
const FRACTION_UNITS: Array<{ text: string; factor: number }> = [
  { text: "%", factor: 1e-2 },
  { text: "ppm/°C", factor: 1e-6 },
  { text: "ppm/K", factor: 1e-6 },
  { text: "ppm/degC", factor: 1e-6 },
  { text: "ppm", factor: 1e-6 },
];

/** Every unit symbol the parser knows, to tell a wrong unit from nonsense. */
const KNOWN_UNIT_TEXTS: string[] = [
  ...Object.values(UNIT_ALIASES).flatMap((a) => a.map((x) => x.text)),
  ...FRACTION_UNITS.map((u) => u.text),
];

/** Result of parsing one field. */
export type ParseResult = { ok: true; value: number } | { ok: false; message: string };

/** Options of {@link parseQuantity}. */
export interface ParseOptions {
  /** The field's SI unit ("Ω", "F", "Hz", "V", "A", "V/s", "V/√Hz", "°C", "%", "ppm", "" …). */
  unit?: string;
  /** For percent / ppm fields: the user types % or ppm; the value returned is a fraction. */
  scale?: "percent" | "ppm";
}

const NUMBER_RE = /^([+-]?)(\d+(?:\.\d*)?|\.\d+)(?:[eE]([+-]?\d+))?/;
/** IEC 60062 RKM code: digits, one letter in place of the decimal point, digits. */
const RKM_RE = /^([+-]?)(\d*)([RrKkMGTpnuµmF])(\d*)(.*)$/;

const SUPER_DIGITS: Record<string, string> = {
  "⁰": "0", "¹": "1", "²": "2", "³": "3", "⁴": "4", "⁵": "5", "⁶": "6", "⁷": "7", "⁸": "8", "⁹": "9", "⁻": "-", "⁺": "+",
};

function normalise(text: string): string {
  return text
    // "1.5×10⁻⁹" / "1.5x10^-9" (as formatNumber writes large and small numbers) → "1.5e-9"
    .replace(/(\d)\s*[×x]\s*10(?:\^([+-\u2212]?\d+)|([⁻⁺]?[⁰¹²³⁴⁵⁶⁷⁸⁹]+))/g, (_m, d: string, caret?: string, sup?: string) =>
      `${d}e${caret !== undefined ? caret.replace("\u2212", "-") : [...(sup ?? "")].map((c) => SUPER_DIGITS[c]).join("")}`,
    )
    .normalize("NFC")
    .replace(/\u2212/g, "-") // real minus
    .replace(/\u03bc/g, MICRO) // Greek mu → micro sign
    .replace(/\u2126/g, "Ω") // ohm sign → Greek capital omega
    .replace(/\u00ba/g, "°") // masculine ordinal often typed for the degree sign
    .replace(/[\s\u00a0\u2009\u202f]+/g, " ")
    .trim();
}

function example(unit: string, scale?: "percent" | "ppm"): string {
  if (scale === "percent") return `a percentage such as "1" or "0.1 %"`;
  if (scale === "ppm") return `a value in ppm such as "10" or "10 ppm"`;
  switch (unit) {
    case "Ω":
      return `a resistance such as "4k7", "4.7 kΩ" or "100"`;
    case "F":
      return `a capacitance such as "2n2", "100 nF" or "4.7u"`;
    case "Hz":
      return `a frequency such as "10k" or "1.5 MHz"`;
    case "V":
      return `a voltage such as "3.3", "-12 V" or "500 mV"`;
    case "A":
      return `a current such as "10 mA", "1u" or "50 nA"`;
    case "V/s":
      return `a slew rate such as "20 V/µs"`;
    case "V/√Hz":
      return `a noise density such as "10 nV/√Hz"`;
    case "A/√Hz":
      return `a noise density such as "1 pA/√Hz"`;
    case "°C":
      return `a temperature such as "25" or "-40 °C"`;
    case "":
    case "V/V":
      return `a number such as "10" or "1e3"`;
    default:
      return `a value in ${unit}`;
  }
}

function fail(unit: string, scale: "percent" | "ppm" | undefined, what: string): ParseResult {
  return { ok: false, message: `${what}: expected ${example(unit, scale)}` };
}

/** Parse the suffix after the number: optional prefix and optional unit. Returns a factor. */
function suffixFactor(suffix: string, unit: string, scale: "percent" | "ppm" | undefined): number | string {
  const s = suffix.trim();
  if (s === "") return 1;
  if (scale) {
    for (const u of FRACTION_UNITS) {
      if (s === u.text) {
        const base = scale === "percent" ? 1e-2 : 1e-6;
        return u.factor / base;
      }
    }
    if (KNOWN_UNIT_TEXTS.includes(s)) return `"${s}" is not a unit of this field`;
    return `"${s}" is not understood`;
  }
  const aliases = UNIT_ALIASES[unit] ?? (unit === "" ? [] : [{ text: unit, factor: 1, prefixable: !NO_PREFIX_UNITS.has(unit) }]);
  for (const a of aliases) if (s === a.text) return a.factor;
  // Ambiguity guard: "MF" was once written for microfarad; refuse rather than read megafarad.
  if (unit === "F" && s === "MF") return `"MF" is ambiguous (old marking for µF); type "µF" or "uF"`;
  const first = s[0];
  if (first in PREFIX_EXP) {
    const rest = s.slice(1).trim();
    const factor = 10 ** PREFIX_EXP[first];
    if (rest === "") {
      if (NO_PREFIX_UNITS.has(unit) && !PREFIX_READ_OK.has(unit)) return `${unit} values take no prefix`;
      return factor;
    }
    for (const a of aliases) {
      if (rest === a.text) {
        if (!a.prefixable) return `${a.text} takes no prefix`;
        return factor * a.factor;
      }
    }
  }
  if (KNOWN_UNIT_TEXTS.includes(s) || (s.length > 1 && s[0] in PREFIX_EXP && KNOWN_UNIT_TEXTS.includes(s.slice(1).trim()))) {
    return `wrong unit "${s}", this field is in ${unit === "" ? "plain numbers" : unit}`;
  }
  return `"${s}" is not understood`;
}

/**
 * Parse an engineering value typed by a user into SI base units.
 *
 * Accepts a decimal number with optional exponent ("1e-9", "-12", "+15"), an optional SI prefix
 * (f p n u µ μ m k K M G T, case-sensitive: "M" is mega, "m" milli) and an optional unit that
 * must match the field's unit; or an IEC 60062 RKM code ("4k7", "R47", "4R7", "2n2", "1M0",
 * "4u7"), where the letter marks the decimal point.
 *
 * @param text what the user typed
 * @param opts.unit the field's SI unit, e.g. "Ω"; a typed unit must match it
 * @param opts.scale "percent" / "ppm": the number is a percentage / ppm; a fraction is returned
 * @returns `{ ok: true, value }` in SI base units (fraction for scaled fields), or
 *   `{ ok: false, message }` saying what was expected
 * @example parseQuantity("4k7", { unit: "Ω" }) // { ok: true, value: 4700 }
 * @example parseQuantity("1 %", { unit: "%", scale: "percent" }) // { ok: true, value: 0.01 }
 */
export function parseQuantity(text: string, opts: ParseOptions = {}): ParseResult {
  const unit = opts.unit ?? "";
  const scale = opts.scale ?? (unit === "%" ? "percent" : unit === "ppm" || unit === "ppm/°C" ? "ppm" : undefined);
  if (typeof text !== "string") return fail(unit, scale, "Not text");
  const s = normalise(text);
  if (s === "") return fail(unit, scale, "No value entered");
  if (s.includes(",")) return fail(unit, scale, `"${text}" has a comma (use a decimal point)`);

  let mantissa: number;
  let factor: number;

  const num = NUMBER_RE.exec(s);
  const rkm = RKM_RE.exec(s);
  const rest = num ? s.slice(num[0].length) : "";
  // An RKM code has digits directly followed by a letter and then more digits (4k7, 2n2) or a
  // leading letter (R47). "47p" / "4.7k" are ordinary prefixed numbers, handled below.
  const isRkm = !!rkm && !scale && (rkm[4] !== "" || rkm[2] === "") && /^[+-]?\d*[RrKkMGTpnuµmF]\d/.test(s);
  if (isRkm && rkm) {
    const [, sign, whole, letter, frac, tail] = rkm;
    if (whole === "" && frac === "") return fail(unit, scale, `"${text}" is not a number`);
    if (/[0-9.]/.test(tail.trim().charAt(0))) return fail(unit, scale, `"${text}" is not a valid code`);
    let exp: number;
    if (letter === "R" || letter === "r") {
      if (unit !== "Ω") return fail(unit, scale, `"R" marks a resistance; "${text}" is not valid here`);
      exp = 0;
    } else if (letter === "F") {
      if (unit !== "F") return fail(unit, scale, `"F" marks a capacitance; "${text}" is not valid here`);
      exp = 0;
    } else {
      exp = PREFIX_EXP[letter];
    }
    if (NO_PREFIX_UNITS.has(unit) && !PREFIX_READ_OK.has(unit) && exp !== 0) {
      return fail(unit, scale, `${unit} values take no prefix`);
    }
    mantissa = Number(`${sign}${whole === "" ? "0" : whole}.${frac === "" ? "0" : frac}`);
    const tailFactor = suffixFactor(tail, unit, scale);
    if (typeof tailFactor === "string") return fail(unit, scale, tailFactor);
    // A tail after an RKM code may only be the bare unit, never another prefix ("4k7k").
    if (tail.trim() !== "" && tailFactor !== 1) return fail(unit, scale, `"${text}" is not a valid code`);
    factor = 10 ** exp;
  } else {
    if (!num) return fail(unit, scale, `"${text}" is not a number`);
    const [, sign, digits, exponent] = num;
    mantissa = Number(`${sign}${digits}${exponent !== undefined ? `e${exponent}` : ""}`);
    if (rest.startsWith(".") || /^\d/.test(rest)) return fail(unit, scale, `"${text}" is not a number`);
    const f = suffixFactor(rest, unit, scale);
    if (typeof f === "string") return fail(unit, scale, f);
    factor = f;
  }

  let value = mantissa * factor;
  if (scale === "percent") value = value / 100;
  if (scale === "ppm") value = value / 1e6;
  if (!Number.isFinite(value)) return { ok: false, message: `"${text}" is too large (overflow)` };
  // Tidy binary noise from the multiplication (4.7 × 1e3 = 4700.000000000001).
  value = Number(value.toPrecision(15));
  return { ok: true, value };
}

// ---------------------------------------------------------------------------------------------
// Formatting

const SUPERSCRIPT: Record<string, string> = {
  "0": "⁰", "1": "¹", "2": "²", "3": "³", "4": "⁴", "5": "⁵", "6": "⁶", "7": "⁷", "8": "⁸", "9": "⁹", "-": "⁻",
};

function withMinus(s: string): string {
  return s.startsWith("-") ? MINUS + s.slice(1) : s;
}

/** Round to `digits` significant figures and print without exponent, trailing zeros trimmed. */
function plain(value: number, digits: number): string {
  if (value === 0) return "0";
  const quick = value.toPrecision(digits);
  if (!quick.includes("e")) {
    const t = quick.includes(".") ? quick.replace(/\.?0+$/, "") : quick;
    return t === "-0" ? "0" : t;
  }
  const exp = Math.floor(Math.log10(Math.abs(value)));
  const decimals = Math.max(0, digits - 1 - exp);
  const rounded = Number(value.toPrecision(digits));
  let s = rounded.toFixed(Math.min(decimals, 20));
  if (s.includes(".")) s = s.replace(/0+$/, "").replace(/\.$/, "");
  if (s === "-0") s = "0";
  return s;
}

/**
 * Format a unit-less number with `digits` significant figures (trailing zeros trimmed, real
 * minus sign). Very large or small magnitudes (≥ 1e7 or < 1e-4) are written as m×10ⁿ.
 * @param value the number
 * @param digits significant figures, default 4
 * @example formatNumber(-0.012345, 3) // "−0.0123"
 */
export function formatNumber(value: number, digits = 4): string {
  if (!Number.isFinite(value)) return Number.isNaN(value) ? "not a number" : value > 0 ? "∞" : `${MINUS}∞`;
  if (value === 0) return "0";
  const rounded = Number(value.toPrecision(digits));
  const exp = Math.floor(Math.log10(Math.abs(rounded)));
  if (exp >= 7 || exp < -4) {
    // Mantissa and exponent from the decimal text (safe for subnormal numbers, where 10^exp
    // underflows to 0).
    const [m, e] = value.toExponential(Math.max(0, digits - 1)).split("e");
    const mant = m.includes(".") ? m.replace(/\.?0+$/, "") : m;
    const sup = String(Number(e)).split("").map((c) => SUPERSCRIPT[c]).join("");
    return `${withMinus(mant)}×10${sup}`;
  }
  return withMinus(plain(rounded, digits));
}

/** Units written in the trade's fixed form: V/s as V/µs, V/√Hz as nV/√Hz, A/√Hz as pA/√Hz. */
const FIXED_UNITS: Record<string, { scale: number; text: string }> = {
  "V/s": { scale: 1e6, text: `V/${MICRO}s` },
  "V/√Hz": { scale: 1e-9, text: "nV/√Hz" },
  "A/√Hz": { scale: 1e-12, text: "pA/√Hz" },
};

const PREFIX_SYMBOL: Record<number, string> = Object.fromEntries(FORMAT_PREFIXES.map((p) => [p.exp, p.symbol]));

/** v / 10^exp3 rounded to `digits` significant figures, as text. */
function scaled(v: number, exp3: number, digits: number): string {
  const m = exp3 >= 0 ? v / 10 ** exp3 : v * 10 ** -exp3;
  return m.toPrecision(digits);
}

/** Units formatted with an engineering prefix. */
const PREFIXED_UNITS = new Set(["Ω", "F", "H", "Hz", "V", "A", "W", "s", "V/°C", "V/s", "V/√Hz", "A/√Hz", "J", "C"]);

/** Options of {@link formatQuantity}. */
export interface FormatOptions {
  /** Significant figures, default 4. */
  digits?: number;
  /** The value is a fraction to be shown as a percentage / in ppm. */
  scale?: "percent" | "ppm";
}

/**
 * Format an SI value with an engineering prefix (mantissa in [1, 1000)) and its unit symbol.
 *
 * - V/s is shown as V/µs, V/√Hz as nV/√Hz, A/√Hz as pA/√Hz (the trade's usual units).
 * - dB, %, ppm, ppm/°C, °C, °, K/W, V/V, LSB and plain numbers get no prefix.
 * - `scale: "percent"` / `"ppm"` shows a fraction as % / ppm (unit "%", "ppm" or "ppm/°C").
 * - Negative numbers use the real minus sign (U+2212); number and unit are separated by one
 *   normal space (degrees of angle take none: "45°").
 *
 * @param value the value in SI base units (or a fraction when `scale` is given)
 * @param unit SI unit symbol, e.g. "Ω", "Hz", "V/s"
 * @example formatQuantity(4700, "Ω") // "4.7 kΩ"
 * @example formatQuantity(2e7, "V/s") // "20 V/µs"
 * @example formatQuantity(0.001, "%", { scale: "percent" }) // "0.1 %"
 */
export function formatQuantity(value: number, unit: string, opts: FormatOptions = {}): string {
  const digits = opts.digits ?? 4;
  if (!Number.isFinite(value)) return `${formatNumber(value)}${unit ? UNIT_SEPARATOR + unit : ""}`;
  let v = value;
  let u = unit;
  if (opts.scale === "percent") {
    v = value * 100;
    u = "%";
  } else if (opts.scale === "ppm") {
    v = value * 1e6;
    u = unit === "ppm/°C" || unit === "1/°C" ? "ppm/°C" : "ppm";
  }
  // The trade's fixed units, while the number stays readable; otherwise the prefixed SI unit.
  const fixedUnit = FIXED_UNITS[u];
  if (fixedUnit) {
    const m = Math.abs(v / fixedUnit.scale);
    if (v === 0 || (m >= 1e-3 && m < 1e6)) return `${formatNumber(v / fixedUnit.scale, digits)}${UNIT_SEPARATOR}${fixedUnit.text}`;
  }
  if (u === "°") return `${formatNumber(v, digits)}°`;
  if (!PREFIXED_UNITS.has(u) && (NO_PREFIX_UNITS.has(u) || !/^[A-Za-zΩ]/.test(u))) {
    return u === "" ? formatNumber(v, digits) : `${formatNumber(v, digits)}${UNIT_SEPARATOR}${u}`;
  }
  if (v === 0) return `0${UNIT_SEPARATOR}${u}`;
  if (Math.abs(v) < 1e-15 || Math.abs(v) >= 1e15) return `${formatNumber(v, digits)}${UNIT_SEPARATOR}${u}`;
  // Capacitance is never written with a mega prefix ("MF" was once a marking for µF).
  const maxExp = u === "F" ? 0 : 12;
  let exp3 = Math.floor(Math.floor(Math.log10(Math.abs(v))) / 3) * 3;
  exp3 = Math.max(-15, Math.min(maxExp, exp3));
  let text = scaled(v, exp3, digits);
  let mant = Number(text);
  if (Math.abs(mant) >= 1000 && exp3 < maxExp) {
    exp3 += 3;
    text = scaled(v, exp3, digits);
    mant = Number(text);
  } else if (Math.abs(mant) < 1 && exp3 > -15) {
    exp3 -= 3;
    text = scaled(v, exp3, digits);
    mant = Number(text);
  }
  const prefix = PREFIX_SYMBOL[exp3] ?? "";
  const absMant = Math.abs(mant);
  text = absMant >= 1e-4 && absMant < 1e7 ? withMinus(plain(mant, digits)) : formatNumber(mant, digits);
  return `${text}${UNIT_SEPARATOR}${prefix}${u}`;
}
