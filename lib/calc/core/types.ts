/**
 * The contract every calculation type fulfils. Pure data: everything a compute returns is
 * JSON-serialisable, so it can be stored as a snapshot, diffed between revisions, rendered in the
 * browser and printed in a report without re-computing.
 *
 * Units: every number in an input or a result is in SI base units (V, A, Ω, F, Hz, s, W, K or °C
 * where stated, V/s for slew rate, V/√Hz for noise density). Formatting with prefixes happens
 * only at the edges (lib/calc/core/units.ts).
 */
import type { z } from "zod";

export type PackId = "amplifier" | "filter" | "reference";

export const PACKS: ReadonlyArray<{ id: PackId; title: string; summary: string }> = [
  { id: "amplifier", title: "Amplifier pack", summary: "Gain stages, difference amplifiers, output and power stages." },
  { id: "filter", title: "Active filter pack", summary: "Low-pass, high-pass and band-pass active filters with tolerance analysis." },
  { id: "reference", title: "Reference pack", summary: "Shunt references, adjustable reference dividers and ADC reference error budgets." },
];

export type Severity = "pass" | "warning" | "fail";

/** One computed quantity, as shown in a results table. */
export interface ResultValue {
  /** Stable key within the type, e.g. "gain_actual". Used to diff revisions. */
  key: string;
  /** Plain-English label, e.g. "Closed-loop gain (after snapping)". */
  label: string;
  /** Symbol as printed, plain Unicode, e.g. "G", "f₋₃dB", "Vos,out". */
  symbol: string;
  /** Value in SI base units (or the dimensionless unit named in `unit`). Always finite. */
  value: number;
  /** Unit symbol of `value`: "V", "A", "Ω", "F", "Hz", "s", "W", "°C", "K/W", "V/V", "dB", "%",
   * "ppm", "LSB", "V/s", "V/√Hz", "A/√Hz", "°", "" (dimensionless). */
  unit: string;
  /** Optional group heading for long result tables, e.g. "DC error", "Noise". */
  group?: string;
}

/**
 * One scalar formula as evaluated. The expression is the mathjs source that produced `value`;
 * `symbolic` and `substituted` are the same expression printed for people.
 */
export interface FormulaRecord {
  /** Key of the result this formula produces (matches ResultValue.key where one exists). */
  key: string;
  label: string;
  /** Left-hand side symbol, e.g. "G". */
  symbol: string;
  /** mathjs expression text, e.g. "1 + Rf / Rg". */
  expression: string;
  /** Human form, e.g. "G = 1 + Rf / Rg". */
  symbolic: string;
  /** With the values substituted and formatted with units, e.g. "G = 1 + 10 kΩ / 4.7 kΩ". */
  substituted: string;
  /** The evaluated value (SI base units) and its unit. */
  value: number;
  unit: string;
  /** Where the formula comes from, e.g. "Franco, Design with Op Amps, 4th ed., eq. (6.14)". */
  reference?: string;
}

/** A check an engineer can act on. */
export interface Check {
  /** Stable id within the type, e.g. "swing.high". */
  id: string;
  severity: Severity;
  /** Short title, e.g. "Output swing, positive rail". */
  title: string;
  /** A sentence that says what is wrong (or right) and what to do, with the numbers. */
  message: string;
  /**
   * Normalised margin: (limit − actual) / limit in the sense of the check, so > 0 passes and
   * < 0 fails. Used to rank parts in part screening. Omit where a margin has no meaning.
   */
  margin?: number;
}

/** A plot the UI and the report draw. Data only; the renderers decide the look. */
export type Plot = LinePlot | HistogramPlot | LevelsPlot;

export interface Axis {
  label: string;
  unit: string;
  scale: "linear" | "log";
}

export interface LineSeries {
  name: string;
  /** "ideal" and "real" are drawn in a fixed pair of styles; "limit" as a dashed reference line. */
  role?: "ideal" | "real" | "limit" | "other";
  x: number[];
  y: number[];
}

/** x-y curves, e.g. Bode magnitude (log f, dB), phase (log f, degrees), group delay. */
export interface LinePlot {
  kind: "line";
  id: string;
  title: string;
  x: Axis;
  y: Axis;
  series: LineSeries[];
}

/** Monte Carlo histogram: `edges` has bins+1 entries, `counts` has bins entries. */
export interface HistogramPlot {
  kind: "histogram";
  id: string;
  title: string;
  x: Axis;
  edges: number[];
  counts: number[];
  /** Optional markers, e.g. nominal value, spec limits, percentiles. */
  markers?: Array<{ label: string; value: number }>;
}

/** Levels on one voltage axis, e.g. output swing against the rails. */
export interface LevelsPlot {
  kind: "levels";
  id: string;
  title: string;
  unit: string;
  /** Horizontal lines; `role` picks the style. */
  levels: Array<{ label: string; value: number; role: "rail" | "limit" | "signal" | "bias" }>;
  /** Optional shaded bands, e.g. the part's allowed output range, the required signal range. */
  bands?: Array<{ label: string; from: number; to: number; role: "allowed" | "required" }>;
}

/** A free-form table, e.g. the section-by-section table of a filter. Cells are pre-formatted. */
export interface ResultTable {
  id: string;
  title: string;
  columns: Array<{ key: string; label: string; align?: "left" | "right" }>;
  rows: Array<Record<string, string>>;
}

/** A component of the circuit as designed (component list / bill of materials). */
export interface Component {
  /** Reference designator, e.g. "R1", "C3", "U1". */
  ref: string;
  kind: "resistor" | "capacitor" | "opamp" | "reference" | "other";
  /** Value in SI base units (Ω, F); 0 for parts without a value. */
  value: number;
  /** Formatted value, e.g. "4.7 kΩ", "2.2 nF", or the part name. */
  display: string;
  /** Preferred series the value was picked from, e.g. "E24"; empty if not from a series. */
  series?: string;
  /** Tolerance as a fraction, e.g. 0.01 for 1 %. */
  tolerance?: number;
  /** What it does, e.g. "Feedback resistor, section 2". */
  role: string;
}

/** Everything a compute returns. */
export interface CalcOutput {
  results: ResultValue[];
  formulas: FormulaRecord[];
  checks: Check[];
  plots: Plot[];
  tables: ResultTable[];
  components: Component[];
  /** Assumptions the method makes, one sentence each. */
  assumptions: string[];
  /** Safety cautions (mains, heat, dissipation), one sentence each. Empty when none apply. */
  cautions: string[];
}

// ---------------------------------------------------------------------------------------------
// Input description, used by the UI (form), the report (inputs table) and raw-input parsing.

export type FieldSpec =
  | QuantityField
  | IntegerField
  | SelectField
  | BooleanField
  | PartField;

interface FieldBase {
  /** Key in the input object (dotted paths are not used; nested objects only for parts). */
  key: string;
  label: string;
  /** Symbol as printed in the report, e.g. "Rf", "VCC", "f₀". */
  symbol: string;
  help?: string;
  /** Group heading in the form and the report, e.g. "Specification", "Supply", "Load". */
  group?: string;
  /** Only show / require this field when another field has one of these values. */
  when?: { key: string; in: Array<string | number | boolean> };
}

/** A real number entered with SI prefixes or an IEC 60062 code ("4k7", "10 kHz", "2.2u"). */
export interface QuantityField extends FieldBase {
  kind: "quantity";
  /** Unit symbol of the SI base unit: "Ω", "F", "Hz", "V", "A", "W", "s", "°C", "K/W", "V/V",
   * "dB", "%", "ppm", "ppm/°C", "V/s", "V/√Hz", "A/√Hz", "" */
  unit: string;
  /** Shown in the form as the typical way to type it, e.g. "10k", "2n2". */
  placeholder?: string;
  /** For "%" and "ppm" fields: entered as a percentage / ppm, stored as a fraction. */
  scale?: "percent" | "ppm";
}

export interface IntegerField extends FieldBase {
  kind: "integer";
  min: number;
  max: number;
}

export interface SelectField extends FieldBase {
  kind: "select";
  options: Array<{ value: string | number; label: string }>;
}

export interface BooleanField extends FieldBase {
  kind: "boolean";
}

/** An op-amp or reference from the workspace parts library (its parameters, snapshotted). */
export interface PartField extends FieldBase {
  kind: "part";
  partKind: PartKind;
}

export type PartKind = "opamp" | "reference";

/**
 * Raw inputs as the user typed them, stored on the draft exactly as entered so nothing is lost
 * even while a field does not parse. Quantity fields hold strings ("4k7"); integers, selects and
 * booleans hold their values; a part field holds a RawPart.
 */
export type RawInputs = Record<string, string | number | boolean | RawPart | undefined>;

export interface RawPart {
  /** Library part id it came from, if any. */
  partId?: string;
  name: string;
  /** Parameter values: numbers (SI, from the library) or strings (typed overrides). */
  values: Record<string, string | number>;
  /** Parameters the user overrode, each with a note saying why (shown in the report). */
  overrides?: Record<string, { note: string }>;
}

/** Per-field parse or validation error. `field` is the input key (or "part.param"). */
export interface FieldError {
  field: string;
  message: string;
}

// ---------------------------------------------------------------------------------------------

/** A calculation type: one module under lib/calc/<pack>/. */
export interface CalcType<S extends z.ZodType = z.ZodType> {
  /** Stable id, "<pack>.<name>", e.g. "amplifier.gain-stage". Stored with each calculation. */
  id: string;
  pack: PackId;
  title: string;
  /** One sentence: what it designs or checks. */
  summary: string;
  /** Engine version of this module (semver). Bump on any change to a formula or check. */
  version: string;
  /** zod schema over parsed inputs (SI base units), with ranges. */
  schema: S;
  /** Form / report description of the inputs, in display order. */
  fields: FieldSpec[];
  /** A sensible starting point, as raw inputs (what a new calculation sheet shows). */
  defaults: RawInputs;
  /** Inputs -> results. Pure; never throws for schema-valid input; never returns NaN. */
  compute(input: z.output<S>): CalcOutput;
  /** Optional SPICE netlist of the circuit as designed. */
  netlist?(input: z.output<S>, model: "ideal" | "single-pole"): string;
}
