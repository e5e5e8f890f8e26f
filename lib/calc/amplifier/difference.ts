/**
 * amplifier.difference — four-resistor difference amplifier, Vout = (R2/R1)·(V2 − V1) + Vref,
 * with R3 = R1 and R4 = R2 (R3 from V2 to the + input, R4 from the + input to Vref).
 *
 * Checks the gain from preferred resistors, the worst-case common-mode rejection from resistor
 * tolerance (and the op-amp's own CMRR), the common-mode voltage at the op-amp inputs, output
 * swing, bandwidth and slew rate.
 *
 * Units: SI base units (V, A, Ω, Hz); tolerances as fractions; CMRR in dB.
 *
 * References:
 * [1] S. Franco, Design with Operational Amplifiers and Analog Integrated Circuits, 4th ed.,
 *     McGraw-Hill 2015, ch. 2 (difference amplifier; worst-case CMRR of the resistor bridge
 *     CMRR ≥ (1 + R2/R1) / (4p) for resistors of tolerance p), ch. 5 (op-amp CMRR), ch. 6.
 * [2] IEC 60063:2015, preferred number series.
 */
import { z } from "zod";
import type { CalcOutput, CalcType, FieldSpec } from "../core/types";
import { opAmpParamsSchema } from "../core/parts";
import { bestRatioPair, type ESeries } from "../core/eseries";
import { OutputBuilder } from "../core/output";
import { checkAtLeast, checkAtMost, makeCheck } from "../core/checks";
import { formatQuantity as q, formatNumber } from "../core/units";
import { numberBetween, oneOf, positiveAtMost } from "../core/schema";
import { demoOpAmp, toRawPart } from "../core/demo-parts";
import { outputSwingSection, supplySection } from "./common";

const RESISTOR_SERIES = ["E24", "E48", "E96", "E192"] as const;

const REF = {
  gain: "Franco, Design with Op Amps, 4th ed., ch. 2 (difference amplifier)",
  cmrr: "Franco, Design with Op Amps, 4th ed., ch. 2 (worst-case CMRR of the difference amplifier, (1 + R2/R1)/(4p))",
  cmrrSum: "Franco, Design with Op Amps, 4th ed., ch. 5 (combined CMRR, 1/CMRR = 1/CMRR_r + 1/CMRR_OA, worst case)",
  bw: "Franco, Design with Op Amps, 4th ed., ch. 6 (closed-loop bandwidth f_t / (1/β))",
  slew: "Franco, Design with Op Amps, 4th ed., ch. 6 (slew rate, full-power bandwidth)",
  dc: "Franco, Design with Op Amps, 4th ed., ch. 5 (output error from Vos and IOS; balanced resistances cancel IB)",
};

/** Input schema of the difference amplifier, SI base units. */
export const differenceSchema = z
  .object({
    /** Differential gain R2/R1, V/V. */
    gain: numberBetween("Differential gain", 0.01, 1000, "V/V"),
    series: oneOf("Resistor series", RESISTOR_SERIES),
    /** Resistor tolerance, fraction. */
    tolerance: positiveAtMost("Resistor tolerance", 0.2, "%", "percent"),
    /** Input resistor target R1 (= R3); the design searches half a decade either side, Ω. */
    r1Target: numberBetween("Input resistor target", 10, 10e6, "Ω"),
    supply: oneOf("Supply", ["split", "single"]),
    vPos: numberBetween("Positive supply V+", 0.5, 200, "V"),
    vNeg: numberBetween("Negative supply V−", -200, 0, "V").optional(),
    /** Voltage at the reference pin (R4's far end), V. */
    vRef: numberBetween("Reference voltage Vref", -200, 200, "V"),
    /** Input common-mode range, V. */
    vcmMin: numberBetween("Lowest input common-mode voltage", -1000, 1000, "V"),
    vcmMax: numberBetween("Highest input common-mode voltage", -1000, 1000, "V"),
    /** Largest differential input, V peak. */
    vdPeak: numberBetween("Differential input amplitude", 1e-6, 1000, "V"),
    fMax: numberBetween("Highest signal frequency", 1e-3, 1e9, "Hz"),
    rLoad: numberBetween("Load resistance RL", 1, 1e9, "Ω"),
    /** The op-amp's own CMRR, dB. */
    cmrrOpampDb: numberBetween("Op-amp CMRR", 20, 200, "dB"),
    /** Required worst-case CMRR of the stage, dB. */
    cmrrMinDb: numberBetween("Required CMRR", 0, 200, "dB"),
    opamp: opAmpParamsSchema,
  })
  .superRefine((v, ctx) => {
    if (v.supply === "split" && v.vNeg === undefined) ctx.addIssue({ code: "custom", path: ["vNeg"], message: "Negative supply V− is required for a split supply" });
    if (v.vcmMax < v.vcmMin) ctx.addIssue({ code: "custom", path: ["vcmMax"], message: "Highest input common-mode voltage must not be below the lowest" });
  });

/** Parsed input of the difference amplifier (SI base units). */
export type DifferenceInput = z.output<typeof differenceSchema>;

const fields: FieldSpec[] = [
  { kind: "quantity", key: "gain", label: "Differential gain", symbol: "Gd", unit: "V/V", placeholder: "10", group: "Specification" },
  { kind: "quantity", key: "vdPeak", label: "Differential input amplitude (peak)", symbol: "Vd,pk", unit: "V", placeholder: "100m", group: "Specification" },
  { kind: "quantity", key: "vcmMin", label: "Lowest input common-mode voltage", symbol: "Vcm,min", unit: "V", placeholder: "-2", group: "Specification" },
  { kind: "quantity", key: "vcmMax", label: "Highest input common-mode voltage", symbol: "Vcm,max", unit: "V", placeholder: "5", group: "Specification" },
  { kind: "quantity", key: "fMax", label: "Highest signal frequency", symbol: "fmax", unit: "Hz", placeholder: "10k", group: "Specification" },
  { kind: "quantity", key: "cmrrMinDb", label: "Required CMRR (worst case)", symbol: "CMRRmin", unit: "dB", placeholder: "60", group: "Specification" },
  { kind: "select", key: "supply", label: "Supply", symbol: "", group: "Supply", options: [{ value: "split", label: "Split (±)" }, { value: "single", label: "Single" }] },
  { kind: "quantity", key: "vPos", label: "Positive supply", symbol: "V+", unit: "V", placeholder: "15", group: "Supply" },
  { kind: "quantity", key: "vNeg", label: "Negative supply", symbol: "V−", unit: "V", placeholder: "-15", group: "Supply", when: { key: "supply", in: ["split"] } },
  { kind: "quantity", key: "vRef", label: "Reference pin voltage", symbol: "Vref", unit: "V", placeholder: "0", group: "Supply", help: "The output rests at Vref; on a single supply usually mid-rail." },
  { kind: "select", key: "series", label: "Resistor series", symbol: "", group: "Resistors", options: RESISTOR_SERIES.map((s) => ({ value: s, label: s })) },
  { kind: "quantity", key: "tolerance", label: "Resistor tolerance", symbol: "p", unit: "%", scale: "percent", placeholder: "0.1", group: "Resistors" },
  { kind: "quantity", key: "r1Target", label: "Input resistor target (R1 = R3)", symbol: "R1,target", unit: "Ω", placeholder: "10k", group: "Resistors" },
  { kind: "quantity", key: "rLoad", label: "Load resistance", symbol: "RL", unit: "Ω", placeholder: "10k", group: "Load" },
  { kind: "part", key: "opamp", label: "Op-amp", symbol: "U1", partKind: "opamp", group: "Op-amp" },
  { kind: "quantity", key: "cmrrOpampDb", label: "Op-amp CMRR (data sheet, minimum)", symbol: "CMRR_OA", unit: "dB", placeholder: "90", group: "Op-amp" },
];

const defaults = {
  gain: "10",
  vdPeak: "200m",
  vcmMin: "-5",
  vcmMax: "5",
  fMax: "10k",
  cmrrMinDb: "60",
  supply: "split",
  vPos: "15",
  vNeg: "-15",
  vRef: "0",
  series: "E96",
  tolerance: "0.1",
  r1Target: "10k",
  rLoad: "10k",
  cmrrOpampDb: "100",
  opamp: toRawPart(demoOpAmp("LW-OA610")),
};

/** Worst-case common-mode gain and CMRR over the 16 tolerance corners of R1…R4. */
export function cornerCmrr(r1: number, r2: number, tol: number): { acmMax: number; cmrrMin: number } {
  let acmMax = 0;
  let cmrrMin = Infinity;
  for (let k = 0; k < 16; k++) {
    const s = (bit: number) => ((k >> bit) & 1 ? 1 + tol : 1 - tol);
    const a1 = r1 * s(0);
    const a2 = r2 * s(1);
    const a3 = r1 * s(2);
    const a4 = r2 * s(3);
    const plus = a4 / (a3 + a4);
    const acm = plus * (1 + a2 / a1) - a2 / a1;
    const adm = (plus * (1 + a2 / a1) + a2 / a1) / 2;
    const cm = Math.abs(acm) > 0 ? Math.abs(adm / acm) : Infinity;
    acmMax = Math.max(acmMax, Math.abs(acm));
    cmrrMin = Math.min(cmrrMin, cm);
  }
  return { acmMax, cmrrMin };
}

/**
 * Compute the difference amplifier. Pure; never throws for schema-valid input.
 * @param input parsed input, SI base units
 */
export function computeDifference(input: DifferenceInput): CalcOutput {
  const p = input.opamp;
  const split = input.supply === "split";
  const vPos = input.vPos;
  const vNeg = split ? (input.vNeg ?? 0) : 0;
  const series = input.series as ESeries;
  const tol = input.tolerance;
  const b = new OutputBuilder({
    Gt: { value: input.gain, unit: "V/V", symbol: "Gd,target" },
    tol: { value: tol, unit: "%", symbol: "p", scale: "percent" },
    A0dB: { value: p.aolDb, unit: "dB", symbol: "A₀,dB" },
    GBW: { value: p.gbw, unit: "Hz", symbol: "GBW" },
    SR: { value: p.slewRate, unit: "V/s", symbol: "SR" },
    Vd: { value: input.vdPeak, unit: "V", symbol: "Vd,pk" },
    fmax: { value: input.fMax, unit: "Hz", symbol: "fmax" },
    Vref: { value: input.vRef, unit: "V", symbol: "Vref" },
    RL: { value: input.rLoad, unit: "Ω", symbol: "RL" },
    CMRRoaDb: { value: input.cmrrOpampDb, unit: "dB", symbol: "CMRR_OA,dB" },
    VcmMin: { value: input.vcmMin, unit: "V", symbol: "Vcm,min" },
    VcmMax: { value: input.vcmMax, unit: "V", symbol: "Vcm,max" },
    cmPos: { value: p.vicmPos, unit: "V", symbol: "Vicm+" },
    cmNeg: { value: p.vicmNeg, unit: "V", symbol: "Vicm−" },
    VposR: { value: vPos, unit: "V", symbol: "V+" },
    VnegR: { value: vNeg, unit: "V", symbol: "V−" },
  });
  const f = b.sheet;

  // ---- Resistors ---------------------------------------------------------------------------
  const r1Min = input.r1Target / Math.sqrt(10);
  const r1Max = input.r1Target * Math.sqrt(10);
  const pair = bestRatioPair(input.gain, series, { rbMin: r1Min, rbMax: r1Max, raMin: Math.max(1, (input.gain * r1Min) / 1.3), raMax: input.gain * r1Max * 1.3 });
  const r1 = pair ? pair.rb : input.r1Target;
  const r2 = pair ? pair.ra : input.r1Target * input.gain;
  if (!pair) {
    b.check(makeCheck("resistors.design", "fail", "Resistor pair", `No ${series} pair near R1 = ${q(input.r1Target, "Ω")} gives the gain ${formatNumber(input.gain)} V/V; change the input resistor target.`, -1));
  }
  f.define({ R1: { value: r1, unit: "Ω", symbol: "R1" }, R2: { value: r2, unit: "Ω", symbol: "R2" } });

  const G = "Gain and CMRR";
  const gd = b.formula({ key: "gain", label: "Differential gain (as designed)", symbol: "Gd", expr: "R2 / R1", unit: "V/V", reference: REF.gain }, {}, G);
  b.formula({ key: "gain_error", label: "Gain error from preferred values", symbol: "εsnap", expr: "gain / Gt - 1", unit: "%", scale: "percent", digits: 6 }, {}, G);
  b.formula({ key: "gain_tol_error", label: "Gain error from tolerance (worst case)", symbol: "εtol", expr: "(1 + tol) / (1 - tol) - 1", unit: "%", scale: "percent", reference: REF.gain }, {}, G);
  b.formula({ key: "cmrr_r", label: "CMRR from resistor tolerance (worst case, linearised)", symbol: "CMRR_r", expr: "(1 + gain) / (4 * tol)", unit: "V/V", reference: REF.cmrr }, {}, G);
  const corners = cornerCmrr(r1, r2, tol);
  b.result("cmrr_r_corners", "CMRR from resistor tolerance (exact, 16 corners)", "CMRR_r,corner", corners.cmrrMin, "V/V", G);
  b.result("acm_max", "Worst-case common-mode gain", "Acm", corners.acmMax, "V/V", G);
  f.define({ cmrr_rc: { value: corners.cmrrMin, unit: "V/V", symbol: "CMRR_r,corner" } });
  b.formula({ key: "cmrr_oa", label: "Op-amp CMRR", symbol: "CMRR_OA", expr: "10^(CMRRoaDb / 20)", unit: "V/V" }, {}, G);
  b.formula({ key: "cmrr_total", label: "Stage CMRR (worst case)", symbol: "CMRR", expr: "1 / (1 / cmrr_rc + 1 / cmrr_oa)", unit: "V/V", reference: REF.cmrrSum }, {}, G);
  const cmrrDb = b.formula({ key: "cmrr_total_db", label: "Stage CMRR (worst case)", symbol: "CMRR_dB", expr: "20 * log10(cmrr_total)", unit: "dB" }, {}, G);
  b.formula({ key: "cm_error_out", label: "Output error at the largest common-mode input", symbol: "Eo,cm", expr: "gain * max(abs(VcmMin - Vref), abs(VcmMax - Vref)) / cmrr_total", unit: "V" }, {}, G);
  const tolNote = `${q(tol, "%", { scale: "percent" })} resistors`;
  b.check(
    checkAtLeast("cmrr", "Common-mode rejection", cmrrDb, input.cmrrMinDb, {
      pass: () => `Worst-case CMRR ${q(cmrrDb, "dB")} (${tolNote}, op-amp ${q(input.cmrrOpampDb, "dB")}) meets the required ${q(input.cmrrMinDb, "dB")}.`,
      fail: () => {
        const head = `Worst-case CMRR ${q(cmrrDb, "dB")} (${tolNote}, op-amp ${q(input.cmrrOpampDb, "dB")}) is below the required ${q(input.cmrrMinDb, "dB")}`;
        // Resistor CMRR needed beside the op-amp's, then the tolerance from (1 + Gd)/(4p).
        const need = 1 / (10 ** (-input.cmrrMinDb / 20) - 10 ** (-input.cmrrOpampDb / 20));
        if (input.cmrrOpampDb <= input.cmrrMinDb || !Number.isFinite(need) || need > 1e9) {
          return `${head}; the op-amp's own CMRR already uses up the requirement, so no resistor matching can meet it: choose a part with CMRR well above ${q(input.cmrrMinDb, "dB")} (the resistors then need matching too) or relax the requirement.`;
        }
        const pNeed = (1 + gd) / (4 * need);
        return `${head}; the resistors must give CMRR_r ≥ ${q(20 * Math.log10(need), "dB")}, which needs a tolerance (or matching) of about ${q(pNeed, "%", { scale: "percent" })} at this gain (now ${q(tol, "%", { scale: "percent" })}): use a matched resistor network, put more of the gain in this stage, or trim R4.`;
      },
    }),
  );

  // ---- Op-amp input common mode ---------------------------------------------------------
  const C = "Input common-mode";
  const cmHi = b.formula({ key: "v_plus_max", label: "Highest voltage at the op-amp + input", symbol: "V+,max", expr: "(gain * (VcmMax + Vd / 2) + Vref) / (1 + gain)", unit: "V", reference: REF.gain }, {}, C);
  const cmLo = b.formula({ key: "v_plus_min", label: "Lowest voltage at the op-amp + input", symbol: "V+,min", expr: "(gain * (VcmMin - Vd / 2) + Vref) / (1 + gain)", unit: "V", reference: REF.gain }, {}, C);
  const lim = { hi: vPos - p.vicmPos, lo: vNeg + p.vicmNeg };
  b.result("v_icm_max", "Common-mode limit, positive", "Vicm,max", lim.hi, "V", C);
  b.result("v_icm_min", "Common-mode limit, negative", "Vicm,min", lim.lo, "V", C);
  b.check(
    checkAtMost("icmr.high", "Op-amp input common-mode, positive", cmHi - input.vRef, lim.hi - input.vRef, {
      pass: () => `The op-amp inputs reach ${q(cmHi, "V")} at most, below the limit ${q(lim.hi, "V")}.`,
      fail: () => `The op-amp inputs reach ${q(cmHi, "V")}, ${q(cmHi - lim.hi, "V")} above the common-mode limit ${q(lim.hi, "V")}: the stage saturates. Raise V+ by at least ${q(cmHi - lim.hi, "V")}, keep the input common mode below ${q((lim.hi * (1 + gd) - input.vRef) / gd - input.vdPeak / 2, "V")}, or attenuate with a lower gain (the + input sees Gd/(1 + Gd) of the common mode).`,
    }),
    checkAtLeast("icmr.low", "Op-amp input common-mode, negative", cmLo - input.vRef, lim.lo - input.vRef, {
      pass: () => `The op-amp inputs go down to ${q(cmLo, "V")}, above the limit ${q(lim.lo, "V")}.`,
      fail: () => `The op-amp inputs go down to ${q(cmLo, "V")}, ${q(lim.lo - cmLo, "V")} below the common-mode limit ${q(lim.lo, "V")}: the stage saturates. Lower V− by at least ${q(lim.lo - cmLo, "V")}, keep the input common mode above ${q((lim.lo * (1 + gd) - input.vRef) / gd + input.vdPeak / 2, "V")}, raise Vref, or choose a part whose input range includes the negative rail.`,
    }),
  );

  // ---- Output, supply, dynamics -------------------------------------------------------------
  const O = "Output and load";
  f.define({ Vpk: { value: gd * input.vdPeak, unit: "V", symbol: "Gd·Vd,pk" } });
  // Output current: load plus the current through R2. With v1, v2 and vout taken from Vref, the
  // − input sits at Gd·v2/(1 + Gd), so I(R2) = (vd·(Gd + ½) − vcm)/(R1 + R2) for v2,1 = vcm ± vd/2
  // (hand derivation from the bridge; checked against ngspice in tests/spice). The common-mode
  // part flows even with no signal; the worst case adds both magnitudes.
  const { vOmax, vOmin } = outputSwingSection(b, {
    part: p,
    vPos,
    vNeg,
    vRef: input.vRef,
    vPeak: gd * input.vdPeak,
    advice: ", move Vref",
    group: O,
    peakCurrent: {
      expr: "Vd * (gain / RL + (gain + 0.5) / (R1 + R2)) + max(abs(VcmMin - Vref), abs(VcmMax - Vref)) / (R1 + R2)",
      label: "Peak output current (load, feedback and common-mode current through R2)",
      reference: "circuit analysis of the four-resistor bridge, I(R2) = (vd·(Gd + ½) − vcm)/(R1 + R2), worst-case signs",
    },
    currentAdvice: "raise RL or R1 and R2 (the common-mode input drives a current through R1 + R2 into the output), narrow the common-mode range, or add a buffer",
  });
  supplySection(b, p, vPos, vNeg, O);
  const D = "Frequency response";
  b.formula({ key: "noise_gain", label: "Noise gain", symbol: "NG", expr: "1 + gain", unit: "V/V", reference: REF.bw }, {}, D);
  const f3 = b.formula({ key: "f3db", label: "Closed-loop bandwidth", symbol: "f₋₃dB", expr: "GBW / noise_gain", unit: "Hz", reference: REF.bw }, {}, D);
  const srReq = b.formula({ key: "slew_required", label: "Slew rate needed", symbol: "SRreq", expr: "2 * pi * fmax * gain * Vd", unit: "V/s", reference: REF.slew }, {}, D);
  b.check(
    checkAtLeast("bandwidth", "Closed-loop bandwidth", f3, input.fMax, {
      pass: () => `Closed-loop bandwidth ${q(f3, "Hz")} is above the highest signal frequency ${q(input.fMax, "Hz")}.`,
      fail: () => `Closed-loop bandwidth ${q(f3, "Hz")} (GBW ${q(p.gbw, "Hz")} / noise gain ${formatNumber(1 + gd)}) is below ${q(input.fMax, "Hz")}; choose a part with GBW ≥ ${q((1 + gd) * input.fMax, "Hz")} or lower the gain.`,
    }),
    checkAtLeast("slew", "Slew rate", p.slewRate, srReq, {
      pass: () => `Slew rate ${q(p.slewRate, "V/s")} covers the ${q(srReq, "V/s")} needed.`,
      fail: () => `Slew rate ${q(p.slewRate, "V/s")} is below the ${q(srReq, "V/s")} a ${q(gd * input.vdPeak, "V")} peak output at ${q(input.fMax, "Hz")} needs; choose a faster part or reduce amplitude or frequency.`,
    }),
  );
  // ---- DC output error and the swing it uses up ----------------------------------------------
  // Balanced bridge: both inputs see R1 ∥ R2, so the bias current cancels and Ios remains:
  // Eo = NG·(Vos + (R1 ∥ R2)·Ios) = (1 + Gd)·Vos + R2·Ios (Franco ch. 5), plus the common-mode error.
  const E = "DC error";
  f.define({ Vos: { value: p.vos, unit: "V", symbol: "Vos" }, Ios: { value: p.ios, unit: "A", symbol: "Ios" } });
  b.formula({ key: "e_offset", label: "Output error from Vos and Ios (25 °C)", symbol: "Eo,os", expr: "noise_gain * Vos + R2 * Ios", unit: "V", reference: REF.dc }, {}, E);
  const eDc = b.formula({ key: "e_dc", label: "DC output error, worst case (Vos, Ios and common mode, 25 °C)", symbol: "Eo", expr: "e_offset + cm_error_out", unit: "V" }, {}, E);
  const vpk = gd * input.vdPeak;
  const roomSig = Math.min(vOmax - input.vRef, input.vRef - vOmin);
  if (vpk <= roomSig) {
    b.check(
      checkAtMost("swing.dc", "Output swing with the DC output error", vpk + eDc, roomSig, {
        pass: () => `The ${q(vpk, "V")} peak plus the worst-case DC output error ±${q(eDc, "V")} (offset and common mode) stays within ${q(vOmin, "V")} to ${q(vOmax, "V")}.`,
        fail: () => `The output rests up to ±${q(eDc, "V")} from Vref (offset ${q(f.value("e_offset"), "V")}, common mode ${q(f.value("cm_error_out"), "V")}), so the ${q(vpk, "V")} peak goes beyond the output range ${q(vOmin, "V")} to ${q(vOmax, "V")}: the output clips. Keep the DC error below ${q(Math.max(0, roomSig - vpk), "V")} (lower-Vos part, better-matched resistors) or reduce the differential amplitude to ${q(Math.max(0, (roomSig - eDc) / gd), "V")} peak.`,
      }),
    );
  }
  b.result("r_in_diff", "Differential input resistance", "Rin,d", 2 * r1, "Ω", O);
  b.result("r_in_plus", "Input resistance at V2", "Rin,2", r1 + r2, "Ω", O);

  b.plots.push({
    kind: "levels",
    id: "levels",
    title: "Voltages against the rails",
    unit: "V",
    levels: [
      { label: "V+", value: vPos, role: "rail" },
      { label: "V−", value: vNeg, role: "rail" },
      { label: "Vref", value: input.vRef, role: "bias" },
      { label: "Highest output", value: vOmax, role: "limit" },
      { label: "Lowest output", value: vOmin, role: "limit" },
    ],
    bands: [
      { label: "Required output", from: input.vRef - gd * input.vdPeak, to: input.vRef + gd * input.vdPeak, role: "required" },
      { label: "Op-amp input common mode", from: cmLo, to: cmHi, role: "required" },
      { label: "Allowed input common mode", from: lim.lo, to: lim.hi, role: "allowed" },
    ],
  });
  b.components.push(
    { ref: "R1", kind: "resistor", value: r1, display: q(r1, "Ω"), series, tolerance: tol, role: "Input resistor, inverting side (V1)" },
    { ref: "R2", kind: "resistor", value: r2, display: q(r2, "Ω"), series, tolerance: tol, role: "Feedback resistor" },
    { ref: "R3", kind: "resistor", value: r1, display: q(r1, "Ω"), series, tolerance: tol, role: "Input resistor, non-inverting side (V2)" },
    { ref: "R4", kind: "resistor", value: r2, display: q(r2, "Ω"), series, tolerance: tol, role: "Resistor from the + input to Vref" },
    { ref: "U1", kind: "opamp", value: 0, display: p.name, role: "Op-amp" },
  );
  b.assumptions.push(
    "R3 = R1 and R4 = R2; the four resistors vary independently within their tolerance (worst case over all 16 corners).",
    "The source resistances of V1 and V2 are negligible against R1 and R1 + R2 (an unequal source resistance unbalances the bridge and lowers the CMRR).",
    "The Vref pin is driven from a low impedance (any resistance there adds to R4).",
    "The op-amp CMRR entered is its data-sheet minimum and adds to the resistor term with the same sign (worst case).",
    "The output rests at Vref plus the DC error (1 + Gd)·Vos + R2·Ios and the common-mode error, all at 25 °C and their worst-case signs; drift over temperature is not included.",
    "Output current: the load plus the current through R2, which carries the common-mode input as (vcm − Vref)/(R1 + R2) even with no differential signal; both at their worst-case signs.",
  );
  return b.build();
}

/** The difference amplifier calculation type. */
export const differenceAmplifier: CalcType<typeof differenceSchema> = {
  id: "amplifier.difference",
  pack: "amplifier",
  title: "Difference amplifier",
  summary: "Designs a four-resistor difference amplifier and checks gain, worst-case CMRR from resistor tolerance, input common-mode range and output swing.",
  version: "1.2.1",
  schema: differenceSchema,
  fields,
  defaults,
  compute: computeDifference,
};
