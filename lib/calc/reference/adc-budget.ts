/**
 * reference.adc-budget — error budget of an ADC's voltage reference: initial accuracy, drift over
 * temperature (box method), long-term drift, low-frequency noise and load regulation, added worst
 * case and RSS, and stated in mV, ppm and LSB at N bits.
 *
 * An error ΔV in the reference is a gain error of the converter: at full scale it moves the code
 * by (ΔV / Vref)·2^N LSB, whatever the ratio of full scale to Vref.
 *
 * Units: V, A, Ω, °C, h; accuracy, tempco and drift as fractions (tempco 1/°C, drift per 1000 h).
 *
 * References:
 * [1] P. Horowitz, W. Hill, The Art of Electronics, 3rd ed., Cambridge 2015, ch. 9 (voltage
 *     references: accuracy, tempco by the box method, long-term drift, noise).
 * [2] Long-term drift scaled with the square root of time, √(t / 1000 h): common practice, no
 *     source (makers state drift per 1000 h and note that it slows with time).
 * [3] Worst-case sum and root-sum-square of independent terms: common practice, no source.
 */
import { z } from "zod";
import type { CalcOutput, CalcType, FieldSpec } from "../core/types";
import { referenceParamsSchema } from "../core/parts";
import { OutputBuilder } from "../core/output";
import { checkAtMost } from "../core/checks";
import { formatQuantity as q, formatNumber } from "../core/units";
import { numberBetween, positiveAtMost, yesNo } from "../core/schema";
import { demoReference, toRawPart } from "../core/demo-parts";

const REF = {
  box: "Horowitz & Hill, The Art of Electronics, 3rd ed., ch. 9 (tempco, box method: TC = ΔV / (Vnom·ΔT)); the box spans 25 °C, where the initial accuracy is stated",
  lt: "common practice, no source (long-term drift grows as √(t / 1000 h))",
  lsb: "definition: 1 LSB = FS / 2^N; a reference error ΔV moves full scale by (ΔV/Vref)·2^N LSB",
  sum: "common practice, no source (worst-case sum and RSS of independent terms)",
};

/** Input schema of the ADC reference budget, SI base units. */
export const adcBudgetSchema = z
  .object({
    reference: referenceParamsSchema,
    bits: z.number({ error: "Resolution must be a number" }).int("Resolution must be a whole number of bits").min(6, "Resolution must be between 6 and 32 bits").max(32, "Resolution must be between 6 and 32 bits"),
    /** ADC full scale as a multiple of Vref (often 1 or 2), V/V. */
    fsRatio: positiveAtMost("Full scale / Vref", 100, "V/V"),
    tMin: numberBetween("Minimum temperature", -273, 300, "°C"),
    tMax: numberBetween("Maximum temperature", -273, 300, "°C"),
    /** Operating time over which long-term drift counts, h. */
    hours: numberBetween("Operating time", 0, 1e6, "h"),
    /** Change of the reference's load current (ADC reference input, buffer), A. */
    loadStep: numberBetween("Load current change", 0, 1, "A"),
    /** Initial accuracy removed by a one-time calibration. */
    calibrated: yesNo("Initial accuracy calibrated out"),
    /** Allowed total reference error (worst case), LSB. */
    errorMaxLsb: positiveAtMost("Allowed reference error", 1e9, "LSB"),
  })
  .superRefine((v, ctx) => {
    if (v.tMax < v.tMin) ctx.addIssue({ code: "custom", path: ["tMax"], message: "Maximum temperature must not be below the minimum temperature" });
  });

/** Parsed input of the ADC reference budget (SI base units). */
export type AdcBudgetInput = z.output<typeof adcBudgetSchema>;

const fields: FieldSpec[] = [
  { kind: "part", key: "reference", label: "Voltage reference", symbol: "U1", partKind: "reference", group: "Reference" },
  { kind: "integer", key: "bits", label: "ADC resolution", symbol: "N", min: 6, max: 32, group: "Converter" },
  { kind: "quantity", key: "fsRatio", label: "Full scale / Vref", symbol: "FS/Vref", unit: "V/V", placeholder: "1", group: "Converter" },
  { kind: "quantity", key: "errorMaxLsb", label: "Allowed reference error (worst case)", symbol: "εmax", unit: "LSB", placeholder: "4", group: "Converter" },
  { kind: "quantity", key: "loadStep", label: "Reference load current change", symbol: "ΔIL", unit: "A", placeholder: "1m", group: "Converter" },
  { kind: "boolean", key: "calibrated", label: "Initial accuracy calibrated out", symbol: "", group: "Converter" },
  { kind: "quantity", key: "tMin", label: "Minimum temperature", symbol: "Tmin", unit: "°C", placeholder: "-40", group: "Environment" },
  { kind: "quantity", key: "tMax", label: "Maximum temperature", symbol: "Tmax", unit: "°C", placeholder: "85", group: "Environment" },
  { kind: "quantity", key: "hours", label: "Operating time (for long-term drift)", symbol: "t", unit: "h", placeholder: "8760", group: "Environment" },
];

const defaults = {
  reference: toRawPart(demoReference("LW-VR4096")),
  bits: 12,
  fsRatio: "1",
  errorMaxLsb: "5",
  loadStep: "1m",
  calibrated: false,
  tMin: "-40",
  tMax: "85",
  hours: "8760",
};

/**
 * Compute the ADC reference budget. Pure; never throws for schema-valid input.
 * @param input parsed input, SI base units
 */
export function computeAdcBudget(input: AdcBudgetInput): CalcOutput {
  const r = input.reference;
  const b = new OutputBuilder({
    Vref: { value: r.vNom, unit: "V", symbol: "Vref" },
    acc: { value: input.calibrated ? 0 : r.accuracy, unit: "%", symbol: input.calibrated ? "εinit (calibrated)" : "εinit", scale: "percent" },
    TC: { value: r.tempco, unit: "ppm/°C", symbol: "TC", scale: "ppm" },
    LTD: { value: r.longTermDrift, unit: "ppm", symbol: "εLT,1000h", scale: "ppm" },
    Vn: { value: r.noisePp, unit: "V", symbol: "en,pp" },
    Zd: { value: r.zDyn, unit: "Ω", symbol: "Zd" },
    dI: { value: input.loadStep, unit: "A", symbol: "ΔIL" },
    N: { value: input.bits, unit: "", symbol: "N" },
    k: { value: input.fsRatio, unit: "V/V", symbol: "FS/Vref" },
    Tmin: { value: input.tMin, unit: "°C", symbol: "Tmin" },
    Tmax: { value: input.tMax, unit: "°C", symbol: "Tmax" },
    T25: { value: 25, unit: "°C", symbol: "25 °C" },
    t: { value: input.hours, unit: "h", symbol: "t" },
  });
  const f = b.sheet;
  const C = "Converter";
  b.formula({ key: "full_scale", label: "ADC full scale", symbol: "FS", expr: "k * Vref", unit: "V" }, {}, C);
  b.formula({ key: "lsb", label: "One LSB", symbol: "LSB", expr: "full_scale / 2^N", unit: "V", reference: REF.lsb }, {}, C);

  const E = "Error terms (at the reference)";
  b.formula({ key: "e_init", label: "Initial accuracy", symbol: "ΔVinit", expr: "Vref * acc", unit: "V" }, {}, E);
  // The initial accuracy is the error at 25 °C, so the drift that adds to it is V(T) − V(25 °C):
  // the box must contain 25 °C even when the operating range does not.
  const span = b.formula({ key: "dT_span", label: "Temperature span of the box (operating range and 25 °C)", symbol: "ΔT", expr: "max(Tmax, T25) - min(Tmin, T25)", unit: "°C", reference: REF.box }, {}, E);
  b.formula({ key: "e_temp", label: "Drift over temperature (box method)", symbol: "ΔVT", expr: "Vref * TC * dT_span", unit: "V", reference: REF.box }, {}, E);
  b.formula({ key: "e_long", label: "Long-term drift over the operating time", symbol: "ΔVLT", expr: "Vref * LTD * sqrt(t / 1000)", unit: "V", reference: REF.lt }, {}, E);
  b.formula({ key: "e_noise", label: "Noise 0.1–10 Hz (peak-to-peak)", symbol: "ΔVn", expr: "Vn", unit: "V" }, {}, E);
  b.formula({ key: "e_load", label: "Load regulation (Zd·ΔIL)", symbol: "ΔVload", expr: "Zd * dI", unit: "V" }, {}, E);

  const T = "Total";
  const wc = b.formula({ key: "e_wc", label: "Total reference error, worst case", symbol: "ΔVwc", expr: "e_init + e_temp + e_long + e_noise + e_load", unit: "V", reference: REF.sum }, {}, T);
  const rss = b.formula({ key: "e_rss", label: "Total reference error, RSS", symbol: "ΔVrss", expr: "sqrt(e_init^2 + e_temp^2 + e_long^2 + e_noise^2 + e_load^2)", unit: "V", reference: REF.sum }, {}, T);
  b.formula({ key: "e_wc_ppm", label: "Total error, worst case", symbol: "εwc", expr: "e_wc / Vref", unit: "ppm", scale: "ppm" }, {}, T);
  b.formula({ key: "e_rss_ppm", label: "Total error, RSS", symbol: "εrss", expr: "e_rss / Vref", unit: "ppm", scale: "ppm" }, {}, T);
  const wcLsb = b.formula({ key: "e_wc_lsb", label: "Total error at full scale, worst case", symbol: "εwc,LSB", expr: "e_wc / Vref * 2^N", unit: "LSB", reference: REF.lsb }, {}, T);
  const rssLsb = b.formula({ key: "e_rss_lsb", label: "Total error at full scale, RSS", symbol: "εrss,LSB", expr: "e_rss / Vref * 2^N", unit: "LSB", reference: REF.lsb }, {}, T);
  if (wc > 0 && Number.isFinite(r.vNom / (2 * wc))) b.formula({ key: "bits_supported", label: "Resolution the reference supports to ½ LSB (worst case)", symbol: "Nref", expr: "log2(Vref / (2 * e_wc))", unit: "bit" }, {}, T);

  const terms = [
    { key: "e_init", label: input.calibrated ? "Initial accuracy (calibrated out)" : "Initial accuracy" },
    { key: "e_temp", label: `Temperature drift, ${q(input.tMin, "°C")} to ${q(input.tMax, "°C")}${span > input.tMax - input.tMin + 1e-9 ? ` (box extended to 25 °C: ${q(span, "°C")})` : ""}` },
    { key: "e_long", label: `Long-term drift, ${formatNumber(input.hours)} h` },
    { key: "e_noise", label: "Noise 0.1–10 Hz p-p" },
    { key: "e_load", label: `Load regulation, ΔIL ${q(input.loadStep, "A")}` },
  ];
  const scale = 2 ** input.bits / r.vNom;
  const dominant = terms.reduce((a, t) => (f.value(t.key) > f.value(a.key) ? t : a), terms[0]);
  b.tables.push({
    id: "budget",
    title: "Reference error budget",
    columns: [
      { key: "term", label: "Term" },
      { key: "mv", label: "Error", align: "right" },
      { key: "ppm", label: "ppm of Vref", align: "right" },
      { key: "lsb", label: `LSB at ${input.bits} bits`, align: "right" },
      { key: "share", label: "Share of worst case", align: "right" },
    ],
    rows: [
      ...terms.map((t) => {
        const v = f.value(t.key);
        return { term: t.label, mv: q(v, "V"), ppm: q(v / r.vNom, "ppm", { scale: "ppm" }), lsb: q(v * scale, "LSB", { digits: 3 }), share: q(wc > 0 ? v / wc : 0, "%", { scale: "percent", digits: 3 }) };
      }),
      { term: "Total, worst case", mv: q(wc, "V"), ppm: q(wc / r.vNom, "ppm", { scale: "ppm" }), lsb: q(wcLsb, "LSB", { digits: 3 }), share: "100 %" },
      { term: "Total, RSS", mv: q(rss, "V"), ppm: q(rss / r.vNom, "ppm", { scale: "ppm" }), lsb: q(rssLsb, "LSB", { digits: 3 }), share: "" },
    ],
  });
  b.check(
    checkAtMost("error.total", "Reference error", wcLsb, input.errorMaxLsb, {
      pass: () => `Worst-case reference error ${q(wc, "V")} (${q(wcLsb, "LSB", { digits: 3 })} at ${input.bits} bits; RSS ${q(rssLsb, "LSB", { digits: 3 })}) is within the allowed ${q(input.errorMaxLsb, "LSB")}.`,
      warn: () => `Worst-case reference error ${q(wcLsb, "LSB", { digits: 3 })} is close to the allowed ${q(input.errorMaxLsb, "LSB")}; ${dominant.label.toLowerCase()} dominates.`,
      fail: () =>
        `Worst-case reference error ${q(wc, "V")} is ${q(wcLsb, "LSB", { digits: 3 })} at ${input.bits} bits (RSS ${q(rssLsb, "LSB", { digits: 3 })}), above the allowed ${q(input.errorMaxLsb, "LSB")}; ${dominant.label.toLowerCase()} dominates (${q(f.value(dominant.key), "V")}). ${
          dominant.key === "e_init" ? "Calibrate the initial error out or choose a better grade." : dominant.key === "e_temp" ? "Choose a lower-tempco reference or narrow the temperature range." : dominant.key === "e_noise" ? "Filter the reference or average conversions." : dominant.key === "e_load" ? "Buffer the reference." : "Recalibrate periodically."
        }`,
    }, { warnBelow: 0.1 }),
  );
  b.assumptions.push(
    "The reference error is taken as a converter gain error; it is stated at full scale, where it is largest.",
    "Temperature drift is bounded by the full box height TC·ΔT (box method, conservative), where ΔT spans the operating range and 25 °C, the temperature of the initial accuracy (and of a calibration, if one is made); the part's TC is taken to hold over that span.",
    "Long-term drift is scaled from the stated 1000 h figure by √(t / 1000 h) (common practice, no source).",
    "Noise enters as its 0.1–10 Hz peak-to-peak value, in both sums (conservative); wide-band noise above 10 Hz is not included.",
    ...(input.calibrated ? ["The initial accuracy is removed by a one-time calibration; drift after calibration remains."] : []),
  );
  b.components.push({ ref: "U1", kind: "reference", value: r.vNom, display: r.name, role: "ADC voltage reference" });
  return b.build();
}

/** The ADC reference error budget calculation type. */
export const adcReferenceBudget: CalcType<typeof adcBudgetSchema> = {
  id: "reference.adc-budget",
  pack: "reference",
  title: "ADC reference error budget",
  summary: "Adds the reference's initial accuracy, temperature and long-term drift, noise and load regulation into a total error in mV, ppm and LSB.",
  version: "1.0.1",
  schema: adcBudgetSchema,
  fields,
  defaults,
  compute: computeAdcBudget,
};
