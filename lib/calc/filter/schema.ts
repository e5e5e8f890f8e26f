/**
 * Input schemas and form fields of the active filter pack. One pattern for the whole family:
 * the low-pass and high-pass types share one schema (built per kind), the band-pass type shares
 * every field except the response specification. All values in SI base units (Hz, Ω, V, V/V),
 * dB where named, tolerances as fractions (entered in %).
 */
import { z } from "zod";
import { opAmpParamsSchema } from "../core/parts";
import type { FieldSpec, RawInputs } from "../core/types";
import { demoOpAmp, toRawPart } from "../core/demo-parts";
import { formatQuantity } from "../core/units";
import { MAX_MONTE_CARLO_TRIALS } from "./tolerance";

const num = (field: string) => z.number({ error: `${field} must be a number` }).refine(Number.isFinite, { message: `${field} must be finite` });
const show = (v: number, unit: string) => formatQuantity(v, unit, { digits: 6 });
const between = (field: string, lo: number, hi: number, unit: string) =>
  num(field).refine((v) => v >= lo && v <= hi, { message: `${field} must be between ${show(lo, unit)} and ${show(hi, unit)}` });
const positiveUpTo = (field: string, hi: number, unit: string) =>
  num(field).refine((v) => v > 0, { message: `${field} must be greater than ${show(0, unit)}` }).refine((v) => v <= hi, { message: `${field} must be at most ${show(hi, unit)}` });
const tolerance = (field: string) =>
  num(field)
    .refine((v) => v > 0, { message: `${field} must be greater than 0 %` })
    .refine((v) => v <= 0.5, { message: `${field} must be at most 50 %` });

/** Largest and smallest cutoff / centre frequency accepted, Hz. */
export const FREQUENCY_RANGE = { min: 0.01, max: 10e6 } as const;

const common = {
  resistorLevel: between("resistorLevel", 10, 10e6, "Ω"),
  capSeries: z.enum(["E6", "E12", "E24"], { error: "capSeries must be E6, E12 or E24" }),
  resSeries: z.enum(["E24", "E48", "E96", "E192"], { error: "resSeries must be E24, E48, E96 or E192" }),
  resTolerance: tolerance("resTolerance"),
  capTolerance: tolerance("capTolerance"),
  gainToleranceDb: positiveUpTo("gainToleranceDb", 20, "dB"),
  frequencyTolerance: tolerance("frequencyTolerance"),
  stopbandFreq: positiveUpTo("stopbandFreq", 1e9, "Hz"),
  stopbandAttenMin: positiveUpTo("stopbandAttenMin", 200, "dB"),
  opamp: opAmpParamsSchema,
  supplyPos: between("supplyPos", -100, 100, "V"),
  supplyNeg: between("supplyNeg", -100, 100, "V"),
  inputAmplitude: positiveUpTo("inputAmplitude", 100, "V"),
  mcTrials: z
    .number({ error: "mcTrials must be a number" })
    .int("mcTrials must be a whole number")
    .min(1, "mcTrials must be at least 1")
    .max(MAX_MONTE_CARLO_TRIALS, `mcTrials must be at most ${MAX_MONTE_CARLO_TRIALS.toLocaleString("en-GB")}`),
  mcDistribution: z.enum(["uniform", "normal"], { error: "mcDistribution must be uniform or normal" }),
  mcSeed: z.number({ error: "mcSeed must be a number" }).int("mcSeed must be a whole number").min(0, "mcSeed must be 0 or more").max(4294967295, "mcSeed must be at most 4294967295"),
};

/** Schema of the low-pass and high-pass types. */
export function cascadeSchema(kind: "lowpass" | "highpass") {
  return z
    .object({
      response: z.enum(["butterworth", "bessel", "chebyshev"], { error: "response must be butterworth, bessel or chebyshev" }),
      order: z.number({ error: "order must be a number" }).int("order must be a whole number from 1 to 8").min(1, "order must be from 1 to 8").max(8, "order must be from 1 to 8"),
      rippleDb: z.union([z.literal(0.5), z.literal(1), z.literal(2), z.literal(3)], { error: "rippleDb must be 0.5, 1, 2 or 3 dB" }).optional(),
      cutoffMeaning: z.enum(["-3db", "ripple-edge"], { error: "cutoffMeaning must be -3db or ripple-edge" }).optional(),
      cutoff: between("cutoff", FREQUENCY_RANGE.min, FREQUENCY_RANGE.max, "Hz"),
      fixGain: z.boolean({ error: "fixGain must be yes or no" }),
      gain: between("gain", 0.01, 1000, "V/V").optional(),
      gainSharing: z.enum(["equal", "first", "last"], { error: "gainSharing must be equal, first or last" }).optional(),
      topology: z.enum(["sk-unity", "sk-equal", "mfb"], { error: "topology must be sk-unity, sk-equal or mfb" }),
      firstOrder: z.enum(["rc-buffer", "inverting"], { error: "firstOrder must be rc-buffer or inverting" }),
      passbandFreq: positiveUpTo("passbandFreq", 1e9, "Hz"),
      passbandRippleMax: positiveUpTo("passbandRippleMax", 20, "dB"),
      ...common,
    })
    .superRefine((v, ctx) => {
      if (v.response === "chebyshev" && v.rippleDb === undefined) ctx.addIssue({ code: "custom", path: ["rippleDb"], message: "rippleDb is required for a Chebyshev response: 0.5, 1, 2 or 3 dB" });
      if (v.fixGain && v.gain === undefined) ctx.addIssue({ code: "custom", path: ["gain"], message: "gain is required when the passband gain is fixed" });
      if (kind === "lowpass" && !(v.stopbandFreq > v.cutoff))
        ctx.addIssue({ code: "custom", path: ["stopbandFreq"], message: "stopbandFreq must be above the cutoff for a low-pass filter" });
      if (kind === "highpass" && !(v.stopbandFreq < v.cutoff))
        ctx.addIssue({ code: "custom", path: ["stopbandFreq"], message: "stopbandFreq must be below the cutoff for a high-pass filter" });
      if (kind === "lowpass" && !(v.passbandFreq < v.stopbandFreq))
        ctx.addIssue({ code: "custom", path: ["passbandFreq"], message: "passbandFreq must be below the stopband frequency for a low-pass filter" });
      if (kind === "highpass" && !(v.passbandFreq > v.stopbandFreq))
        ctx.addIssue({ code: "custom", path: ["passbandFreq"], message: "passbandFreq must be above the stopband frequency for a high-pass filter" });
      if (!(v.supplyPos > v.supplyNeg)) ctx.addIssue({ code: "custom", path: ["supplyPos"], message: "supplyPos must be above supplyNeg" });
    });
}

/** Schema of the band-pass type. */
export const bandpassSchema = z
  .object({
    centre: between("centre", FREQUENCY_RANGE.min, FREQUENCY_RANGE.max, "Hz"),
    q: between("q", 0.1, 100, ""),
    gain: between("gain", 0.01, 1000, "V/V"),
    ...common,
  })
  .superRefine((v, ctx) => {
    if (Math.abs(Math.log(v.stopbandFreq / v.centre)) < 1e-6)
      ctx.addIssue({ code: "custom", path: ["stopbandFreq"], message: "stopbandFreq must differ from the centre frequency (above or below it)" });
    if (!(v.supplyPos > v.supplyNeg)) ctx.addIssue({ code: "custom", path: ["supplyPos"], message: "supplyPos must be above supplyNeg" });
  });

/** Parsed input of the low-/high-pass types (SI units). */
export type CascadeInput = z.output<ReturnType<typeof cascadeSchema>>;
/** Parsed input of the band-pass type (SI units). */
export type BandpassInput = z.output<typeof bandpassSchema>;

const realisationFields: FieldSpec[] = [
  { kind: "quantity", key: "resistorLevel", label: "Resistor level aimed at", symbol: "R_L", unit: "Ω", placeholder: "10k", group: "Component values", help: "Capacitors are picked so the resistors land near this value." },
  { kind: "select", key: "capSeries", label: "Capacitor series", symbol: "", group: "Component values", options: [{ value: "E6", label: "E6" }, { value: "E12", label: "E12" }, { value: "E24", label: "E24" }] },
  { kind: "select", key: "resSeries", label: "Resistor series", symbol: "", group: "Component values", options: [{ value: "E24", label: "E24" }, { value: "E48", label: "E48" }, { value: "E96", label: "E96" }, { value: "E192", label: "E192" }] },
  { kind: "quantity", key: "resTolerance", label: "Resistor tolerance", symbol: "t_R", unit: "%", scale: "percent", placeholder: "1", group: "Component values" },
  { kind: "quantity", key: "capTolerance", label: "Capacitor tolerance", symbol: "t_C", unit: "%", scale: "percent", placeholder: "5", group: "Component values" },
];

const specTail: FieldSpec[] = [
  { kind: "quantity", key: "frequencyTolerance", label: "Allowed frequency deviation", symbol: "Δf/f", unit: "%", scale: "percent", placeholder: "2", group: "Specification check" },
  { kind: "quantity", key: "gainToleranceDb", label: "Allowed passband gain error", symbol: "ΔG", unit: "dB", placeholder: "0.5", group: "Specification check" },
  { kind: "quantity", key: "stopbandFreq", label: "Stopband frequency", symbol: "f_s", unit: "Hz", placeholder: "5k", group: "Specification check" },
  { kind: "quantity", key: "stopbandAttenMin", label: "Minimum stopband attenuation", symbol: "A_s", unit: "dB", placeholder: "40", group: "Specification check" },
];

const partAndSupplyFields: FieldSpec[] = [
  { kind: "part", key: "opamp", label: "Op-amp", symbol: "U", partKind: "opamp", group: "Op-amp and supply" },
  { kind: "quantity", key: "supplyPos", label: "Positive supply rail", symbol: "V+", unit: "V", placeholder: "5", group: "Op-amp and supply" },
  { kind: "quantity", key: "supplyNeg", label: "Negative supply rail", symbol: "V−", unit: "V", placeholder: "0", group: "Op-amp and supply" },
  { kind: "quantity", key: "inputAmplitude", label: "Input signal amplitude (peak)", symbol: "V_in,pk", unit: "V", placeholder: "1", group: "Op-amp and supply" },
];

const toleranceFields: FieldSpec[] = [
  { kind: "integer", key: "mcTrials", label: "Monte Carlo trials", symbol: "N", min: 1, max: MAX_MONTE_CARLO_TRIALS, group: "Tolerance analysis" },
  { kind: "select", key: "mcDistribution", label: "Part value distribution", symbol: "", group: "Tolerance analysis", options: [{ value: "uniform", label: "Uniform within tolerance" }, { value: "normal", label: "Normal, tolerance = 3σ" }] },
  { kind: "integer", key: "mcSeed", label: "Random seed", symbol: "seed", min: 0, max: 4294967295, group: "Tolerance analysis" },
];

/** Form fields of the low-pass and high-pass types. */
export function cascadeFields(kind: "lowpass" | "highpass"): FieldSpec[] {
  return [
    { kind: "select", key: "response", label: "Response", symbol: "", group: "Specification", options: [{ value: "butterworth", label: "Butterworth" }, { value: "bessel", label: "Bessel" }, { value: "chebyshev", label: "Chebyshev" }] },
    { kind: "integer", key: "order", label: "Order", symbol: "n", min: 1, max: 8, group: "Specification" },
    { kind: "select", key: "rippleDb", label: "Passband ripple", symbol: "r", group: "Specification", when: { key: "response", in: ["chebyshev"] }, options: [{ value: 0.5, label: "0.5 dB" }, { value: 1, label: "1 dB" }, { value: 2, label: "2 dB" }, { value: 3, label: "3 dB" }] },
    { kind: "quantity", key: "cutoff", label: "Cutoff frequency", symbol: "f_c", unit: "Hz", placeholder: kind === "lowpass" ? "1k" : "100", group: "Specification" },
    { kind: "select", key: "cutoffMeaning", label: "Cutoff frequency is", symbol: "", group: "Specification", when: { key: "response", in: ["chebyshev"] }, options: [{ value: "-3db", label: "the −3 dB frequency" }, { value: "ripple-edge", label: "the ripple-band edge" }] },
    { kind: "boolean", key: "fixGain", label: "Set the passband gain", symbol: "", group: "Specification" },
    { kind: "quantity", key: "gain", label: "Passband gain (magnitude)", symbol: "|G|", unit: "V/V", placeholder: "1", group: "Specification", when: { key: "fixGain", in: [true] } },
    { kind: "select", key: "gainSharing", label: "Gain shared", symbol: "", group: "Specification", when: { key: "fixGain", in: [true] }, options: [{ value: "equal", label: "equally among sections that can take gain" }, { value: "first", label: "in the first section that can take it" }, { value: "last", label: "in the last section that can take it" }] },
    { kind: "select", key: "topology", label: "Second-order sections", symbol: "", group: "Topology", options: [{ value: "sk-unity", label: "Sallen-Key, unity gain" }, { value: "sk-equal", label: "Sallen-Key, equal components" }, { value: "mfb", label: "Multiple feedback" }] },
    { kind: "select", key: "firstOrder", label: "First-order section (odd orders)", symbol: "", group: "Topology", options: [{ value: "rc-buffer", label: "RC with buffer" }, { value: "inverting", label: "Inverting stage" }] },
    ...realisationFields,
    { kind: "quantity", key: "passbandFreq", label: "Passband edge for the ripple check", symbol: "f_p", unit: "Hz", placeholder: kind === "lowpass" ? "500" : "200", group: "Specification check" },
    { kind: "quantity", key: "passbandRippleMax", label: "Maximum passband variation", symbol: "A_p", unit: "dB", placeholder: "1", group: "Specification check" },
    ...specTail,
    ...partAndSupplyFields,
    ...toleranceFields,
  ];
}

/** Form fields of the band-pass type. */
export const bandpassFields: FieldSpec[] = [
  { kind: "quantity", key: "centre", label: "Centre frequency", symbol: "f₀", unit: "Hz", placeholder: "1k", group: "Specification" },
  { kind: "quantity", key: "q", label: "Quality factor", symbol: "Q", unit: "", placeholder: "5", group: "Specification" },
  { kind: "quantity", key: "gain", label: "Centre gain (magnitude)", symbol: "|G₀|", unit: "V/V", placeholder: "1", group: "Specification" },
  ...realisationFields,
  ...specTail,
  ...partAndSupplyFields,
  ...toleranceFields,
];

/** A plausible starting design for a low-pass (1 kHz) or high-pass (100 Hz) sheet, as raw inputs. */
export function cascadeDefaults(kind: "lowpass" | "highpass"): RawInputs {
  return {
    response: "butterworth",
    order: 4,
    rippleDb: 1,
    cutoff: kind === "lowpass" ? "1k" : "100",
    cutoffMeaning: "-3db",
    fixGain: true,
    gain: "1",
    gainSharing: "equal",
    topology: "sk-unity",
    firstOrder: "rc-buffer",
    resistorLevel: "10k",
    capSeries: "E12",
    resSeries: "E96",
    resTolerance: "1",
    capTolerance: "2",
    passbandFreq: kind === "lowpass" ? "300" : "330",
    passbandRippleMax: "0.5",
    frequencyTolerance: "5",
    gainToleranceDb: "0.5",
    stopbandFreq: kind === "lowpass" ? "5k" : "20",
    stopbandAttenMin: "40",
    opamp: toRawPart(demoOpAmp("LW-OA320")),
    supplyPos: "5",
    supplyNeg: "0",
    inputAmplitude: "1",
    mcTrials: 2000,
    mcDistribution: "uniform",
    mcSeed: 1,
  };
}
