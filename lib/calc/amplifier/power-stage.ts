/**
 * amplifier.power-stage — output / power stage, class A (series-fed, transformer- or
 * inductor-coupled), class B and class AB push-pull: efficiency at the chosen output level,
 * device dissipation and its worst case, and the heatsink thermal chain
 * Tj = Ta + P·(θjc + θcs + θsa) with the largest heatsink θsa that keeps Tj under its limit.
 *
 * Units: V, A, Ω, W, °C, K/W. Sine-wave drive throughout.
 *
 * References:
 * [1] R. Boylestad, L. Nashelsky, Electronic Devices and Circuit Theory, ch. "Power Amplifiers":
 *     series-fed class A (Pi = VCC·ICQ, Po = Vp²/(2RC)), transformer-coupled class A
 *     (η ≤ 50 %), class B push-pull (Idc = 2Ip/π, η = (π/4)·Vp/VCC, P2Q,max = 2VCC²/(π²RL)).
 * [2] A. Sedra, K. Smith, Microelectronic Circuits, ch. "Output Stages and Power Amplifiers":
 *     class B dissipation maximum at Vp = 2VCC/π; thermal resistance chain Tj = Ta + P·θja.
 */
import { z } from "zod";
import type { CalcOutput, CalcType, FieldSpec } from "../core/types";
import { OutputBuilder, linspace } from "../core/output";
import { checkAtMost, makeCheck } from "../core/checks";
import { formatQuantity as q } from "../core/units";
import { numberBetween, oneOf, positiveAtMost, yesNo } from "../core/schema";

const CLASSES = ["class-a-series", "class-a-transformer", "class-b", "class-ab"] as const;

const REF = {
  aSeries: "Boylestad & Nashelsky, Electronic Devices and Circuit Theory, ch. Power Amplifiers (series-fed class A)",
  aXfmr: "Boylestad & Nashelsky, Electronic Devices and Circuit Theory, ch. Power Amplifiers (transformer-coupled class A)",
  b: "Boylestad & Nashelsky, Electronic Devices and Circuit Theory, ch. Power Amplifiers (class B push-pull)",
  bMax: "Sedra & Smith, Microelectronic Circuits, ch. Output Stages (class B: maximum dissipation at Vp = 2VCC/π)",
  ab: "common practice, no source (class AB taken as class B plus the idle current for the whole cycle; conservative)",
  thermal: "Sedra & Smith, Microelectronic Circuits, ch. Output Stages (thermal chain Tj = Ta + P·(θjc + θcs + θsa))",
};

/** Input schema of the power stage, SI base units. */
export const powerStageSchema = z
  .object({
    stageClass: oneOf("Output stage class", CLASSES),
    /** Supply: class A the single supply VCC; class B/AB each rail ±VCC, V. */
    vcc: positiveAtMost("Supply VCC", 1000, "V"),
    /** Load resistance, Ω (transformer coupling: the secondary load). */
    rLoad: numberBetween("Load resistance RL", 0.1, 1e6, "Ω"),
    /** Transformer turns ratio primary : secondary (transformer-coupled class A). */
    turnsRatio: numberBetween("Turns ratio n", 0.01, 1000, "").optional(),
    /** Output amplitude at the load, V peak. */
    vPeak: numberBetween("Output amplitude", 0, 1000, "V"),
    /** Quiescent current: class A collector current ICQ; class AB idle current, A. */
    iq: numberBetween("Quiescent current", 0, 100, "A").optional(),
    /** Saturation / headroom voltage of each device at peak current, V. */
    vSat: numberBetween("Device saturation voltage", 0, 100, "V"),
    tAmbient: numberBetween("Ambient temperature", -60, 150, "°C"),
    tjMax: numberBetween("Maximum junction temperature", 25, 250, "°C"),
    /** Design margin below Tj,max, °C. */
    tjMargin: numberBetween("Junction temperature margin", 0, 200, "°C"),
    thetaJc: numberBetween("Junction-to-case thermal resistance θjc", 0, 1000, "K/W"),
    thetaCs: numberBetween("Case-to-heatsink thermal resistance θcs", 0, 1000, "K/W"),
    /** Both push-pull devices on one heatsink. */
    sharedHeatsink: yesNo("Shared heatsink").optional(),
    heatsinkChosen: yesNo("Heatsink chosen"),
    thetaSa: numberBetween("Heatsink thermal resistance θsa", 0, 1000, "K/W").optional(),
  })
  .superRefine((v, ctx) => {
    if (v.stageClass === "class-a-transformer" && v.turnsRatio === undefined) ctx.addIssue({ code: "custom", path: ["turnsRatio"], message: "Turns ratio n is required for transformer coupling" });
    if ((v.stageClass === "class-a-series" || v.stageClass === "class-a-transformer") && !(v.iq !== undefined && v.iq > 0)) {
      ctx.addIssue({ code: "custom", path: ["iq"], message: "Quiescent current must be greater than 0 A for class A" });
    }
    if (v.stageClass === "class-ab" && v.iq === undefined) ctx.addIssue({ code: "custom", path: ["iq"], message: "Quiescent current is required for class AB" });
    if (v.heatsinkChosen && v.thetaSa === undefined) ctx.addIssue({ code: "custom", path: ["thetaSa"], message: "Heatsink thermal resistance θsa is required when a heatsink is chosen" });
    if (v.tjMargin >= v.tjMax - v.tAmbient) ctx.addIssue({ code: "custom", path: ["tjMargin"], message: "Junction temperature margin must be less than Tj,max − Ta" });
  });

/** Parsed input of the power stage (SI base units). */
export type PowerStageInput = z.output<typeof powerStageSchema>;

const PUSH_PULL = ["class-b", "class-ab"];

const fields: FieldSpec[] = [
  { kind: "select", key: "stageClass", label: "Output stage", symbol: "", group: "Stage", options: [
    { value: "class-a-series", label: "Class A, series-fed (resistive load)" },
    { value: "class-a-transformer", label: "Class A, transformer- or inductor-coupled" },
    { value: "class-b", label: "Class B push-pull" },
    { value: "class-ab", label: "Class AB push-pull" },
  ] },
  { kind: "quantity", key: "vcc", label: "Supply (class B/AB: each rail)", symbol: "VCC", unit: "V", placeholder: "30", group: "Stage" },
  { kind: "quantity", key: "rLoad", label: "Load resistance", symbol: "RL", unit: "Ω", placeholder: "8", group: "Stage" },
  { kind: "quantity", key: "turnsRatio", label: "Turns ratio (primary : secondary)", symbol: "n", unit: "", placeholder: "3", group: "Stage", when: { key: "stageClass", in: ["class-a-transformer"] } },
  { kind: "quantity", key: "vPeak", label: "Output amplitude at the load (peak)", symbol: "Vp", unit: "V", placeholder: "10", group: "Stage" },
  { kind: "quantity", key: "iq", label: "Quiescent current (class A: ICQ; class AB: idle)", symbol: "IQ", unit: "A", placeholder: "50m", group: "Stage", when: { key: "stageClass", in: ["class-a-series", "class-a-transformer", "class-ab"] } },
  { kind: "quantity", key: "vSat", label: "Device saturation voltage at peak", symbol: "Vsat", unit: "V", placeholder: "1", group: "Stage" },
  { kind: "quantity", key: "tAmbient", label: "Ambient temperature (maximum)", symbol: "Ta", unit: "°C", placeholder: "40", group: "Thermal" },
  { kind: "quantity", key: "tjMax", label: "Maximum junction temperature", symbol: "Tj,max", unit: "°C", placeholder: "150", group: "Thermal" },
  { kind: "quantity", key: "tjMargin", label: "Design margin below Tj,max", symbol: "ΔTj", unit: "°C", placeholder: "25", group: "Thermal" },
  { kind: "quantity", key: "thetaJc", label: "Junction to case", symbol: "θjc", unit: "K/W", placeholder: "1.5", group: "Thermal" },
  { kind: "quantity", key: "thetaCs", label: "Case to heatsink (interface)", symbol: "θcs", unit: "K/W", placeholder: "0.5", group: "Thermal" },
  { kind: "boolean", key: "sharedHeatsink", label: "Both devices on one heatsink", symbol: "", group: "Thermal", when: { key: "stageClass", in: PUSH_PULL } },
  { kind: "boolean", key: "heatsinkChosen", label: "Check a chosen heatsink", symbol: "", group: "Thermal" },
  { kind: "quantity", key: "thetaSa", label: "Chosen heatsink, sink to ambient", symbol: "θsa", unit: "K/W", placeholder: "2", group: "Thermal", when: { key: "heatsinkChosen", in: [true] } },
];

const defaults = {
  stageClass: "class-ab",
  vcc: "24",
  rLoad: "8",
  turnsRatio: "3",
  vPeak: "18",
  iq: "50m",
  vSat: "2",
  tAmbient: "40",
  tjMax: "150",
  tjMargin: "25",
  thetaJc: "1.5",
  thetaCs: "0.5",
  sharedHeatsink: true,
  heatsinkChosen: false,
  thetaSa: "2",
};

interface Operating {
  pIn: number;
  pOut: number;
  /** Total device dissipation (both devices for push-pull), W. */
  pDevTotal: number;
  eta: number;
}

/** Supply power, output power, device dissipation and efficiency at amplitude vp (V peak at the load). */
export function operatingPoint(input: PowerStageInput, vp: number): Operating {
  const rl = input.rLoad;
  const vcc = input.vcc;
  const pOut = (vp * vp) / (2 * rl);
  let pIn: number;
  let pDevTotal: number;
  switch (input.stageClass) {
    case "class-a-series": {
      const icq = input.iq ?? 0;
      pIn = vcc * icq;
      pDevTotal = pIn - pOut - icq * icq * rl;
      break;
    }
    case "class-a-transformer": {
      pIn = vcc * (input.iq ?? 0);
      pDevTotal = pIn - pOut;
      break;
    }
    case "class-b":
      pIn = (2 * vcc * vp) / (Math.PI * rl);
      pDevTotal = pIn - pOut;
      break;
    case "class-ab":
      pIn = 2 * vcc * ((input.iq ?? 0) + vp / (Math.PI * rl));
      pDevTotal = pIn - pOut;
      break;
  }
  return { pIn, pOut, pDevTotal: Math.max(0, pDevTotal), eta: pIn > 0 ? pOut / pIn : 0 };
}

/**
 * Compute the power stage. Pure; never throws for schema-valid input.
 * @param input parsed input, SI base units
 */
export function computePowerStage(input: PowerStageInput): CalcOutput {
  const cls = input.stageClass;
  const pushPull = cls === "class-b" || cls === "class-ab";
  const n = input.turnsRatio ?? 1;
  const b = new OutputBuilder({
    VCC: { value: input.vcc, unit: "V", symbol: "VCC" },
    RL: { value: input.rLoad, unit: "Ω", symbol: "RL" },
    Vp: { value: input.vPeak, unit: "V", symbol: "Vp" },
    IQ: { value: input.iq ?? 0, unit: "A", symbol: cls.startsWith("class-a") ? "ICQ" : "IQ" },
    Vsat: { value: input.vSat, unit: "V", symbol: "Vsat" },
    n: { value: n, unit: "", symbol: "n" },
    Ta: { value: input.tAmbient, unit: "°C", symbol: "Ta" },
    TjMax: { value: input.tjMax, unit: "°C", symbol: "Tj,max" },
    dTj: { value: input.tjMargin, unit: "°C", symbol: "ΔTj" },
    thJc: { value: input.thetaJc, unit: "K/W", symbol: "θjc" },
    thCs: { value: input.thetaCs, unit: "K/W", symbol: "θcs" },
  });
  const f = b.sheet;
  const P = "Power and efficiency";

  // ---- Output capability -----------------------------------------------------------------
  let vpMax: number;
  let ref: string;
  if (cls === "class-a-series") {
    ref = REF.aSeries;
    b.formula({ key: "v_ceq", label: "Quiescent collector-emitter voltage", symbol: "VCEQ", expr: "VCC - IQ * RL", unit: "V", reference: REF.aSeries }, {}, P);
    b.formula({ key: "i_cq_opt", label: "ICQ for the largest symmetrical swing", symbol: "ICQ,opt", expr: "VCC / (2 * RL)", unit: "A", reference: REF.aSeries }, {}, P);
    vpMax = b.formula({ key: "vp_max", label: "Largest output amplitude", symbol: "Vp,max", expr: "max(0, min(IQ * RL, v_ceq - Vsat))", unit: "V" }, {}, P);
    b.formula({ key: "p_in", label: "Supply power", symbol: "Pi", expr: "VCC * IQ", unit: "W", reference: REF.aSeries }, {}, P);
    b.formula({ key: "p_out", label: "Output power", symbol: "Po", expr: "Vp^2 / (2 * RL)", unit: "W", reference: REF.aSeries }, {}, P);
    b.formula({ key: "p_dev", label: "Device dissipation at this level", symbol: "PQ", expr: "max(0, p_in - p_out - IQ^2 * RL)", unit: "W", reference: REF.aSeries }, {}, P);
    b.formula({ key: "p_dev_max", label: "Device dissipation, worst case (no signal)", symbol: "PQ,max", expr: "max(0, v_ceq * IQ)", unit: "W", reference: REF.aSeries }, {}, P);
  } else if (cls === "class-a-transformer") {
    ref = REF.aXfmr;
    b.formula({ key: "r_load_reflected", label: "Load reflected to the primary", symbol: "R′L", expr: "n^2 * RL", unit: "Ω", reference: REF.aXfmr }, {}, P);
    b.formula({ key: "v_primary", label: "Primary amplitude", symbol: "V′p", expr: "n * Vp", unit: "V", reference: REF.aXfmr }, {}, P);
    b.formula({ key: "i_cq_opt", label: "ICQ for the largest swing", symbol: "ICQ,opt", expr: "VCC / r_load_reflected", unit: "A", reference: REF.aXfmr }, {}, P);
    const vpPrimMax = b.formula({ key: "vp_primary_max", label: "Largest primary amplitude", symbol: "V′p,max", expr: "max(0, min(VCC - Vsat, IQ * r_load_reflected))", unit: "V" }, {}, P);
    vpMax = vpPrimMax / n;
    b.result("vp_max", "Largest output amplitude", "Vp,max", vpMax, "V", P);
    b.formula({ key: "p_in", label: "Supply power", symbol: "Pi", expr: "VCC * IQ", unit: "W", reference: REF.aXfmr }, {}, P);
    b.formula({ key: "p_out", label: "Output power", symbol: "Po", expr: "v_primary^2 / (2 * r_load_reflected)", unit: "W", reference: REF.aXfmr }, {}, P);
    b.formula({ key: "p_dev", label: "Device dissipation at this level", symbol: "PQ", expr: "max(0, p_in - p_out)", unit: "W", reference: REF.aXfmr }, {}, P);
    b.formula({ key: "p_dev_max", label: "Device dissipation, worst case (no signal)", symbol: "PQ,max", expr: "p_in", unit: "W", reference: REF.aXfmr }, {}, P);
  } else {
    ref = cls === "class-b" ? REF.b : REF.ab;
    vpMax = b.formula({ key: "vp_max", label: "Largest output amplitude", symbol: "Vp,max", expr: "max(0, VCC - Vsat)", unit: "V" }, {}, P);
    b.formula({ key: "i_peak", label: "Peak load current", symbol: "IL,p", expr: "Vp / RL", unit: "A", reference: REF.b }, {}, P);
    if (cls === "class-b") {
      b.formula({ key: "p_in", label: "Supply power (both rails)", symbol: "Pi", expr: "2 * VCC * i_peak / pi", unit: "W", reference: REF.b }, {}, P);
    } else {
      b.formula({ key: "p_in", label: "Supply power (both rails)", symbol: "Pi", expr: "2 * VCC * (IQ + i_peak / pi)", unit: "W", reference: REF.ab }, {}, P);
    }
    b.formula({ key: "p_out", label: "Output power", symbol: "Po", expr: "Vp^2 / (2 * RL)", unit: "W", reference: REF.b }, {}, P);
    b.formula({ key: "p_dev_total", label: "Dissipation of both devices at this level", symbol: "P2Q", expr: "max(0, p_in - p_out)", unit: "W", reference: REF.b }, {}, P);
    b.formula({ key: "p_dev", label: "Dissipation per device at this level", symbol: "PQ", expr: "p_dev_total / 2", unit: "W" }, {}, P);
    b.formula({ key: "vp_worst", label: "Amplitude of largest dissipation", symbol: "Vp,wc", expr: "min(2 * VCC / pi, vp_max)", unit: "V", reference: REF.bMax }, {}, P);
    if (cls === "class-b") {
      b.formula({ key: "p_dev_total_max", label: "Dissipation of both devices, worst case", symbol: "P2Q,max", expr: "2 * VCC * vp_worst / (pi * RL) - vp_worst^2 / (2 * RL)", unit: "W", reference: REF.bMax }, {}, P);
    } else {
      b.formula({ key: "p_dev_total_max", label: "Dissipation of both devices, worst case", symbol: "P2Q,max", expr: "2 * VCC * (IQ + vp_worst / (pi * RL)) - vp_worst^2 / (2 * RL)", unit: "W", reference: REF.ab }, {}, P);
    }
    b.formula({ key: "p_dev_max", label: "Dissipation per device, worst case", symbol: "PQ,max", expr: "p_dev_total_max / 2", unit: "W" }, {}, P);
  }
  const eta = b.formula({ key: "efficiency", label: "Efficiency at this level", symbol: "η", expr: "p_in > 0 ? p_out / p_in : 0", unit: "%", scale: "percent", reference: ref }, {}, P);
  const etaLimit = cls === "class-a-series" ? 0.25 : cls === "class-a-transformer" ? 0.5 : Math.PI / 4;
  b.result("efficiency_limit", "Theoretical efficiency limit of the class", "ηmax", etaLimit * 100, "%", P);

  const vpAt = cls === "class-a-transformer" ? n * input.vPeak : input.vPeak;
  const vpMaxAt = cls === "class-a-transformer" ? n * vpMax : vpMax;
  b.check(
    checkAtMost("output.amplitude", "Output amplitude", vpAt, vpMaxAt, {
      pass: () => `The ${q(input.vPeak, "V")} peak output is within the ${q(vpMax, "V")} this stage can swing; efficiency there is ${q(eta, "%", { scale: "percent" })}.`,
      fail: () =>
        vpMax <= 0
          ? `The stage cannot swing at all (VCC ${q(input.vcc, "V")}, Vsat ${q(input.vSat, "V")}${cls.startsWith("class-a") ? `, ICQ ${q(input.iq ?? 0, "A")}` : ""}); raise the supply or correct the bias.`
          : `The ${q(input.vPeak, "V")} peak output exceeds the ${q(vpMax, "V")} this stage can swing: it clips. ${cls === "class-a-series" ? `Set ICQ near ${q(input.vcc / (2 * input.rLoad), "A")} for the largest symmetrical swing, or raise` : "Raise"} VCC, or reduce the amplitude.`,
    }),
  );
  const saturated = cls === "class-a-series" && f.value("v_ceq") <= input.vSat;
  if (saturated) {
    b.check(makeCheck("bias.saturated", "fail", "Bias point", `ICQ·RL = ${q((input.iq ?? 0) * input.rLoad, "V")} leaves VCEQ = ${q(f.value("v_ceq"), "V")}, at or below Vsat ${q(input.vSat, "V")}: the device is saturated with no signal, so ICQ cannot flow and the powers above do not apply. Lower ICQ to about ${q(input.vcc / (2 * input.rLoad), "A")}.`, -1));
  }

  // ---- Thermal chain -----------------------------------------------------------------------
  const T = "Thermal";
  const pDevMax = f.value("p_dev_max");
  const shared = pushPull && input.sharedHeatsink === true;
  const tjTarget = input.tjMax - input.tjMargin;
  b.formula({ key: "tj_target", label: "Junction temperature target", symbol: "Tj,target", expr: "TjMax - dTj", unit: "°C" }, {}, T);
  if (saturated) {
    // A saturated device carries (VCC − Vsat)/RL, not ICQ, and dissipates about Vsat times that:
    // the idle figures say nothing about its temperature, so the heatsink cannot be sized yet.
    const iSat = Math.max(0, input.vcc - input.vSat) / input.rLoad;
    b.check(makeCheck("thermal.heatsink", "fail", "Heatsink", `The heatsink cannot be sized while the device is saturated: it then carries about ${q(iSat, "A")} and dissipates about Vsat × that = ${q(input.vSat * iSat, "W")} plus its drive power, not the ${q(pDevMax, "W")} the bias figures give. Correct the bias point (ICQ near ${q(input.vcc / (2 * input.rLoad), "A")}) and size the heatsink then.`, -1));
  } else if (pDevMax <= 1e-12) {
    b.check(makeCheck("thermal.heatsink", "pass", "Heatsink", "The devices dissipate no power at any level, so no heatsink is needed."));
  } else {
    if (shared) {
      b.formula({ key: "theta_sa_max", label: "Largest heatsink θsa (shared by both devices)", symbol: "θsa,max", expr: "(tj_target - Ta - p_dev_max * (thJc + thCs)) / (2 * p_dev_max)", unit: "K/W", reference: REF.thermal }, {}, T);
    } else {
      b.formula({ key: "theta_sa_max", label: "Largest heatsink θsa (per device)", symbol: "θsa,max", expr: "(tj_target - Ta) / p_dev_max - thJc - thCs", unit: "K/W", reference: REF.thermal }, {}, T);
    }
    const thMax = f.value("theta_sa_max");
    b.formula({ key: "tj_no_sink_resistance", label: "Junction temperature with an ideal heatsink (θsa = 0)", symbol: "Tj,θsa=0", expr: "Ta + p_dev_max * (thJc + thCs)", unit: "°C", reference: REF.thermal }, {}, T);
    if (thMax <= 0) {
      b.check(
        makeCheck(
          "thermal.heatsink",
          "fail",
          "Heatsink",
          `No heatsink can hold the junction at ${q(tjTarget, "°C")}: even an ideal one (θsa = 0) gives Tj = ${q(f.value("tj_no_sink_resistance"), "°C")} at the worst-case ${q(pDevMax, "W")} per device through θjc + θcs = ${q(input.thetaJc + input.thetaCs, "K/W")}. Share the dissipation over more devices, lower the supply, or choose devices with lower θjc.`,
          thMax / Math.max(1e-9, input.thetaJc + input.thetaCs),
        ),
      );
    } else {
      b.check(makeCheck("thermal.heatsink", "pass", "Heatsink", `A heatsink of θsa ≤ ${q(thMax, "K/W")} ${shared ? "(both devices on it)" : "per device"} keeps Tj ≤ ${q(tjTarget, "°C")} at the worst-case ${q(pDevMax, "W")} per device and Ta = ${q(input.tAmbient, "°C")}.`));
    }
    if (input.heatsinkChosen && input.thetaSa !== undefined) {
      f.define({ thSa: { value: input.thetaSa, unit: "K/W", symbol: "θsa" } });
      const tj = shared
        ? b.formula({ key: "tj_worst", label: "Junction temperature, worst case, chosen heatsink", symbol: "Tj", expr: "Ta + p_dev_max * (thJc + thCs) + 2 * p_dev_max * thSa", unit: "°C", reference: REF.thermal }, {}, T)
        : b.formula({ key: "tj_worst", label: "Junction temperature, worst case, chosen heatsink", symbol: "Tj", expr: "Ta + p_dev_max * (thJc + thCs + thSa)", unit: "°C", reference: REF.thermal }, {}, T);
      b.check(
        checkAtMost("thermal.tj", "Junction temperature", tj - input.tAmbient, tjTarget - input.tAmbient, {
          pass: () => `With θsa = ${q(input.thetaSa ?? 0, "K/W")} the junction reaches ${q(tj, "°C")} at worst case, within the ${q(tjTarget, "°C")} target (Tj,max ${q(input.tjMax, "°C")} less ${q(input.tjMargin, "°C")} margin).`,
          fail: () => `With θsa = ${q(input.thetaSa ?? 0, "K/W")} the junction reaches ${q(tj, "°C")} at worst case, above the ${q(tjTarget, "°C")} target; use a heatsink of θsa ≤ ${q(Math.max(0, thMax), "K/W")} or reduce the dissipation.`,
        }),
      );
    }
  }

  // ---- Plot --------------------------------------------------------------------------------
  const amps = linspace(0, Math.max(vpMax, 1e-9), 101);
  const pts = amps.map((a) => operatingPoint(input, a));
  const perDevice = pushPull ? 0.5 : 1;
  b.plots.push(
    {
      kind: "line",
      id: "dissipation",
      title: "Device dissipation against output amplitude",
      x: { label: "Output amplitude (peak, at the load)", unit: "V", scale: "linear" },
      y: { label: "Dissipation per device", unit: "W", scale: "linear" },
      series: [
        { name: "Dissipation per device", role: "real", x: amps, y: pts.map((p) => p.pDevTotal * perDevice) },
        { name: "Chosen amplitude", role: "limit", x: [input.vPeak, input.vPeak], y: [0, Math.max(pDevMax, 1e-9) * 1.1] },
      ],
    },
    {
      kind: "line",
      id: "efficiency",
      title: "Efficiency against output amplitude",
      x: { label: "Output amplitude (peak, at the load)", unit: "V", scale: "linear" },
      y: { label: "Efficiency", unit: "%", scale: "linear" },
      series: [
        { name: "Efficiency", role: "real", x: amps, y: pts.map((p) => p.eta * 100) },
        { name: "Class limit", role: "limit", x: [0, Math.max(vpMax, 1e-9)], y: [etaLimit * 100, etaLimit * 100] },
      ],
    },
  );

  b.assumptions.push(
    "Sine-wave drive into a resistive load; ideal devices apart from the saturation voltage; supply and load resistances are as entered.",
    ...(pushPull
      ? ["Other signals can dissipate more than the sine-wave maximum: a square wave at half the rail voltage dissipates VCC²/(4RL) in the pair, 23 % above 2VCC²/(π²RL), and a reactive load (a loudspeaker) adds dissipation; size the heatsink for such signals if they can occur."]
      : []),
    ...(cls === "class-a-transformer" ? ["Ideal transformer or choke: winding resistance and core loss are neglected, so VCEQ = VCC."] : []),
    ...(pushPull ? ["Push-pull devices share the dissipation equally; each rail is ±VCC (a single supply with an output capacitor behaves as ±VCC/2)."] : []),
    ...(cls === "class-ab" ? ["Class AB: the idle current is taken to flow for the whole cycle on top of the class B current, which overstates the dissipation slightly (conservative)."] : []),
    "The heatsink is sized for the worst-case dissipation over every amplitude the stage can deliver, not only the chosen one, since programme material can sit at any level.",
    "Thermal resistances are steady-state values; the device's safe operating area (second breakdown) and its derating are not checked here.",
  );
  b.cautions.push(
    `Heatsinks and device cases run hot (design target Tj ${q(tjTarget, "°C")}); guard them against touch and keep them clear of heat-sensitive parts.`,
    "Check each device against its maker's safe-operating-area curves and power derating at the case temperature; the maker's data overrides this calculation.",
    "Fuse each supply rail and the load where a fault could overheat wiring or devices; size the fuses to the wiring and the device ratings.",
    ...(cls === "class-a-transformer"
      ? [`The collector swings up to 2·VCC = ${q(2 * input.vcc, "V")}, plus any inductive overshoot when the signal is interrupted: rate the device's VCEO above that and clamp the winding.`]
      : pushPull
        ? [`Each output device must withstand 2·VCC = ${q(2 * input.vcc, "V")} across it when the other drives the output to its rail; rate VCEO above that.`]
        : []),
    "Mains-powered supplies and voltages above the safety extra-low voltage limit need the creepage, clearance, insulation and earthing of the applicable standard; follow local codes and licensed practice.",
  );
  if (input.vcc * (pushPull ? 2 : 1) > 50) {
    b.cautions.push(`The supply totals ${q(input.vcc * (pushPull ? 2 : 1), "V")}: above 50 V treat all live parts as hazardous.`);
  }
  return b.build();
}

/** The power stage calculation type. */
export const powerStage: CalcType<typeof powerStageSchema> = {
  id: "amplifier.power-stage",
  pack: "amplifier",
  title: "Output / power stage (class A, B, AB)",
  summary: "Efficiency, device dissipation and its worst case, and the heatsink thermal chain for class A, B and AB output stages.",
  version: "1.0.1",
  schema: powerStageSchema,
  fields,
  defaults,
  compute: computePowerStage,
};
