/**
 * amplifier.gain-stage — inverting or non-inverting op-amp gain stage on a split supply, or on a
 * single supply with a mid-rail bias.
 *
 * Designs the resistor pair from a preferred series and checks the stage against its
 * specification: gain and its error, closed-loop bandwidth, slew rate and full-power bandwidth,
 * output swing at the real load, input common-mode range, DC output error and drift, noise and
 * SNR, and stability with a capacitive load.
 *
 * Units: SI base units throughout (V, A, Ω, F, Hz, °C; slew rate V/s; noise V/√Hz, A/√Hz;
 * tolerances and error limits as fractions).
 *
 * References (chapters as in the 4th edition):
 * [1] S. Franco, Design with Operational Amplifiers and Analog Integrated Circuits, 4th ed.,
 *     McGraw-Hill 2015: ch. 1 (gain, loop gain), ch. 5 (static limitations: offset, bias
 *     currents, drift), ch. 6 (dynamic limitations: closed-loop bandwidth, slew rate, full-power
 *     bandwidth), ch. 7 (noise, noise bandwidth), ch. 8 (stability, capacitive load).
 * [2] P. Horowitz, W. Hill, The Art of Electronics, 3rd ed., Cambridge 2015, ch. 8 (noise,
 *     Johnson noise 4kTR).
 * [3] CODATA 2018 / SI 2019: k = 1.380649e-23 J/K (exact).
 * [4] IEC 60063:2015, preferred number series.
 */
import { z } from "zod";
import type { CalcOutput, CalcType, FieldSpec } from "../core/types";
import { opAmpParamsSchema } from "../core/parts";
import { bestRatioPair, nearestPreferred, type ESeries } from "../core/eseries";
import { OutputBuilder, logspace } from "../core/output";
import { checkAtLeast, checkAtMost, makeCheck } from "../core/checks";
import { formatQuantity as q, formatNumber } from "../core/units";
import { finiteNumber, numberBetween, oneOf, positiveAtMost, yesNo } from "../core/schema";
import { demoOpAmp, toRawPart } from "../core/demo-parts";
import { outputSwingSection, supplySection, SWING_REFERENCE } from "./common";
import { closedLoopAt, crossover, lowestSecondPole, phaseMargin, secondOrder, type LoopModel } from "./opamp-model";
import { gainStageNetlist } from "../spice/gain-stage";

/** Boltzmann constant, J/K (exact, SI 2019). */
export const BOLTZMANN = 1.380649e-23;
/** Temperature of the noise calculation, K (25 °C). */
export const NOISE_TEMPERATURE = 298.15;

const RESISTOR_SERIES = ["E12", "E24", "E48", "E96", "E192"] as const;

const REF = {
  gain: "Franco, Design with Op Amps, 4th ed., ch. 1 (ideal gain, noise gain 1/β)",
  loop: "Franco, Design with Op Amps, 4th ed., ch. 1 (closed-loop gain with finite loop gain)",
  bw: "Franco, Design with Op Amps, 4th ed., ch. 6 (closed-loop bandwidth f_B = f_t / (1/β))",
  pole: "Franco, Design with Op Amps, 4th ed., ch. 6 (dominant-pole model a(jf) = a0 / (1 + jf/fb))",
  slew: "Franco, Design with Op Amps, 4th ed., ch. 6 (slew rate, full-power bandwidth FPBW = SR / (2π·Vom))",
  dc: "Franco, Design with Op Amps, 4th ed., ch. 5 (output error from Vos, IB, IOS)",
  noise: "Franco, Design with Op Amps, 4th ed., ch. 7; Horowitz & Hill 3rd ed., ch. 8 (4kTR)",
  nbw: "Franco, Design with Op Amps, 4th ed., ch. 7 (noise bandwidth of a single pole, π/2·f_B)",
  stab: "Franco, Design with Op Amps, 4th ed., ch. 8 (capacitive load, phase margin)",
  loaded: "circuit theory: the open-loop output resistance Ro and the total load RL,tot divide the open-loop voltage",
  swing: SWING_REFERENCE,
};

/** Input schema of the gain stage, SI base units. */
export const gainStageSchema = z
  .object({
    configuration: oneOf("Configuration", ["non-inverting", "inverting"]),
    /** Target gain magnitude |G|, V/V. */
    gain: numberBetween("Gain |G|", 0.01, 10000, "V/V"),
    supply: oneOf("Supply", ["split", "single"]),
    /** Positive rail V+ (single supply: the supply voltage), V. */
    vPos: numberBetween("Positive supply V+", 0.5, 200, "V"),
    /** Negative rail V− (split supply), V, ≤ 0. */
    vNeg: numberBetween("Negative supply V−", -200, 0, "V").optional(),
    /** Bias (signal reference) voltage for a single supply, V. */
    vBias: finiteNumber("Bias voltage Vbias").optional(),
    /** DC resistance the non-inverting input sees from the bias network (single supply), Ω. */
    rBias: numberBetween("Bias network resistance Rbias", 0, 100e6, "Ω").optional(),
    series: oneOf("Resistor series", RESISTOR_SERIES),
    /** Resistor tolerance, fraction. */
    tolerance: numberBetween("Resistor tolerance", 0, 0.2, "%", "percent"),
    /** Feedback resistor target; the design searches half a decade either side, Ω. */
    rfTarget: numberBetween("Feedback resistor target", 10, 10e6, "Ω"),
    /** Source resistance, Ω. */
    rSource: numberBetween("Source resistance Rs", 0, 10e6, "Ω"),
    /** Match the DC resistance at the non-inverting input to Rf‖Rg (bias-current compensation). */
    biasCompensation: yesNo("Bias-current compensation"),
    /** Required output amplitude, V peak. */
    voutPeak: numberBetween("Output amplitude", 1e-6, 200, "V"),
    /** Highest signal frequency at full amplitude, Hz. */
    fMax: numberBetween("Highest signal frequency", 1e-3, 1e9, "Hz"),
    /** Allowed gain error (DC, worst case), fraction. */
    gainErrorMax: positiveAtMost("Allowed gain error", 0.5, "%", "percent"),
    /** Load resistance (returns to the signal reference), Ω. */
    rLoad: numberBetween("Load resistance RL", 1, 1e9, "Ω"),
    /** Load capacitance, F. */
    cLoad: numberBetween("Load capacitance CL", 0, 1e-3, "F"),
    /** Operating temperature range, °C. */
    tMin: numberBetween("Minimum temperature", -273, 300, "°C"),
    tMax: numberBetween("Maximum temperature", -273, 300, "°C"),
    /** How the bias current changes with temperature. */
    ibModel: oneOf("Bias current over temperature", ["constant", "doubling"]),
    /** Allowed DC output error over temperature (worst case), V. */
    dcErrorMax: positiveAtMost("Allowed DC output error", 100, "V"),
    /** Lower edge of the noise band, Hz. */
    fNoiseLow: numberBetween("Noise band lower edge", 1e-3, 1e8, "Hz"),
    /** Required signal-to-noise ratio at full amplitude, dB. */
    snrMin: numberBetween("Required SNR", 0, 250, "dB"),
    opamp: opAmpParamsSchema,
  })
  .superRefine((v, ctx) => {
    if (v.configuration === "non-inverting" && v.gain < 1) {
      ctx.addIssue({ code: "custom", path: ["gain"], message: "Gain |G| must be at least 1 V/V for a non-inverting stage" });
    }
    if (v.supply === "split" && v.vNeg === undefined) {
      ctx.addIssue({ code: "custom", path: ["vNeg"], message: "Negative supply V− is required for a split supply" });
    }
    if (v.supply === "single") {
      if (v.vBias === undefined) ctx.addIssue({ code: "custom", path: ["vBias"], message: "Bias voltage Vbias is required for a single supply" });
      else if (!(v.vBias > 0 && v.vBias < v.vPos)) {
        ctx.addIssue({ code: "custom", path: ["vBias"], message: "Bias voltage Vbias must be between 0 V and the supply V+" });
      }
      if (v.rBias === undefined) ctx.addIssue({ code: "custom", path: ["rBias"], message: "Bias network resistance Rbias is required for a single supply" });
    }
    if (v.tMax < v.tMin) ctx.addIssue({ code: "custom", path: ["tMax"], message: "Maximum temperature must not be below the minimum temperature" });
  });

/** Parsed input of the gain stage (SI base units). Shape kept stable for netlist writers. */
export type GainStageInput = z.output<typeof gainStageSchema>;

const fields: FieldSpec[] = [
  { kind: "select", key: "configuration", label: "Configuration", symbol: "", group: "Specification", options: [{ value: "non-inverting", label: "Non-inverting" }, { value: "inverting", label: "Inverting" }] },
  { kind: "quantity", key: "gain", label: "Gain magnitude", symbol: "|G|", unit: "V/V", placeholder: "10", group: "Specification", help: "Magnitude of the signal gain; an inverting stage has gain −|G|." },
  { kind: "quantity", key: "gainErrorMax", label: "Allowed gain error", symbol: "εG,max", unit: "%", scale: "percent", placeholder: "1", group: "Specification" },
  { kind: "quantity", key: "voutPeak", label: "Output amplitude (peak)", symbol: "Vo,pk", unit: "V", placeholder: "2", group: "Specification" },
  { kind: "quantity", key: "fMax", label: "Highest signal frequency", symbol: "fmax", unit: "Hz", placeholder: "20k", group: "Specification" },
  { kind: "quantity", key: "dcErrorMax", label: "Allowed DC output error", symbol: "Eo,max", unit: "V", placeholder: "10m", group: "Specification" },
  { kind: "quantity", key: "snrMin", label: "Required SNR at full amplitude", symbol: "SNRmin", unit: "dB", placeholder: "80", group: "Specification" },
  { kind: "select", key: "supply", label: "Supply", symbol: "", group: "Supply", options: [{ value: "split", label: "Split (±)" }, { value: "single", label: "Single, mid-rail bias" }] },
  { kind: "quantity", key: "vPos", label: "Positive supply", symbol: "V+", unit: "V", placeholder: "15", group: "Supply" },
  { kind: "quantity", key: "vNeg", label: "Negative supply", symbol: "V−", unit: "V", placeholder: "-15", group: "Supply", when: { key: "supply", in: ["split"] } },
  { kind: "quantity", key: "vBias", label: "Bias voltage", symbol: "Vbias", unit: "V", placeholder: "2.5", group: "Supply", when: { key: "supply", in: ["single"] }, help: "Signal reference: the non-inverting input and the output rest here." },
  { kind: "quantity", key: "rBias", label: "Bias network resistance", symbol: "Rbias", unit: "Ω", placeholder: "50k", group: "Supply", when: { key: "supply", in: ["single"] }, help: "DC (Thevenin) resistance from the bias network into the non-inverting input." },
  { kind: "select", key: "series", label: "Resistor series", symbol: "", group: "Resistors", options: RESISTOR_SERIES.map((s) => ({ value: s, label: s })) },
  { kind: "quantity", key: "tolerance", label: "Resistor tolerance", symbol: "tol", unit: "%", scale: "percent", placeholder: "1", group: "Resistors" },
  { kind: "quantity", key: "rfTarget", label: "Feedback resistor target", symbol: "Rf,target", unit: "Ω", placeholder: "10k", group: "Resistors", help: "The design picks Rf within half a decade of this value." },
  { kind: "boolean", key: "biasCompensation", label: "Bias-current compensation resistor", symbol: "Rc", group: "Resistors" },
  { kind: "quantity", key: "rSource", label: "Source resistance", symbol: "Rs", unit: "Ω", placeholder: "0", group: "Source and load" },
  { kind: "quantity", key: "rLoad", label: "Load resistance", symbol: "RL", unit: "Ω", placeholder: "10k", group: "Source and load" },
  { kind: "quantity", key: "cLoad", label: "Load capacitance", symbol: "CL", unit: "F", placeholder: "100p", group: "Source and load" },
  { kind: "quantity", key: "tMin", label: "Minimum temperature", symbol: "Tmin", unit: "°C", placeholder: "-40", group: "Environment" },
  { kind: "quantity", key: "tMax", label: "Maximum temperature", symbol: "Tmax", unit: "°C", placeholder: "85", group: "Environment" },
  { kind: "select", key: "ibModel", label: "Bias current over temperature", symbol: "", group: "Environment", options: [{ value: "constant", label: "Data-sheet maximum holds (bipolar input)" }, { value: "doubling", label: "Doubles every 10 °C (FET/CMOS input)" }] },
  { kind: "quantity", key: "fNoiseLow", label: "Noise band lower edge", symbol: "fL", unit: "Hz", placeholder: "10", group: "Environment" },
  { kind: "part", key: "opamp", label: "Op-amp", symbol: "U1", partKind: "opamp", group: "Op-amp" },
];

const defaults = {
  configuration: "non-inverting",
  gain: "10",
  gainErrorMax: "3",
  voutPeak: "2",
  fMax: "20k",
  dcErrorMax: "50m",
  snrMin: "70",
  supply: "single",
  vPos: "5",
  vNeg: "-5",
  vBias: "2.5",
  rBias: "50k",
  series: "E96",
  tolerance: "1",
  rfTarget: "10k",
  biasCompensation: false,
  rSource: "0",
  rLoad: "10k",
  cLoad: "100p",
  tMin: "-40",
  tMax: "85",
  ibModel: "doubling",
  fNoiseLow: "10",
  opamp: toRawPart(demoOpAmp("LW-OA320")),
};

function par(a: number, b: number): number {
  if (a === 0 || b === 0) return 0;
  return (a * b) / (a + b);
}

/**
 * Compute the gain stage. Pure; never throws for schema-valid input; no NaN escapes.
 * @param input parsed input, SI base units
 */
export function computeGainStage(input: GainStageInput): CalcOutput {
  const p = input.opamp;
  const nonInv = input.configuration === "non-inverting";
  const split = input.supply === "split";
  const vPos = input.vPos;
  const vNeg = split ? (input.vNeg ?? 0) : 0;
  const vRef = split ? 0 : (input.vBias ?? vPos / 2);
  const follower = nonInv && input.gain <= 1 + 1e-9;
  const tol = input.tolerance;
  const series = input.series as ESeries;
  const gainTarget = nonInv ? input.gain : -input.gain;

  const b = new OutputBuilder({
    Gt: { value: gainTarget, unit: "V/V", symbol: "G_target" },
    Rs: { value: input.rSource, unit: "Ω", symbol: "Rs" },
    RL: { value: input.rLoad, unit: "Ω", symbol: "RL" },
    CL: { value: input.cLoad, unit: "F", symbol: "CL" },
    tol: { value: tol, unit: "%", symbol: "tol", scale: "percent" },
    A0dB: { value: p.aolDb, unit: "dB", symbol: "A₀,dB" },
    GBW: { value: p.gbw, unit: "Hz", symbol: "GBW" },
    SR: { value: p.slewRate, unit: "V/s", symbol: "SR" },
    Vpk: { value: input.voutPeak, unit: "V", symbol: "Vo,pk" },
    fmax: { value: input.fMax, unit: "Hz", symbol: "fmax" },
    Vpos: { value: vPos, unit: "V", symbol: "V+" },
    Vneg: { value: vNeg, unit: "V", symbol: "V−" },
    Vref: { value: vRef, unit: "V", symbol: split ? "Vref" : "Vbias" },
    Ro: { value: p.rout, unit: "Ω", symbol: "Ro" },
    cmPos: { value: p.vicmPos, unit: "V", symbol: "Vicm+" },
    cmNeg: { value: p.vicmNeg, unit: "V", symbol: "Vicm−" },
    Vos: { value: p.vos, unit: "V", symbol: "Vos" },
    dVos: { value: p.vosDrift, unit: "V/°C", symbol: "ΔVos/ΔT" },
    Ib: { value: p.ib, unit: "A", symbol: "Ib" },
    Ios: { value: p.ios, unit: "A", symbol: "Ios" },
    en: { value: p.en, unit: "V/√Hz", symbol: "en" },
    inoise: { value: p.in, unit: "A/√Hz", symbol: "in" },
    fc: { value: p.enCorner, unit: "Hz", symbol: "fc" },
    fL: { value: input.fNoiseLow, unit: "Hz", symbol: "fL" },
    kB: { value: BOLTZMANN, unit: "J/K", symbol: "k", digits: 7 },
    T: { value: NOISE_TEMPERATURE, unit: "K", symbol: "T", digits: 5 },
    Tmin: { value: input.tMin, unit: "°C", symbol: "Tmin" },
    Tmax: { value: input.tMax, unit: "°C", symbol: "Tmax" },
  });
  const f = b.sheet;

  // ---- Resistor design -----------------------------------------------------------------
  let rf = 0;
  let rg = 0;
  if (!follower) {
    const ratio = nonInv ? input.gain - 1 : input.gain;
    const pair = bestRatioPair(ratio, series, {
      raMin: input.rfTarget / Math.sqrt(10),
      raMax: input.rfTarget * Math.sqrt(10),
      rbMin: 1,
      rbMax: 100e6,
      rbOffset: nonInv ? 0 : input.rSource,
    });
    if (pair) {
      rf = pair.ra;
      rg = pair.rb;
    } else {
      // No preferred pair fits (e.g. Rs alone exceeds Rf/|G|): show the ideal values and fail.
      rf = nearestPreferred(input.rfTarget, series);
      rg = Math.max(1, rf / ratio - (nonInv ? 0 : input.rSource));
      b.check(
        makeCheck(
          "resistors.design",
          "fail",
          "Resistor pair",
          nonInv
            ? `No ${series} pair with Rf within half a decade of ${q(input.rfTarget, "Ω")} gives the gain ${formatNumber(input.gain)} V/V; change the feedback resistor target.`
            : `The source resistance ${q(input.rSource, "Ω")} already exceeds Rf/|G| for every Rf near ${q(input.rfTarget, "Ω")}; raise the feedback resistor target above ${q(input.gain * input.rSource * 2, "Ω")} or buffer the source.`,
          -1,
        ),
      );
    }
  }
  f.define({ Rf: { value: rf, unit: "Ω", symbol: "Rf" }, Rg: { value: rg, unit: "Ω", symbol: nonInv ? "Rg" : "Rin" } });

  // ---- Load on the output (sets the loaded open-loop gain, the swing and the CL pole) ----------
  const O = "Output and load";
  if (follower) b.formula({ key: "r_load_total", label: "Total load on the output", symbol: "RL,tot", expr: "RL", unit: "Ω" }, {}, O);
  else if (nonInv) b.formula({ key: "r_load_total", label: "Total load on the output (RL ‖ (Rf + Rg))", symbol: "RL,tot", expr: "RL * (Rf + Rg) / (RL + Rf + Rg)", unit: "Ω" }, {}, O);
  else b.formula({ key: "r_load_total", label: "Total load on the output (RL ‖ Rf)", symbol: "RL,tot", expr: "RL * Rf / (RL + Rf)", unit: "Ω" }, {}, O);

  // ---- Gain --------------------------------------------------------------------------------
  const G = "Gain";
  b.formula({ key: "aol", label: "Open-loop DC gain", symbol: "A₀", expr: "10^(A0dB / 20)", unit: "V/V", reference: "definition of the decibel" }, {}, G);
  // The open-loop output resistance and the total load divide the open-loop gain.
  b.formula({ key: "aol_loaded", label: "Open-loop DC gain with the output loaded", symbol: "A₀,L", expr: "aol * r_load_total / (r_load_total + Ro)", unit: "V/V", reference: REF.loaded }, {}, G);
  if (follower) {
    b.formula({ key: "gain_ideal", label: "Signal gain (as designed)", symbol: "G", expr: "1", unit: "V/V", reference: REF.gain }, {}, G);
    b.formula({ key: "noise_gain", label: "Noise gain", symbol: "NG", expr: "1", unit: "V/V", reference: REF.gain }, {}, G);
  } else if (nonInv) {
    b.formula({ key: "gain_ideal", label: "Signal gain (as designed)", symbol: "G", expr: "1 + Rf / Rg", unit: "V/V", reference: REF.gain }, {}, G);
    b.formula({ key: "noise_gain", label: "Noise gain", symbol: "NG", expr: "1 + Rf / Rg", unit: "V/V", reference: REF.gain }, {}, G);
  } else {
    b.formula({ key: "gain_ideal", label: "Signal gain (as designed)", symbol: "G", expr: "-Rf / (Rg + Rs)", unit: "V/V", reference: REF.gain }, {}, G);
    b.formula({ key: "noise_gain", label: "Noise gain", symbol: "NG", expr: "1 + Rf / (Rg + Rs)", unit: "V/V", reference: REF.gain }, {}, G);
  }
  b.formula({ key: "gain_snap_error", label: "Gain error from preferred values", symbol: "εsnap", expr: "gain_ideal / Gt - 1", unit: "%", scale: "percent", digits: 6 }, {}, G);
  b.formula({ key: "loop_gain_dc", label: "DC loop gain", symbol: "T₀", expr: "aol_loaded / noise_gain", unit: "V/V", reference: REF.loop }, {}, G);
  b.formula({ key: "gain_dc", label: "DC gain with finite open-loop gain", symbol: "G_dc", expr: "gain_ideal / (1 + 1 / loop_gain_dc)", unit: "V/V", reference: REF.loop }, {}, G);
  if (follower) {
    b.formula({ key: "gain_max", label: "Gain, resistors at tolerance (high)", symbol: "G_max", expr: "1", unit: "V/V" }, {}, G);
    b.formula({ key: "gain_min", label: "Gain, resistors at tolerance (low)", symbol: "G_min", expr: "1", unit: "V/V" }, {}, G);
  } else if (nonInv) {
    b.formula({ key: "gain_max", label: "Gain, resistors at tolerance (high)", symbol: "G_max", expr: "1 + Rf * (1 + tol) / (Rg * (1 - tol))", unit: "V/V" }, {}, G);
    b.formula({ key: "gain_min", label: "Gain, resistors at tolerance (low)", symbol: "G_min", expr: "1 + Rf * (1 - tol) / (Rg * (1 + tol))", unit: "V/V" }, {}, G);
  } else {
    b.formula({ key: "gain_max", label: "Gain magnitude, resistors at tolerance (high)", symbol: "|G|max", expr: "Rf * (1 + tol) / (Rg * (1 - tol) + Rs)", unit: "V/V" }, {}, G);
    b.formula({ key: "gain_min", label: "Gain magnitude, resistors at tolerance (low)", symbol: "|G|min", expr: "Rf * (1 - tol) / (Rg * (1 + tol) + Rs)", unit: "V/V" }, {}, G);
  }
  const gainErr = b.formula(
    {
      key: "gain_error_wc",
      label: "Worst-case gain error (tolerance, preferred values, finite A₀)",
      symbol: "εG",
      expr: "max(abs(gain_max / (1 + 1 / loop_gain_dc) / abs(Gt) - 1), abs(gain_min / (1 + 1 / loop_gain_dc) / abs(Gt) - 1))",
      unit: "%",
      scale: "percent",
    },
    {},
    G,
  );
  const t0 = f.value("loop_gain_dc");
  const ng = f.value("noise_gain");
  const gIdeal = f.value("gain_ideal");
  // The resistor tolerance that would just meet an error limit with this pair (the same
  // worst-case expressions as gain_max / gain_min, solved by bisection; the error grows with tol).
  const toleranceFor = (limit: number): number => {
    const loopF = 1 / (1 + 1 / t0);
    const gt = Math.abs(gainTarget);
    const errAt = (t: number) => {
      const hi = nonInv ? 1 + (rf * (1 + t)) / (rg * (1 - t)) : (rf * (1 + t)) / (rg * (1 - t) + input.rSource);
      const lo = nonInv ? 1 + (rf * (1 - t)) / (rg * (1 + t)) : (rf * (1 - t)) / (rg * (1 + t) + input.rSource);
      return Math.max(Math.abs((hi * loopF) / gt - 1), Math.abs((lo * loopF) / gt - 1));
    };
    if (!(errAt(0) < limit)) return NaN;
    let a = 0;
    let c = 0.2;
    if (errAt(c) <= limit) return c;
    for (let i = 0; i < 60; i++) {
      const m = (a + c) / 2;
      if (errAt(m) <= limit) a = m;
      else c = m;
    }
    return a;
  };
  b.check(
    checkAtMost("gain.error", "Gain error", gainErr, input.gainErrorMax, {
      pass: () => `Worst-case DC gain error ${q(gainErr, "%", { scale: "percent" })} is within the allowed ${q(input.gainErrorMax, "%", { scale: "percent" })} (${series}, ${q(tol, "%", { scale: "percent" })} resistors).`,
      fail: () => {
        const head = `Worst-case DC gain error ${q(gainErr, "%", { scale: "percent" })} exceeds the allowed ${q(input.gainErrorMax, "%", { scale: "percent" })}`;
        const loop = t0 < 1000 ? `, or an op-amp with more open-loop gain (loop gain is only ${formatNumber(t0, 3)})` : "";
        const tNeed = follower ? NaN : toleranceFor(input.gainErrorMax);
        if (Number.isFinite(tNeed) && tNeed > 0) {
          return `${head}; resistors of ${q(tNeed, "%", { scale: "percent", digits: 2 })} or better would meet it with this pair (${q(tol, "%", { scale: "percent" })} now)${loop}.`;
        }
        return `${head} even with exact resistors: the preferred-value error is ${q(f.value("gain_snap_error"), "%", { scale: "percent" })} and the loop gain ${formatNumber(t0, 3)}; choose a denser series than ${series} or another feedback resistor target${loop}.`;
      },
    }),
  );
  if (!(t0 > 1)) {
    b.check(makeCheck("gain.loop", "fail", "Loop gain", `The noise gain ${formatNumber(ng)} V/V exceeds the loaded open-loop gain ${formatNumber(f.value("aol_loaded"))} V/V: there is no feedback left, so the gain is set by the op-amp, not the resistors. Split the gain over two stages.`, t0 - 1));
  }

  // ---- Bandwidth ---------------------------------------------------------------------------
  const D = "Frequency response";
  const kLoad = f.value("aol_loaded") / f.value("aol");
  b.formula({ key: "f_pole", label: "Open-loop dominant pole", symbol: "fp", expr: "GBW / aol", unit: "Hz", reference: REF.pole }, {}, D);
  b.formula({ key: "f3db_gbw", label: "Closed-loop bandwidth (GBW / NG)", symbol: "f₋₃dB", expr: "GBW / noise_gain", unit: "Hz", reference: REF.bw }, {}, D);
  // A(s) = A₀,L/(1 + s/ωp): the closed-loop pole is at fp·(1 + T₀) = GBW/A₀ + GBW·(A₀,L/A₀)/NG.
  const f3 = b.formula({ key: "f3db", label: "Closed-loop bandwidth (dominant-pole model, output loaded)", symbol: "f₋₃dB,dp", expr: "f_pole * (1 + loop_gain_dc)", unit: "Hz", reference: REF.pole }, {}, D);
  const droop = b.formula({ key: "droop_fmax", label: "Gain droop at fmax", symbol: "εf", expr: "1 - 1 / sqrt(1 + (fmax / f3db)^2)", unit: "%", scale: "percent", reference: REF.pole }, {}, D);
  b.check(
    checkAtLeast("bandwidth", "Closed-loop bandwidth", f3, input.fMax, {
      pass: () => `Closed-loop bandwidth ${q(f3, "Hz")} (noise gain ${formatNumber(ng)} V/V, GBW ${q(p.gbw, "Hz")}) is above the highest signal frequency ${q(input.fMax, "Hz")}.`,
      fail: () => `Closed-loop bandwidth ${q(f3, "Hz")} is below the highest signal frequency ${q(input.fMax, "Hz")}: noise gain ${formatNumber(ng)} V/V needs GBW ≥ ${q((ng * input.fMax) / kLoad, "Hz")} (part has ${q(p.gbw, "Hz")}${kLoad < 0.99 ? `; the load takes ${q((1 - kLoad) * 100, "%", { digits: 3 })} of the open-loop gain through Ro` : ""}); choose a faster op-amp or split the gain over two stages.`,
    }),
  );
  if (f3 >= input.fMax) {
    b.check(
      checkAtMost("bandwidth.droop", "Gain droop at fmax", droop, input.gainErrorMax, {
        pass: () => `Gain droop at ${q(input.fMax, "Hz")} is ${q(droop, "%", { scale: "percent" })}, within the allowed gain error.`,
        fail: () => `Gain falls by ${q(droop, "%", { scale: "percent" })} at ${q(input.fMax, "Hz")}, more than the allowed ${q(input.gainErrorMax, "%", { scale: "percent" })}; flat gain to fmax needs GBW ≥ ${q((ng * input.fMax) / kLoad / Math.sqrt(Math.max(1e-30, 1 / (1 - input.gainErrorMax) ** 2 - 1)), "Hz")}.`,
      }),
    );
  }

  // ---- Slew rate ---------------------------------------------------------------------------
  const srReq = b.formula({ key: "slew_required", label: "Slew rate needed", symbol: "SRreq", expr: "2 * pi * fmax * Vpk", unit: "V/s", reference: REF.slew }, {}, D);
  const fpbw = b.formula({ key: "fpbw", label: "Full-power bandwidth at Vo,pk", symbol: "FPBW", expr: "SR / (2 * pi * Vpk)", unit: "Hz", reference: REF.slew }, {}, D);
  b.check(
    checkAtLeast("slew", "Slew rate", p.slewRate, srReq, {
      pass: () => `Slew rate ${q(p.slewRate, "V/s")} covers the ${q(srReq, "V/s")} a ${q(input.voutPeak, "V")} peak sine at ${q(input.fMax, "Hz")} needs (full-power bandwidth ${q(fpbw, "Hz")}).`,
      fail: () => `Slew rate ${q(p.slewRate, "V/s")} is below the ${q(srReq, "V/s")} a ${q(input.voutPeak, "V")} peak sine at ${q(input.fMax, "Hz")} needs; the output will distort above ${q(fpbw, "Hz")} at this amplitude. Choose an op-amp with SR ≥ ${q(srReq, "V/s")} or reduce the amplitude.`,
    }),
  );

  // ---- Output swing and load ----------------------------------------------------------------
  const capCurrent = 2 * Math.PI * input.fMax * input.cLoad * input.voutPeak;
  const { vOmax, vOmin } = outputSwingSection(b, {
    part: p,
    vPos,
    vNeg,
    vRef,
    vPeak: input.voutPeak,
    advice: split ? "" : ", re-centre Vbias",
    group: O,
    // A sine at fmax into RL,tot ∥ CL: |I| = Vo,pk·|1/RL,tot + j2πf·CL|; the CL current is 90°
    // from the voltage, so at the voltage peak only the resistive current flows.
    ...(input.cLoad > 0
      ? {
          peakCurrent: { expr: "Vpk * sqrt(1 / r_load_total^2 + (2 * pi * fmax * CL)^2)", label: "Peak output current (RL,tot and CL, sine at fmax)", reference: "definition (admittance of RL,tot ∥ CL at fmax)" },
          swingCurrent: { expr: "Vpk / r_load_total", label: "Output current at the voltage peak (CL draws none there)" },
          currentAdvice:
            capCurrent * f.value("r_load_total") > input.voutPeak
              ? `the load capacitance alone draws ${q(capCurrent, "A")} at ${q(input.fMax, "Hz")}: reduce CL or the amplitude, or add a buffer that can drive it`
              : "raise the load or feedback resistances, reduce CL, or add a buffer",
        }
      : {}),
  });
  const needHi = vRef + input.voutPeak;
  const needLo = vRef - input.voutPeak;
  supplySection(b, p, vPos, vNeg, O);

  // ---- Input common-mode range -----------------------------------------------------------
  const C = "Input common-mode";
  const cmSwing = nonInv ? input.voutPeak / Math.abs(gIdeal || 1) : 0;
  f.define({ Vcm_sw: { value: cmSwing, unit: "V", symbol: nonInv ? "Vo,pk/G" : "0 V" } });
  const cmHi = b.formula({ key: "v_cm_high", label: "Highest voltage at the + input", symbol: "Vcm,hi", expr: "Vref + Vcm_sw", unit: "V" }, {}, C);
  const cmLo = b.formula({ key: "v_cm_low", label: "Lowest voltage at the + input", symbol: "Vcm,lo", expr: "Vref - Vcm_sw", unit: "V" }, {}, C);
  const cmMax = b.formula({ key: "v_icm_max", label: "Common-mode limit, positive", symbol: "Vicm,max", expr: "Vpos - cmPos", unit: "V" }, {}, C);
  const cmMin = b.formula({ key: "v_icm_min", label: "Common-mode limit, negative", symbol: "Vicm,min", expr: "Vneg + cmNeg", unit: "V" }, {}, C);
  const cmWhat = nonInv ? `The + input swings ${q(cmLo, "V")} to ${q(cmHi, "V")}` : `The + input sits at ${q(cmHi, "V")}`;
  b.check(
    checkAtMost("icmr.high", "Input common-mode, positive", cmHi - vRef, cmMax - vRef, {
      pass: () => `${cmWhat}, below the common-mode limit ${q(cmMax, "V")}.`,
      fail: () => `${cmWhat}, ${q(cmHi - cmMax, "V")} above the common-mode limit ${q(cmMax, "V")} (V+ ${q(vPos, "V")} less ${q(p.vicmPos, "V")} headroom): the input stage saturates. ${nonInv ? "Use the inverting configuration, " : ""}${split ? `raise V+ by at least ${q(cmHi - cmMax, "V")}` : `lower Vbias or raise V+ by at least ${q(cmHi - cmMax, "V")}`} or choose a part whose input range includes the positive rail.`,
    }),
    checkAtLeast("icmr.low", "Input common-mode, negative", cmLo - vRef, cmMin - vRef, {
      pass: () => `${cmWhat}, above the common-mode limit ${q(cmMin, "V")}.`,
      fail: () => `${cmWhat}, ${q(cmMin - cmLo, "V")} below the common-mode limit ${q(cmMin, "V")} (V− ${q(vNeg, "V")} plus ${q(p.vicmNeg, "V")} headroom): the input stage saturates. ${split ? "Lower V−" : "Raise Vbias"} by at least ${q(cmMin - cmLo, "V")} or choose a part whose input range includes the negative rail.`,
    }),
  );

  // ---- DC error ------------------------------------------------------------------------------
  const E = "DC error";
  if (follower) b.formula({ key: "r_minus", label: "DC resistance at the − input", symbol: "Rn", expr: "0", unit: "Ω" }, {}, E);
  else if (nonInv) b.formula({ key: "r_minus", label: "DC resistance at the − input (Rf ‖ Rg)", symbol: "Rn", expr: "Rf * Rg / (Rf + Rg)", unit: "Ω", reference: REF.dc }, {}, E);
  else b.formula({ key: "r_minus", label: "DC resistance at the − input (Rf ‖ (Rin + Rs))", symbol: "Rn", expr: "Rf * (Rg + Rs) / (Rf + Rg + Rs)", unit: "Ω", reference: REF.dc }, {}, E);
  const rn = f.value("r_minus");
  const rpNatural = split ? (nonInv ? input.rSource : 0) : (input.rBias ?? 0);
  let rComp = 0;
  let rpDc = rpNatural;
  let compNote = "no bias-current compensation";
  if (input.biasCompensation && rn > 0) {
    if (split && nonInv) {
      const need = rn - input.rSource;
      if (need > 0) {
        rComp = nearestPreferred(need, series);
        rpDc = input.rSource + rComp;
        compNote = `compensation resistor ${q(rComp, "Ω")} in series with the + input`;
      } else {
        compNote = `no compensation resistor: Rs ${q(input.rSource, "Ω")} already exceeds Rf‖Rg`;
      }
    } else if (split) {
      rComp = nearestPreferred(rn, series);
      rpDc = rComp;
      compNote = `compensation resistor ${q(rComp, "Ω")} from the + input to ground`;
    } else {
      rpDc = nearestPreferred(rn, series);
      compNote = `bias network resistance set to ${q(rpDc, "Ω")} (≈ Rf‖Rg) instead of ${q(input.rBias ?? 0, "Ω")}`;
    }
  }
  const hot = Math.max(0, input.tMax - 25);
  const ibFactor = input.ibModel === "doubling" ? 2 ** (hot / 10) : 1;
  f.define({ Rp: { value: rpDc, unit: "Ω", symbol: "Rp" }, kIb: { value: ibFactor, unit: "", symbol: "kIb" } });
  b.result("r_plus", "DC resistance at the + input", "Rp", rpDc, "Ω", E);
  b.formula({ key: "dT", label: "Largest temperature excursion from 25 °C", symbol: "ΔT", expr: "max(abs(Tmax - 25), abs(Tmin - 25))", unit: "°C" }, {}, E);
  b.formula({ key: "e_vos", label: "Output error from Vos", symbol: "Eo,Vos", expr: "noise_gain * Vos", unit: "V", reference: REF.dc }, {}, E);
  b.formula({ key: "e_ib", label: "Output error from Ib (Rp ≠ Rn)", symbol: "Eo,Ib", expr: "noise_gain * abs(Rp - r_minus) * Ib", unit: "V", reference: REF.dc }, {}, E);
  b.formula({ key: "e_ios", label: "Output error from Ios", symbol: "Eo,Ios", expr: "noise_gain * (Rp + r_minus) / 2 * Ios", unit: "V", reference: REF.dc }, {}, E);
  const e25 = b.formula({ key: "e_dc_25", label: "DC output error at 25 °C (worst case)", symbol: "Eo,25", expr: "e_vos + e_ib + e_ios", unit: "V", reference: REF.dc }, {}, E);
  b.formula({ key: "e_drift_vos", label: "Output drift from ΔVos/ΔT", symbol: "ΔEo,Vos", expr: "noise_gain * dVos * dT", unit: "V", reference: REF.dc }, {}, E);
  b.formula({ key: "e_drift_ib", label: "Output drift from the bias-current rise", symbol: "ΔEo,Ib", expr: "(kIb - 1) * (e_ib + e_ios)", unit: "V", reference: "common practice, no source (FET input bias current doubles every 10 °C)" }, {}, E);
  const eWc = b.formula({ key: "e_dc_wc", label: "DC output error over temperature (worst case)", symbol: "Eo,wc", expr: "e_dc_25 + e_drift_vos + e_drift_ib", unit: "V" }, {}, E);
  const eRss = b.formula({ key: "e_dc_rss", label: "DC output error over temperature (RSS)", symbol: "Eo,rss", expr: "sqrt(e_vos^2 + e_drift_vos^2 + (kIb * e_ib)^2 + (kIb * e_ios)^2)", unit: "V" }, {}, E);
  b.check(
    checkAtMost("dc.error", "DC output error", eWc, input.dcErrorMax, {
      pass: () => `Worst-case DC output error ${q(eWc, "V")} over ${q(input.tMin, "°C")} to ${q(input.tMax, "°C")} (RSS ${q(eRss, "V")}; ${q(e25, "V")} at 25 °C) is within the allowed ${q(input.dcErrorMax, "V")}; ${compNote}.`,
      fail: () => {
        // Compare the terms as they are over temperature: offset and its drift against the bias
        // currents after their rise.
        const eOff = f.value("e_vos") + f.value("e_drift_vos");
        const eBias = ibFactor * (f.value("e_ib") + f.value("e_ios"));
        const head = `Worst-case DC output error ${q(eWc, "V")} over ${q(input.tMin, "°C")} to ${q(input.tMax, "°C")} (RSS ${q(eRss, "V")}) exceeds the allowed ${q(input.dcErrorMax, "V")}; ${compNote}. Offset and drift give ${q(eOff, "V")}, bias currents ${q(eBias, "V")}.`;
        if (eOff >= eBias) {
          const budget = (input.dcErrorMax - eBias) / ng;
          return budget > 0
            ? `${head} Offset dominates: a part with Vos + ΔVos/ΔT × ${q(f.value("dT"), "°C")} ≤ ${q(budget, "V")} (now ${q(p.vos + p.vosDrift * f.value("dT"), "V")}) would meet it, or AC-couple Rg so the DC gain is 1, or lower the gain.`
            : `${head} Both need to fall: the bias-current terms alone use up the allowance; lower the resistances, add compensation and choose a lower-Vos part.`;
        }
        return `${head} Bias current dominates: ${compNote.startsWith("no bias") ? "add bias-current compensation (Rp = Rf‖Rg), " : ""}lower the resistances, or choose a part with lower Ib${input.ibModel === "doubling" ? " (it grows ×" + formatNumber(ibFactor, 3) + " by " + q(input.tMax, "°C") + ")" : ""}.`;
      },
    }),
  );

  // The output rests at the signal reference plus its DC error, so the signal swings around
  // Vref ± Eo,wc: with a large noise gain the offset alone can use up the swing.
  const roomSig = Math.min(vOmax - vRef, vRef - vOmin);
  if (input.voutPeak <= roomSig) {
    const peakWithDc = input.voutPeak + eWc;
    b.check(
      checkAtMost("swing.dc", "Output swing with the DC output error", peakWithDc, roomSig, {
        pass: () => `The ${q(input.voutPeak, "V")} peak plus the worst-case DC output error ±${q(eWc, "V")} stays within ${q(vOmin, "V")} to ${q(vOmax, "V")}.`,
        fail: () => `The output rests up to ±${q(eWc, "V")} from ${q(vRef, "V")} (worst-case DC output error over temperature), so the ${q(input.voutPeak, "V")} peak reaches ${q(vRef + peakWithDc, "V")} or ${q(vRef - peakWithDc, "V")}, beyond the output range ${q(vOmin, "V")} to ${q(vOmax, "V")}: the output clips. Keep the DC error below ${q(Math.max(0, roomSig - input.voutPeak), "V")} (lower-Vos part, bias-current compensation, or AC-couple Rg so the DC gain is 1), or reduce the amplitude to ${q(Math.max(0, roomSig - eWc), "V")} peak.`,
      }),
    );
  }

  // ---- Noise ----------------------------------------------------------------------------------
  const N = "Noise";
  const rpAc = nonInv ? (split ? rpDc : par(input.rSource, rpDc)) : split ? rpDc : 0;
  f.define({ Rp_ac: { value: rpAc, unit: "Ω", symbol: "Rp,ac" }, Rin_t: { value: nonInv ? rg : rg + input.rSource, unit: "Ω", symbol: nonInv ? "Rg" : "Rin + Rs" } });
  b.formula({ key: "nbw", label: "Noise bandwidth (single pole, from fL)", symbol: "NBW", expr: "f3db * atan(f3db / fL)", unit: "Hz", reference: REF.nbw }, {}, N);
  b.formula({ key: "flicker_integral", label: "1/f noise integral factor", symbol: "F1/f", expr: "fc / 2 * log(1 + (f3db / fL)^2)", unit: "Hz", reference: REF.noise }, {}, N);
  b.formula({ key: "eno_en", label: "Output noise from en", symbol: "Eno,en", expr: "noise_gain * en * sqrt(nbw + flicker_integral)", unit: "V", reference: REF.noise }, {}, N);
  b.formula({ key: "eno_in", label: "Output noise from in", symbol: "Eno,in", expr: "inoise * sqrt((noise_gain * Rp_ac)^2 + Rf^2) * sqrt(nbw)", unit: "V", reference: REF.noise }, {}, N);
  if (follower) {
    b.formula({ key: "eno_r", label: "Output noise from resistors (4kTR)", symbol: "Eno,R", expr: "sqrt(4 * kB * T * noise_gain^2 * Rp_ac) * sqrt(nbw)", unit: "V", reference: REF.noise }, {}, N);
  } else {
    b.formula({ key: "eno_r", label: "Output noise from resistors (4kTR)", symbol: "Eno,R", expr: "sqrt(4 * kB * T * (noise_gain^2 * Rp_ac + Rf + Rf^2 / Rin_t)) * sqrt(nbw)", unit: "V", reference: REF.noise }, {}, N);
  }
  const eno = b.formula({ key: "eno_total", label: "Total output noise (rms)", symbol: "Eno", expr: "sqrt(eno_en^2 + eno_in^2 + eno_r^2)", unit: "V", reference: REF.noise }, {}, N);
  b.formula({ key: "eni_total", label: "Input-referred noise (rms)", symbol: "Eni", expr: "eno_total / abs(gain_ideal)", unit: "V" }, {}, N);
  if (eno > 0) {
    const snr = b.formula({ key: "snr", label: "SNR at full amplitude", symbol: "SNR", expr: "20 * log10(Vpk / sqrt(2) / eno_total)", unit: "dB", reference: "definition (sine rms Vo,pk/√2 over rms noise)" }, {}, N);
    b.check(
      checkAtLeast("noise.snr", "Signal-to-noise ratio", snr, input.snrMin, {
        pass: () => `SNR ${q(snr, "dB")} at ${q(input.voutPeak, "V")} peak (output noise ${q(eno, "V")} rms, ${q(input.fNoiseLow, "Hz")} to the closed-loop pole) meets the required ${q(input.snrMin, "dB")}.`,
        fail: () => `SNR ${q(snr, "dB")} at ${q(input.voutPeak, "V")} peak (output noise ${q(eno, "V")} rms) is below the required ${q(input.snrMin, "dB")}, which needs output noise ≤ ${q(input.voutPeak / Math.SQRT2 / 10 ** (input.snrMin / 20), "V")} rms; ${f.value("eno_en") >= Math.max(f.value("eno_in"), f.value("eno_r")) ? "the op-amp's voltage noise dominates: choose a lower-en part or limit the bandwidth with a filter" : f.value("eno_r") >= f.value("eno_in") ? "resistor noise dominates: lower the resistances" : "current noise dominates: lower the resistances or choose a part with lower in"}.`,
      }),
    );
  } else {
    b.check(makeCheck("noise.snr", "warning", "Signal-to-noise ratio", "The part has no voltage or current noise entered and the circuit has no resistor noise, so the SNR cannot be stated; enter the part's noise densities."));
  }

  // ---- Stability --------------------------------------------------------------------------------
  const S = "Stability";
  const a0 = f.value("aol_loaded");
  const fp = f.value("f_pole");
  let f2 = Infinity;
  if (input.cLoad > 0 && p.rout > 0) {
    f2 = b.formula({ key: "f_pole2", label: "Second pole from Ro and CL", symbol: "f2", expr: "1 / (2 * pi * (Ro * r_load_total / (Ro + r_load_total)) * CL)", unit: "Hz", reference: REF.stab }, {}, S);
  }
  const model: LoopModel = { a0, fp, f2, noiseGain: ng, idealGain: gIdeal };
  if (t0 > 1) {
    const fc = crossover(model);
    const pm = phaseMargin(model, fc);
    b.result("f_crossover", "Loop-gain crossover", "fc", fc, "Hz", S);
    f.define({ f_x: { value: fc, unit: "Hz", symbol: "fc" } });
    const pmExpr = Number.isFinite(f2) ? "180 - (atan(f_x / f_pole) + atan(f_x / f_pole2)) * 180 / pi" : "180 - atan(f_x / f_pole) * 180 / pi";
    b.formula({ key: "phase_margin", label: "Phase margin", symbol: "PM", expr: pmExpr, unit: "°", reference: REF.stab }, {}, S);
    let so = "";
    if (Number.isFinite(f2)) {
      const s2 = secondOrder(model);
      b.result("zeta", "Closed-loop damping (second-order equivalent)", "ζ", s2.zeta, "", S);
      b.result("peaking", "Closed-loop peaking", "Mp", s2.peakingDb, "dB", S);
      b.result("overshoot", "Step overshoot", "OS", s2.overshoot * 100, "%", S);
      so = ` (ζ = ${formatNumber(s2.zeta, 3)}, peaking ${q(s2.peakingDb, "dB", { digits: 3 })}, overshoot ${q(s2.overshoot * 100, "%", { digits: 3 })})`;
    }
    const noRo = input.cLoad > 0 && p.rout === 0;
    const msg = `Phase margin ${q(pm, "°", { digits: 3 })} at the ${q(fc, "Hz")} crossover with CL ${q(input.cLoad, "F")}${noRo ? " not included" : ""}${so}`;
    let sev: "pass" | "warning" | "fail" = pm >= 60 ? "pass" : pm >= 45 ? "warning" : "fail";
    let text: string;
    if (noRo) {
      // Without Ro the load capacitance forms no pole in this model: the margin shown is that of
      // the bare op-amp, which says nothing about CL. Never a pass.
      if (sev === "pass") sev = "warning";
      text = `${msg}: the part's open-loop output resistance Ro is entered as 0 Ω, so CL forms no second pole in this model and its effect on stability is not assessed. Enter Ro from the data sheet (tens to hundreds of ohms is typical) to check the capacitive load.`;
    } else if (sev === "pass") {
      text = `${msg}: stable with good damping.`;
    } else {
      // The largest CL that keeps PM ≥ 60° with this Ro, noise gain and load (bisection on f2).
      const rPole = (p.rout * f.value("r_load_total")) / (p.rout + f.value("r_load_total"));
      const f2min = lowestSecondPole(model, 60);
      const clMax = Number.isFinite(f2min) && rPole > 0 ? 1 / (2 * Math.PI * rPole * f2min) : NaN;
      const limit = Number.isFinite(clMax) ? ` PM ≥ 60° (common practice) needs CL ≤ ${q(clMax, "F")} with this part, noise gain and load;` : "";
      text = `${msg}: ${sev === "fail" ? "too little margin, the stage rings or oscillates" : "expect peaking and ringing"}.${limit} otherwise add an isolation resistor between the output and CL (a few tens of ohms, inside or outside the loop), raise the noise gain, or choose a part rated for capacitive loads.`;
    }
    b.check(makeCheck("stability.pm", sev, "Phase margin", text, (pm - 45) / 45));
  }

  // ---- Plots -----------------------------------------------------------------------------------
  const fHigh = Math.min(1e11, 30 * Math.max(p.gbw, Number.isFinite(f2) ? Math.min(f2, p.gbw * 10) : p.gbw));
  const fLow = Math.max(1e-3, Math.min(fp, input.fMax, f3) / 10);
  const freqs = logspace(fLow, fHigh, 241);
  const onePole = { ...model, f2: Infinity };
  // Magnitude (dB) and phase (°) curves, filled in place (no per-point objects).
  const curves = (m: LoopModel) => {
    const db: number[] = new Array(freqs.length);
    const ph: number[] = new Array(freqs.length);
    for (let i = 0; i < freqs.length; i++) {
      const r = closedLoopAt(m, freqs[i]);
      db[i] = 20 * Math.log10(Math.max(r.mag, 1e-30));
      ph[i] = r.phaseDeg;
    }
    return { db, ph };
  };
  const idealDb = new Array<number>(freqs.length).fill(20 * Math.log10(Math.abs(gIdeal)));
  const idealPh = new Array<number>(freqs.length).fill(gIdeal < 0 ? 180 : 0);
  const dp = curves(onePole);
  const withCl = Number.isFinite(f2) ? curves(model) : null;
  const toDb = (v: number) => 20 * Math.log10(Math.max(v, 1e-30));
  b.plots.push(
    {
      kind: "line",
      id: "bode-magnitude",
      title: "Closed-loop gain",
      x: { label: "Frequency", unit: "Hz", scale: "log" },
      y: { label: "Gain", unit: "dB", scale: "linear" },
      series: [
        { name: "Ideal op-amp", role: "ideal", x: freqs, y: idealDb },
        { name: "Dominant-pole model (GBW, A₀)", role: "real", x: freqs, y: dp.db },
        ...(withCl ? [{ name: `With CL = ${q(input.cLoad, "F")}`, role: "other" as const, x: freqs, y: withCl.db }] : []),
        { name: "fmax", role: "limit", x: [input.fMax, input.fMax], y: [toDb(Math.abs(gIdeal)) - 40, toDb(Math.abs(gIdeal)) + 10] },
      ],
    },
    {
      kind: "line",
      id: "bode-phase",
      title: "Closed-loop phase",
      x: { label: "Frequency", unit: "Hz", scale: "log" },
      y: { label: "Phase", unit: "°", scale: "linear" },
      series: [
        { name: "Ideal op-amp", role: "ideal", x: freqs, y: idealPh },
        { name: "Dominant-pole model (GBW, A₀)", role: "real", x: freqs, y: dp.ph },
        ...(withCl ? [{ name: `With CL = ${q(input.cLoad, "F")}`, role: "other" as const, x: freqs, y: withCl.ph }] : []),
      ],
    },
    {
      kind: "levels",
      id: "levels",
      title: "Output swing against the rails",
      unit: "V",
      levels: [
        { label: "V+", value: vPos, role: "rail" },
        { label: "V−", value: vNeg, role: "rail" },
        { label: "Highest output", value: vOmax, role: "limit" },
        { label: "Lowest output", value: vOmin, role: "limit" },
        { label: "Signal peak", value: needHi, role: "signal" },
        { label: "Signal trough", value: needLo, role: "signal" },
        { label: split ? "Ground" : "Vbias", value: vRef, role: "bias" },
      ],
      bands: [
        { label: "Output range of the part", from: vOmin, to: vOmax, role: "allowed" },
        { label: "Required output", from: needLo, to: needHi, role: "required" },
        { label: "Input common-mode range", from: cmMin, to: cmMax, role: "allowed" },
      ],
    },
  );

  // ---- Components, assumptions, cautions --------------------------------------------------
  if (!follower) {
    b.components.push(
      { ref: "R1", kind: "resistor", value: rg, display: q(rg, "Ω"), series, tolerance: tol, role: nonInv ? "Gain resistor Rg (to the signal reference)" : "Input resistor Rin" },
      { ref: "R2", kind: "resistor", value: rf, display: q(rf, "Ω"), series, tolerance: tol, role: "Feedback resistor Rf" },
    );
  }
  if (rComp > 0 || (input.biasCompensation && !split && rn > 0)) {
    const v = rComp > 0 ? rComp : rpDc;
    b.components.push({ ref: "R3", kind: "resistor", value: v, display: q(v, "Ω"), series, tolerance: tol, role: split ? "Bias-current compensation resistor" : "Bias network resistance (Thevenin) at the + input" });
  }
  b.components.push({ ref: "U1", kind: "opamp", value: 0, display: p.name, role: "Op-amp" });

  b.assumptions.push(
    "The op-amp is modelled by a single dominant pole (A₀, GBW); higher poles are ignored except the one from Ro and CL. A₀ is taken as the unloaded gain and divided by the load, A₀·RL,tot/(RL,tot + Ro) (conservative where the data sheet states A₀ at a load); the current Rf feeds forward into Ro is neglected.",
    "The load returns to the signal reference (ground on a split supply, Vbias on a single supply).",
    ...(split
      ? []
      : [
          "On a single supply, Rg (or the input resistor) returns to Vbias, so the output rests at Vbias and the DC error is taken at the full noise gain; with Rg AC-coupled the DC gain is 1 and the Vos term is smaller (the bias-current terms then follow Rf and Rbias, not Rf‖Rg).",
          ...(nonInv ? [] : ["Inverting on a single supply: the bias network at the + input is decoupled by a capacitor, so it adds no noise in the signal band."]),
        ]),
    "Output swing limits are the part's headroom figures at its stated load; for a heavier load the headroom grows by Ro × the extra peak current (an approximation). The output rests at the signal reference plus the worst-case DC output error.",
    `Output current is that of a full-amplitude sine at fmax into RL ‖ the feedback network${input.cLoad > 0 ? " ‖ CL; a fast step into CL draws up to CL·SR" : ""}.`,
    `DC error: Vos, Ib and Ios at their data-sheet maxima with worst-case signs; ${input.ibModel === "doubling" ? "bias currents double every 10 °C above 25 °C" : "bias currents stay within the data-sheet maximum over temperature"}; ${compNote}.`,
    "Noise: white en with its 1/f corner, in at both inputs (uncorrelated), resistor noise 4kTR at 25 °C, all shaped by the closed-loop pole; peaking from CL is not included.",
    "Resistor tolerances are treated as independent worst-case extremes; resistor temperature coefficients are not included.",
  );

  return b.build();
}

/** The gain stage calculation type. */
export const gainStage: CalcType<typeof gainStageSchema> = {
  id: "amplifier.gain-stage",
  pack: "amplifier",
  title: "Gain stage (inverting / non-inverting)",
  summary: "Designs an op-amp gain stage from preferred resistors and checks gain error, bandwidth, slew rate, swing, common-mode range, DC error, noise and stability.",
  version: "1.2.1",
  schema: gainStageSchema,
  fields,
  defaults,
  compute: computeGainStage,
  netlist: gainStageNetlist,
};
