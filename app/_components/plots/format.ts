/**
 * Number text for plots. All of it goes through lib/calc/core/units.ts (formatQuantity,
 * formatNumber), the one formatter of the product; this file only adds the compact variant tick
 * labels need:
 * - a linear axis shares one prefixed unit, shown once in the axis title ("Group delay (µs)"),
 *   and its ticks are plain numbers with the same number of decimals ("0.5", "1.0", "1.5");
 * - a log axis labels each decade with its own prefix ("10 Hz", "1 kHz", "1 MHz").
 */
import { formatNumber, formatQuantity, MINUS, UNIT_SEPARATOR } from "@/lib/calc/core/units";

/** How the ticks of one linear axis are written. */
export interface LinearTickFormat {
  /** Unit text of the axis title, with the shared prefix, e.g. "µs", "kHz", "dB", "°". */
  unitText: string;
  /** Power of ten the tick numbers are divided by (1e-6 for µs). */
  factor: number;
  /** Decimals every tick label gets. */
  decimals: number;
  /** Tick value (SI base units) → label, e.g. 1.5e-6 → "1.5" when unitText is "µs". */
  format(value: number): string;
}

/**
 * The compact tick format of a linear axis: the prefix formatQuantity would give the largest
 * tick, applied to all ticks, with the decimals the step needs.
 * @param ticks tick values in SI base units (of `unit`)
 * @param step the tick spacing (same units)
 * @param unit the axis unit symbol, e.g. "s", "Hz", "dB", "°", "V"
 * @example linearTickFormat([0, 5e-7, 1e-6], 5e-7, "s").format(5e-7) // "0.5" (unitText "µs")
 */
export function linearTickFormat(ticks: number[], step: number, unit: string): LinearTickFormat {
  const ref = ticks.reduce((m, t) => Math.max(m, Math.abs(t)), 0) || Math.abs(step) || 1;
  let factor = 1;
  let unitText = unit;
  const sample = formatQuantity(ref, unit, { digits: 6 });
  const cut = sample.indexOf(UNIT_SEPARATOR);
  if (unit !== "" && cut > 0) {
    const mantissa = Number(sample.slice(0, cut).replace(MINUS, "-"));
    if (Number.isFinite(mantissa) && mantissa !== 0) {
      factor = 10 ** Math.round(Math.log10(ref / Math.abs(mantissa)));
      unitText = sample.slice(cut + UNIT_SEPARATOR.length);
    }
  }
  const scaled = Math.abs(step / factor);
  const decimals = Number.isFinite(scaled) && scaled > 0 ? Math.max(0, Math.min(12, Math.ceil(-Math.log10(scaled) - 1e-6))) : 0;
  return {
    unitText,
    factor,
    decimals,
    format(value: number): string {
      const s = (value / factor).toFixed(decimals);
      if (Number(s) === 0) return decimals > 0 ? (0).toFixed(decimals) : "0";
      return s.startsWith("-") ? MINUS + s.slice(1) : s;
    },
  };
}

/**
 * Label of one log-axis tick: the value with its own SI prefix and unit.
 * @param value tick value (SI base units, > 0)
 * @param unit the axis unit symbol
 * @example logTickLabel(1e5, "Hz") // "100 kHz"
 */
export function logTickLabel(value: number, unit: string): string {
  return formatQuantity(value, unit, { digits: 3 });
}

/**
 * Axis title with its unit in brackets: "Gain (dB)", "Frequency (Hz)"; a plain number axis
 * keeps the bare label.
 * @param label the axis label
 * @param unitText the unit as shown (may carry a prefix, e.g. "µs")
 */
export function axisTitle(label: string, unitText: string): string {
  return unitText ? `${label} (${unitText})` : label;
}

/**
 * A read-out value (hover, data table, summaries): four significant figures with prefix and unit.
 * @param value SI base units
 * @param unit unit symbol
 * @param digits significant figures, default 4
 * @example readout(12589.25, "Hz") // "12.59 kHz"
 */
export function readout(value: number, unit: string, digits = 4): string {
  if (!Number.isFinite(value)) return "—";
  return formatQuantity(value, unit, { digits });
}

/**
 * A formatter for a set of values shown together in a column (levels of a levels plot): one
 * prefix for all, and the decimals that give the largest value `sig` significant figures, so the
 * numbers line up ("5.00 V", "4.90 V", "0.10 V").
 * @param values the values (SI base units)
 * @param unit unit symbol
 * @param sig significant figures of the largest value, default 3
 * @example sharedFormat([5, 0.1], "V")(0.1) // "0.10 V"
 */
export function sharedFormat(values: number[], unit: string, sig = 3): (value: number) => string {
  const finite = values.filter((v) => Number.isFinite(v));
  const maxAbs = finite.reduce((m, v) => Math.max(m, Math.abs(v)), 0);
  if (maxAbs === 0) return (v) => readout(v, unit);
  const step = Number(`1e${Math.floor(Math.log10(maxAbs)) - sig + 1}`);
  const fmt = linearTickFormat(finite, step, unit);
  const sep = fmt.unitText === "" || fmt.unitText === "°" ? "" : UNIT_SEPARATOR;
  return (v) => (Number.isFinite(v) ? `${fmt.format(v)}${sep}${fmt.unitText}` : "—");
}

/**
 * A read-out of a value on an axis spanning `span`: values closer to zero than a hundred-
 * thousandth of the span read as 0 (a passband at −2×10⁻¹² dB reads "0 dB"), others as
 * {@link readout}.
 * @param value data units
 * @param unit unit symbol
 * @param span the axis' data span (same units); NaN or ≤ 0 disables the rounding to zero
 */
export function readoutOnAxis(value: number, unit: string, span: number): string {
  if (Number.isFinite(value) && span > 0 && Math.abs(value) < span * 1e-5) return readout(0, unit);
  return readout(value, unit);
}

/**
 * A count or plain number as text (real minus sign, no prefix).
 * @param value the number
 */
export function plainNumber(value: number): string {
  return formatNumber(value, 6);
}

/**
 * Keep numbers and their units together in running text: the space after a digit becomes a
 * no-break space ("400 mV" never breaks between "400" and "mV").
 * @param text a sentence with formatted quantities
 */
export function keepUnits(text: string): string {
  return text.replace(/(\d) (?=\S)/g, "$1\u00a0");
}
