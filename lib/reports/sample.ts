/**
 * A complete, realistic sample ReportModel: a 4th-order Butterworth anti-alias low-pass filter
 * (two unity-gain Sallen-Key sections on a 5 V single supply) for an invented firm and client.
 * Used by the report tests, the benchmark and as a preview; every number in it follows from the
 * component values below (computed here, deterministically: the Monte Carlo uses a fixed seed).
 *
 * This is sample data, not the filter engine: the app builds real reports from lib/calc outputs.
 */
import type { Check, Component, FormulaRecord, Plot, ResultValue } from "../calc/core/types";
import { formatNumber, formatQuantity } from "../calc/core/units";
import { REPORT_MODEL_FORMAT, STANDARD_STATEMENT, type InputRow, type ReportFormula, type ReportModel, type ReportResult } from "./model";
import { splitQuantity } from "./build-model";

// --- the design -------------------------------------------------------------------------------

const FC = 10e3; // target cut-off, Hz
const R1 = 1470; // section 1 resistors (equal), Ω, E96
const C1 = 12e-9; // section 1 feedback capacitor, F, E12
const C2 = 10e-9; // section 1 ground capacitor, F, E12
const R3 = 2740; // section 2 resistors (equal), Ω, E96
const C3 = 15e-9;
const C4 = 2.2e-9;
const GBW = 10e6; // LW-OA320 gain-bandwidth product, Hz
const AOL_DB = 110; // open-loop gain, dB
const SR = 8e6; // slew rate, V/s
const EN = 8.5e-9; // voltage noise density, V/√Hz
const VOS = 1.5e-3; // offset, V (override)
const TCVOS = 5e-6; // drift, V/°C
const VPLUS = 5;
const SWING_LOW = 0.05;
const SWING_HIGH = 0.06;
const VPP = 4; // required output, V peak-to-peak, about mid-rail
const BIAS = 2.5;

// --- tiny deterministic helpers (sample data only) -------------------------------------------

/** The app's formatting of a quantity (engineering prefix, true minus sign). */
const q = (value: number, unit: string, digits = 4) => formatQuantity(value, unit, { digits });
/** A fraction as a percentage, 2 significant figures. */
const pct = (fraction: number) => formatQuantity(fraction, "%", { scale: "percent", digits: 2 });
/** A plain number, `digits` significant figures. */
const n = (value: number, digits = 4) => formatNumber(value, digits);

interface Cx {
  re: number;
  im: number;
}
const cx = (re: number, im = 0): Cx => ({ re, im });
const add = (a: Cx, b: Cx): Cx => cx(a.re + b.re, a.im + b.im);
const mul = (a: Cx, b: Cx): Cx => cx(a.re * b.re - a.im * b.im, a.re * b.im + a.im * b.re);
const div = (a: Cx, b: Cx): Cx => {
  const d = b.re * b.re + b.im * b.im;
  return cx((a.re * b.re + a.im * b.im) / d, (a.im * b.re - a.re * b.im) / d);
};

/**
 * Unity-gain Sallen-Key low-pass with follower gain k(s): H = k / (s²R²CaCb + s(2RCb + RCa(1−k)) + 1),
 * Ca the capacitor to the output, Cb the one to ground (equal resistors R).
 */
function skSection(f: number, r: number, ca: number, cb: number, real: boolean): Cx {
  const s = cx(0, 2 * Math.PI * f);
  let k = cx(1);
  if (real) {
    // Single-pole op-amp A(s) = A0 / (1 + s·A0/ωT) as a follower: k = A / (1 + A).
    const a0 = 10 ** (AOL_DB / 20);
    const a = div(cx(a0), add(cx(1), mul(s, cx(a0 / (2 * Math.PI * GBW)))));
    k = div(a, add(cx(1), a));
  }
  const s2 = mul(s, s);
  const den = add(add(mul(s2, cx(r * r * ca * cb)), mul(s, add(cx(2 * r * cb), mul(cx(r * ca), add(cx(1), cx(-k.re, -k.im)))))), cx(1));
  return div(k, den);
}

function response(f: number, real: boolean, parts = { r1: R1, c1: C1, c2: C2, r3: R3, c3: C3, c4: C4 }): Cx {
  return mul(skSection(f, parts.r1, parts.c1, parts.c2, real), skSection(f, parts.r3, parts.c3, parts.c4, real));
}
const magDb = (h: Cx) => 10 * Math.log10(h.re * h.re + h.im * h.im);

/** −3 dB frequency by bisection in log f (the response is monotonic for these sections). */
function f3db(real: boolean, parts?: Parameters<typeof response>[2]): number {
  let lo = Math.log10(FC / 10);
  let hi = Math.log10(FC * 10);
  for (let i = 0; i < 60; i++) {
    const mid = (lo + hi) / 2;
    if (magDb(response(10 ** mid, real, parts)) > -3.0103) lo = mid;
    else hi = mid;
  }
  return 10 ** ((lo + hi) / 2);
}

/** mulberry32: small seeded generator, so the sample is the same on every run. */
function prng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

// --- the model --------------------------------------------------------------------------------

/** The sample report (deterministic). `overrides` replace top-level fields, e.g. the code. */
export function sampleReportModel(overrides: Partial<ReportModel> = {}): ReportModel {
  const f01 = 1 / (2 * Math.PI * R1 * Math.sqrt(C1 * C2));
  const q1 = 0.5 * Math.sqrt(C1 / C2);
  const f02 = 1 / (2 * Math.PI * R3 * Math.sqrt(C3 * C4));
  const q2 = 0.5 * Math.sqrt(C3 / C4);
  const fIdeal = f3db(false);
  const fReal = f3db(true);
  const fErr = fReal / FC - 1;
  const at50k = magDb(response(50e3, true));
  const fcl = GBW; // noise gain 1
  const gbwNeed = 100 * Math.max(f01 * q1, f02 * q2);
  const vp = VPP / 2;
  const fpbw = SR / (2 * Math.PI * vp);
  const srNeed = 2 * Math.PI * FC * vp;
  const voutMax = VPLUS - SWING_HIGH;
  const voutMin = SWING_LOW;
  const sigHigh = BIAS + vp;
  const sigLow = BIAS - vp;
  const dT = 85 - 25;
  const vosTotal = VOS + TCVOS * dT;
  const enbw = 1.026 * FC; // noise bandwidth of a 4th-order Butterworth low-pass
  const enOut = EN * Math.sqrt(enbw);

  // Monte Carlo: resistors ±1 %, capacitors ±5 %, uniform; 2000 runs; ideal op-amp.
  const rnd = prng(20250314);
  const u = (tol: number) => 1 + tol * (2 * rnd() - 1);
  const runs: number[] = [];
  for (let i = 0; i < 2000; i++) {
    runs.push(f3db(false, { r1: R1 * u(0.01), c1: C1 * u(0.05), c2: C2 * u(0.05), r3: R3 * u(0.01), c3: C3 * u(0.05), c4: C4 * u(0.05) }));
  }
  runs.sort((a, b) => a - b);
  const p005 = runs[Math.floor(0.005 * runs.length)];
  const p995 = runs[Math.ceil(0.995 * runs.length) - 1];
  const bins = 24;
  const lo = Math.floor(runs[0] / 100) * 100;
  const hi = Math.ceil(runs[runs.length - 1] / 100) * 100;
  const edges = Array.from({ length: bins + 1 }, (_, i) => lo + ((hi - lo) * i) / bins);
  const counts = new Array<number>(bins).fill(0);
  for (const f of runs) counts[Math.min(bins - 1, Math.floor(((f - lo) / (hi - lo)) * bins))]++;
  const spreadLo = p005 / FC - 1;
  const spreadHi = p995 / FC - 1;

  const freqs = Array.from({ length: 241 }, (_, i) => 100 * 10 ** (i / 60));
  const unwrap = (ph: number[]) => {
    const out = [...ph];
    for (let i = 1; i < out.length; i++) {
      while (out[i] - out[i - 1] > 180) out[i] -= 360;
      while (out[i] - out[i - 1] < -180) out[i] += 360;
    }
    return out;
  };
  const phase = (real: boolean) => unwrap(freqs.map((f) => { const h = response(f, real); return (Math.atan2(h.im, h.re) * 180) / Math.PI; }));

  const plots: Plot[] = [
    {
      kind: "line",
      id: "bode.magnitude",
      title: "Magnitude response",
      x: { label: "Frequency", unit: "Hz", scale: "log" },
      y: { label: "Magnitude", unit: "dB", scale: "linear" },
      series: [
        { name: "Ideal op-amp", role: "ideal", x: freqs, y: freqs.map((f) => magDb(response(f, false))) },
        { name: "LW-OA320 (GBW 10 MHz)", role: "real", x: freqs, y: freqs.map((f) => magDb(response(f, true))) },
        { name: "Stop-band requirement", role: "limit", x: [50e3, 1e6], y: [-40, -40] },
      ],
    },
    {
      kind: "line",
      id: "bode.phase",
      title: "Phase response",
      x: { label: "Frequency", unit: "Hz", scale: "log" },
      y: { label: "Phase", unit: "°", scale: "linear" },
      series: [
        { name: "Ideal op-amp", role: "ideal", x: freqs, y: phase(false) },
        { name: "LW-OA320 (GBW 10 MHz)", role: "real", x: freqs, y: phase(true) },
      ],
    },
    {
      kind: "histogram",
      id: "mc.f3db",
      title: "Monte Carlo spread of the −3 dB frequency (2000 runs, R ±1 %, C ±5 %)",
      x: { label: "−3 dB frequency", unit: "Hz", scale: "linear" },
      edges,
      counts,
      markers: [
        { label: "P0.5", value: p005 },
        { label: "nominal", value: fIdeal },
        { label: "P99.5", value: p995 },
      ],
    },
    {
      kind: "levels",
      id: "swing",
      title: "Output swing against the rails (RL = 10 kΩ)",
      unit: "V",
      levels: [
        { label: "V+ rail", value: VPLUS, role: "rail" },
        { label: "Output high limit", value: voutMax, role: "limit" },
        { label: "Signal peak, high", value: sigHigh, role: "signal" },
        { label: "Mid-rail bias", value: BIAS, role: "bias" },
        { label: "Signal peak, low", value: sigLow, role: "signal" },
        { label: "Output low limit", value: voutMin, role: "limit" },
        { label: "V− rail (ground)", value: 0, role: "rail" },
      ],
      bands: [
        { label: "Output range of LW-OA320", from: voutMin, to: voutMax, role: "allowed" },
        { label: "Required signal range", from: sigLow, to: sigHigh, role: "required" },
      ],
    },
  ];

  const formulaList: Array<FormulaRecord & { resultText: string }> = [
    {
      key: "f01",
      label: "Natural frequency, section 1",
      symbol: "f₀₁",
      expression: "1 / (2 * pi * R1 * sqrt(C1 * C2))",
      symbolic: "f₀₁ = 1 / (2π · R1 · √(C1 · C2))",
      substituted: "f₀₁ = 1 / (2π · 1.47 kΩ · √(12 nF · 10 nF))",
      value: f01,
      unit: "Hz",
      resultText: q(f01, "Hz", 4),
      reference: "Carter, Mancini, Op Amps for Everyone, 5th ed., ch. 16",
    },
    {
      key: "q1",
      label: "Quality factor, section 1",
      symbol: "Q₁",
      expression: "0.5 * sqrt(C1 / C2)",
      symbolic: "Q₁ = ½ · √(C1 / C2)",
      substituted: "Q₁ = ½ · √(12 nF / 10 nF)",
      value: q1,
      unit: "",
      resultText: n(q1),
      reference: "Carter, Mancini, Op Amps for Everyone, 5th ed., ch. 16",
    },
    {
      key: "f02",
      label: "Natural frequency, section 2",
      symbol: "f₀₂",
      expression: "1 / (2 * pi * R3 * sqrt(C3 * C4))",
      symbolic: "f₀₂ = 1 / (2π · R3 · √(C3 · C4))",
      substituted: "f₀₂ = 1 / (2π · 2.74 kΩ · √(15 nF · 2.2 nF))",
      value: f02,
      unit: "Hz",
      resultText: q(f02, "Hz", 4),
      reference: "Carter, Mancini, Op Amps for Everyone, 5th ed., ch. 16",
    },
    {
      key: "q2",
      label: "Quality factor, section 2",
      symbol: "Q₂",
      expression: "0.5 * sqrt(C3 / C4)",
      symbolic: "Q₂ = ½ · √(C3 / C4)",
      substituted: "Q₂ = ½ · √(15 nF / 2.2 nF)",
      value: q2,
      unit: "",
      resultText: n(q2),
      reference: "Carter, Mancini, Op Amps for Everyone, 5th ed., ch. 16",
    },
    {
      key: "gbw_need",
      label: "Gain-bandwidth product needed (100 × f₀ · Q, worst section)",
      symbol: "GBW_req",
      expression: "100 * f02 * Q2",
      symbolic: "GBW_req = 100 · f₀₂ · Q₂",
      substituted: `GBW_req = 100 · ${q(f02, "Hz")} · ${n(q2)}`,
      value: gbwNeed,
      unit: "Hz",
      resultText: q(gbwNeed, "Hz", 4),
      reference: "design margin in common use",
    },
    {
      key: "fpbw",
      label: "Full-power bandwidth at the required swing",
      symbol: "f_FP",
      expression: "SR / (2 * pi * Vp)",
      symbolic: "f_FP = SR / (2π · Vp)",
      substituted: "f_FP = 8 V/µs / (2π · 2.00 V)",
      value: fpbw,
      unit: "Hz",
      resultText: q(fpbw, "Hz", 4),
      reference: "Franco, Design with Operational Amplifiers, 4th ed., §6.4",
    },
    {
      key: "sr_need",
      label: "Slew rate needed at the cut-off frequency",
      symbol: "SR_req",
      expression: "2 * pi * fc * Vp",
      symbolic: "SR_req = 2π · f_c · Vp",
      substituted: "SR_req = 2π · 10.0 kHz · 2.00 V",
      value: srNeed,
      unit: "V/s",
      resultText: q(srNeed, "V/s", 4),
      reference: "Franco, Design with Operational Amplifiers, 4th ed., §6.4",
    },
    {
      key: "vout_max",
      label: "Highest output at RL = 10 kΩ",
      symbol: "Vout,max",
      expression: "Vplus - dVhigh",
      symbolic: "Vout,max = V+ − ΔV_H",
      substituted: "Vout,max = 5.00 V − 60 mV",
      value: voutMax,
      unit: "V",
      resultText: q(voutMax, "V", 3),
    },
    {
      key: "vos_total",
      label: "Output offset over temperature (unity DC gain)",
      symbol: "Vos,out",
      expression: "Vos + TCVos * (Tmax - 25)",
      symbolic: "Vos,out = ±(Vos + TCVos · (T_max − 25 °C))",
      substituted: "Vos,out = ±(1.50 mV + 5.0 µV/°C · (85 °C − 25 °C))",
      value: vosTotal,
      unit: "V",
      resultText: `±${q(vosTotal, "V", 3)}`,
      reference: "Franco, Design with Operational Amplifiers, 4th ed., §5.4",
    },
    {
      key: "en_out",
      label: "Op-amp voltage noise at the output",
      symbol: "e_n,out",
      expression: "en * sqrt(1.026 * fc)",
      symbolic: "e_n,out = e_n · √(1.026 · f_c)",
      substituted: "e_n,out = 8.5 nV/√Hz · √(1.026 · 10.0 kHz)",
      value: enOut,
      unit: "V",
      resultText: `${q(enOut, "V", 3)} rms`,
      reference: "Winder, Analog and Digital Filter Design, 2nd ed., noise bandwidth tables",
    },
  ];
  const formulas: ReportFormula[] = formulaList;

  const results: ReportResult[] = [
    r("f3db_ideal", "−3 dB frequency, ideal op-amp", "f₋₃dB", fIdeal, "Hz", "Response"),
    r("f3db_real", "−3 dB frequency with LW-OA320", "f₋₃dB,r", fReal, "Hz", "Response"),
    r("f3db_err", "Cut-off error against the target", "Δf_c", fErr * 100, "%", "Response", 3),
    r("a50k", "Attenuation at 50 kHz", "A(50 kHz)", at50k, "dB", "Response", 3),
    r("f01", "Natural frequency, section 1", "f₀₁", f01, "Hz", "Sections"),
    r("q1", "Quality factor, section 1", "Q₁", q1, "", "Sections"),
    r("f02", "Natural frequency, section 2", "f₀₂", f02, "Hz", "Sections"),
    r("q2", "Quality factor, section 2", "Q₂", q2, "", "Sections"),
    r("fcl", "Closed-loop bandwidth (noise gain 1)", "f_CL", fcl, "Hz", "Dynamic limits"),
    r("gbw_need", "Gain-bandwidth product needed", "GBW_req", gbwNeed, "Hz", "Dynamic limits"),
    r("fpbw", "Full-power bandwidth at 4.0 V p-p", "f_FP", fpbw, "Hz", "Dynamic limits"),
    r("sr_need", "Slew rate needed", "SR_req", srNeed, "V/s", "Dynamic limits"),
    r("vout_max", "Highest output", "Vout,max", voutMax, "V", "Output swing", 3),
    r("vout_min", "Lowest output", "Vout,min", voutMin, "V", "Output swing", 3),
    r("vos_total", "Output offset, 25 °C to 85 °C (either sign)", "Vos,out", vosTotal, "V", "DC error", 3),
    r("en_out", "Op-amp noise at the output (rms)", "e_n,out", enOut, "V", "Noise", 3),
    r("mc_p005", "−3 dB frequency, 0.5th percentile", "f₋₃dB,P0.5", p005, "Hz", "Tolerance (Monte Carlo, 2000 runs)"),
    r("mc_p995", "−3 dB frequency, 99.5th percentile", "f₋₃dB,P99.5", p995, "Hz", "Tolerance (Monte Carlo, 2000 runs)"),
  ];

  const checks: Check[] = [
    {
      id: "response.fc",
      severity: Math.abs(fErr) <= 0.02 ? "pass" : "fail",
      title: "Cut-off frequency within ±2 % of the target",
      message: `The −3 dB frequency with LW-OA320 is ${q(fReal, "Hz")}, ${n(fErr * 100, 3)} % from the 10.0 kHz target (limit ±2 %).`,
      margin: (0.02 - Math.abs(fErr)) / 0.02,
    },
    {
      id: "response.stopband",
      severity: at50k <= -40 ? "pass" : "fail",
      title: "Stop-band attenuation at 50 kHz",
      message: `Attenuation at 50 kHz is ${q(-at50k, "dB", 3)} against the 40 dB required.`,
      margin: (-at50k - 40) / 40,
    },
    {
      id: "dynamic.gbw",
      severity: GBW >= gbwNeed ? "pass" : "warning",
      title: "Gain-bandwidth product",
      message: `LW-OA320 has 10 MHz; 100 × f₀ · Q of the worst section asks for ${q(gbwNeed, "Hz", 3)}.`,
      margin: (GBW - gbwNeed) / gbwNeed,
    },
    {
      id: "dynamic.slew",
      severity: SR >= 5 * srNeed ? "pass" : "warning",
      title: "Slew rate",
      message: `8 V/µs available; ${q(srNeed, "V/s", 3)} needed for 4.0 V p-p at 10 kHz (5× headroom kept).`,
      margin: (SR - 5 * srNeed) / (5 * srNeed),
    },
    {
      id: "swing.high",
      severity: "pass",
      title: "Output swing, positive rail",
      message: `The signal peaks at ${q(sigHigh, "V", 3)}; the output reaches ${q(voutMax, "V", 3)} at 10 kΩ.`,
      margin: (voutMax - sigHigh) / sigHigh,
    },
    {
      id: "swing.low",
      severity: "pass",
      title: "Output swing, negative rail",
      message: `The signal falls to ${q(sigLow, "V", 3)}; the output reaches down to ${q(voutMin, "V", 3)} at 10 kΩ.`,
      margin: (sigLow - voutMin) / sigLow,
    },
    {
      id: "tolerance.spread",
      severity: Math.max(-spreadLo, spreadHi) <= 0.05 ? "pass" : "warning",
      title: "Cut-off spread with component tolerances",
      message: `99 % of builds fall between ${q(p005, "Hz")} and ${q(p995, "Hz")} (${pct(spreadLo)} to +${pct(spreadHi)}). Use ±2 % capacitors if the ±5 % band is too wide for the ADC's digital filter.`,
      margin: (0.05 - Math.max(-spreadLo, spreadHi)) / 0.05,
    },
    {
      id: "dc.offset",
      severity: vosTotal <= 1e-3 ? "pass" : "fail",
      title: "Output offset against the 1 mV budget",
      message: `Offset reaches ±${q(vosTotal, "V", 3)} at 85 °C, above the ±1.00 mV budget. Choose a part with Vos below 0.7 mV, or calibrate the offset in firmware.`,
      margin: (1e-3 - vosTotal) / 1e-3,
    },
  ];

  const inputs: InputRow[] = [
    { group: "Specification", symbol: "—", description: "Response", value: "Butterworth", unit: "", source: "entered" },
    { group: "Specification", symbol: "n", description: "Order", value: "4", unit: "", source: "entered" },
    { group: "Specification", symbol: "f_c", description: "Cut-off frequency (−3 dB)", value: "10.0", unit: "kHz", source: "entered" },
    { group: "Specification", symbol: "G", description: "Pass-band gain", value: "1", unit: "V/V", source: "entered" },
    { group: "Specification", symbol: "A_sb", description: "Stop-band attenuation at 50 kHz, at least", value: "40", unit: "dB", source: "entered" },
    { group: "Realisation", symbol: "—", description: "Topology", value: "Sallen-Key, unity gain", unit: "", source: "entered" },
    { group: "Realisation", symbol: "—", description: "Resistor series / capacitor series", value: "E96 / E12", unit: "", source: "entered" },
    { group: "Realisation", symbol: "tol_R", description: "Resistor tolerance", value: "±1", unit: "%", source: "entered" },
    { group: "Realisation", symbol: "tol_C", description: "Capacitor tolerance (C0G)", value: "±5", unit: "%", source: "entered" },
    { group: "Supply and signal", symbol: "V+", description: "Positive supply", value: "5.00", unit: "V", source: "entered" },
    { group: "Supply and signal", symbol: "V−", description: "Negative supply", value: "0", unit: "V", source: "entered" },
    { group: "Supply and signal", symbol: "V_bias", description: "Mid-rail bias", value: "2.50", unit: "V", source: "entered" },
    { group: "Supply and signal", symbol: "V_pp", description: "Required output swing about the bias", value: "4.00", unit: "V p-p", source: "entered" },
    { group: "Supply and signal", symbol: "R_L", description: "Load resistance (ADC driver input)", value: "10.0", unit: "kΩ", source: "entered" },
    { group: "Supply and signal", symbol: "T", description: "Ambient temperature range", value: "−40 to 85", unit: "°C", source: "entered" },
    { group: "Op-amp: LW-OA320", symbol: "GBW", description: "Gain-bandwidth product", value: "10", unit: "MHz", source: "part library: LW-OA320" },
    { group: "Op-amp: LW-OA320", symbol: "SR", description: "Slew rate", value: "8", unit: "V/µs", source: "part library: LW-OA320" },
    { group: "Op-amp: LW-OA320", symbol: "A_OL", description: "Open-loop gain", value: "110", unit: "dB", source: "part library: LW-OA320" },
    { group: "Op-amp: LW-OA320", symbol: "V_os", description: "Input offset voltage, maximum", value: "1.50", unit: "mV", source: "override: lot test QA-118 measured 1.5 mV (library 0.9 mV)" },
    { group: "Op-amp: LW-OA320", symbol: "TC_Vos", description: "Offset drift", value: "5.0", unit: "µV/°C", source: "part library: LW-OA320" },
    { group: "Op-amp: LW-OA320", symbol: "e_n", description: "Voltage noise density (white)", value: "8.5", unit: "nV/√Hz", source: "part library: LW-OA320" },
    { group: "Op-amp: LW-OA320", symbol: "ΔV_L", description: "Output swing headroom, negative rail, at 10 kΩ", value: "50", unit: "mV", source: "part library: LW-OA320" },
    { group: "Op-amp: LW-OA320", symbol: "ΔV_H", description: "Output swing headroom, positive rail, at 10 kΩ", value: "60", unit: "mV", source: "part library: LW-OA320" },
  ];

  const components: Component[] = [
    { ref: "R1", kind: "resistor", value: R1, display: "1.47 kΩ", series: "E96", tolerance: 0.01, role: "Input resistor, section 1" },
    { ref: "R2", kind: "resistor", value: R1, display: "1.47 kΩ", series: "E96", tolerance: 0.01, role: "Second resistor, section 1" },
    { ref: "C1", kind: "capacitor", value: C1, display: "12 nF", series: "E12", tolerance: 0.05, role: "Feedback capacitor to output, section 1 (C0G)" },
    { ref: "C2", kind: "capacitor", value: C2, display: "10 nF", series: "E12", tolerance: 0.05, role: "Capacitor to ground, section 1 (C0G)" },
    { ref: "R3", kind: "resistor", value: R3, display: "2.74 kΩ", series: "E96", tolerance: 0.01, role: "Input resistor, section 2" },
    { ref: "R4", kind: "resistor", value: R3, display: "2.74 kΩ", series: "E96", tolerance: 0.01, role: "Second resistor, section 2" },
    { ref: "C3", kind: "capacitor", value: C3, display: "15 nF", series: "E12", tolerance: 0.05, role: "Feedback capacitor to output, section 2 (C0G)" },
    { ref: "C4", kind: "capacitor", value: C4, display: "2.2 nF", series: "E12", tolerance: 0.05, role: "Capacitor to ground, section 2 (C0G)" },
    { ref: "C5", kind: "capacitor", value: 100e-9, display: "100 nF", series: "E6", tolerance: 0.1, role: "Supply decoupling at U1 (X7R)" },
    { ref: "U1", kind: "opamp", value: 0, display: "LW-OA320", role: "Dual op-amp: U1A section 1, U1B section 2" },
  ];

  const model: ReportModel = {
    format: REPORT_MODEL_FORMAT,
    workspace: { name: "Harbour Analog Design Ltd" },
    project: { name: "Vibration monitor front end", clientName: "Kestrel Vale Instruments", jobNumber: "HAD-2291" },
    calculation: {
      title: "Anti-alias low-pass filter, ADC channel 1",
      number: "C-014",
      typeId: "filter.lowpass",
      typeTitle: "Low-pass filter",
      pack: "filter",
      packTitle: "Active filter pack",
      revision: "B",
      status: "issued",
    },
    issueDate: "2025-03-14",
    purpose:
      "Design and verify the anti-alias filter ahead of the 24-bit ADC on channel 1 of the vibration monitor: a 4th-order Butterworth low-pass with its −3 dB point at 10 kHz, so that content above the 50 kHz stop-band edge is attenuated by at least 40 dB before sampling.",
    scope:
      "Covers the two Sallen-Key sections U1A and U1B with their resistors and capacitors, the op-amp's finite gain-bandwidth product, slew rate, output swing at the ADC driver's 10 kΩ load, offset over temperature, the op-amp's own noise, and the spread of the cut-off frequency with component tolerances.\n\nNot covered: the ADC's internal digital filter, the sensor and its charge amplifier, PCB layout and EMC.",
    inputs,
    formulas,
    results,
    checks,
    plots,
    tables: [
      {
        id: "sections",
        title: "Filter sections as built",
        columns: [
          { key: "section", label: "Section" },
          { key: "f0", label: "f₀", align: "right" },
          { key: "q", label: "Q", align: "right" },
          { key: "r", label: "R (each)", align: "right" },
          { key: "ca", label: "C to output", align: "right" },
          { key: "cb", label: "C to ground", align: "right" },
          { key: "target", label: "Target Q", align: "right" },
        ],
        rows: [
          { section: "1 (U1A)", f0: q(f01, "Hz", 4), q: n(q1), r: "1.47 kΩ", ca: "12 nF", cb: "10 nF", target: "0.5412" },
          { section: "2 (U1B)", f0: q(f02, "Hz", 4), q: n(q2), r: "2.74 kΩ", ca: "15 nF", cb: "2.2 nF", target: "1.3066" },
        ],
      },
    ],
    components,
    assumptions: [
      "The op-amp is modelled with a single-pole open-loop response (GBW 10 MHz, A_OL 110 dB); second poles above 20 MHz are neglected.",
      "Resistor and capacitor values are uniformly distributed within their tolerance bands and independent of each other.",
      "Capacitors are C0G/NP0 dielectric: their value does not change with applied voltage, and their drift over −40 °C to 85 °C is below 0.2 %.",
      "The ADC driver input is resistive (10 kΩ) with less than 100 pF in parallel.",
    ],
    cautions: [],
    statement: STANDARD_STATEMENT,
    revisions: [
      { revision: "A", date: "2025-02-20", description: "First issue.", by: "Mira Okafor" },
      { revision: "B", date: "2025-03-14", description: "Capacitors re-selected from E12; offset budget check and Monte Carlo tolerance analysis added.", by: "Mira Okafor" },
    ],
    signOff: {
      prepared: { name: "Mira Okafor", date: "2025-03-10" },
      checked: { name: "Jonas Lindqvist", date: "2025-03-12" },
      approved: { name: "Priya Castellano", date: "2025-03-14" },
    },
    engine: { typeId: "filter.lowpass", version: "1.3.0" },
    verification: { code: "LW-7K3Q-9XPA", url: "https://app.loopwright.example/verify?code=LW-7K3Q-9XPA" },
  };
  return { ...model, ...overrides };
}

/** A result row printed as the app prints it (formatQuantity, split into number and unit). */
function r(key: string, label: string, symbol: string, value: number, unit: string, group: string, digits = 4): ReportResult {
  const base: ResultValue = { key, label, symbol, value, unit, group };
  const { value: valueText, unit: unitText } = splitQuantity(formatQuantity(value, unit, { digits }));
  return { ...base, valueText, unitText };
}
