/**
 * compute() of the active filter types: design → response (ideal and finite-GBW op-amp) →
 * checks → tolerance analysis → CalcOutput. Shared by filter.lowpass, filter.highpass and
 * filter.bandpass so the family has one pattern.
 *
 * GBW rules used (stated in the assumptions and beside each check):
 * - low/high-pass sections: GBW ≥ 100 · Gₙ · Q · f₀ (second order) or 100 · Gₙ · f₀ (first
 *   order), Gₙ the section's noise gain. Rule of thumb as commonly quoted in op-amp makers'
 *   filter-design notes (value from memory; treat as common practice, no source). It is a
 *   screening rule: the finite-GBW response is computed as well and the specification checks use it.
 * - multiple-feedback band-pass: loop gain ≥ 10 (20 dB) at f₀, where the noise gain is
 *   1 + 2Q² for equal capacitors (derived from the section's nodal equations), so
 *   A_OL(f₀) ≥ 10·(1 + 2Q²) and GBW ≥ 10·(1 + 2Q²)·f₀ (common practice margin, no source).
 */
import type { CalcOutput, Component, HistogramPlot, LinePlot, ResultTable } from "../core/types";
import type { OpAmpParams } from "../core/parts";
import { OutputBuilder } from "../core/output";
import { checkAtLeast, checkAtMost, makeCheck, margin } from "../core/checks";
import { formatQuantity } from "../core/units";
import { bestRatioPair, nearestPreferred, nextPreferredUp, type ESeries } from "../core/eseries";
import { designFilter, type FilterDesign, type ValuePicker } from "./design";
import { renameVariables, sectionExpressions } from "./formulas";
import type { OpAmpModel } from "./mna";
import { sectionCoefficientsAB } from "./prototype";
import { logSweep, magnitudeFunction, minus3dBFrequency, minus3dBFrequencyWithModel, rippleEdgeFrequency, sweepResponse } from "./response";
import { monteCarlo, worstCase, MAX_CORNER_PARTS, type FigureStats } from "./tolerance";
import { TOPOLOGY_LABELS } from "./topology";
import type { BandpassInput, CascadeInput } from "./schema";
import { filterNetlist } from "../spice/filter";

/** Resistor range considered sensible, Ω (common practice, no source). */
export const RESISTOR_RANGE = { min: 100, max: 1e6 } as const;
/** Smallest capacitor considered safe from stray capacitance, F (common practice, no source). */
export const CAPACITOR_MIN = 100e-12;

/** A preferred-value picker over two IEC 60063 series. */
export function seriesPicker(capSeries: ESeries, resSeries: ESeries): ValuePicker {
  return {
    capSeries,
    resSeries,
    capNearest: (x) => nearestPreferred(x, capSeries),
    capAtLeast: (x) => nextPreferredUp(x * (1 - 1e-9), capSeries),
    resNearest: (x) => nearestPreferred(x, resSeries),
    resRatioPair: (ratio, near) => {
      const p = bestRatioPair(ratio, resSeries, { rbMin: near / 3.3, rbMax: near * 3.3 });
      return p ? { a: p.ra, b: p.rb } : { a: nearestPreferred(ratio * near, resSeries), b: nearestPreferred(near, resSeries) };
    },
    capRatioPair: (ratio, near) => {
      const p = bestRatioPair(ratio, capSeries, { raMin: (ratio * near) / 3.3, raMax: ratio * near * 3.3, rbMin: near / 3.3, rbMax: near * 3.3 });
      return p ? { a: p.ra, b: p.rb } : { a: nearestPreferred(ratio * near, capSeries), b: nearestPreferred(near, capSeries) };
    },
  };
}

/** The design for an input of one of the filter types. */
export function designFromInput(kind: "lowpass" | "highpass" | "bandpass", input: CascadeInput | BandpassInput): FilterDesign {
  const picker = seriesPicker(input.capSeries, input.resSeries);
  const tol = { resistorTolerance: input.resTolerance, capacitorTolerance: input.capTolerance };
  if (kind === "bandpass") {
    const b = input as BandpassInput;
    return designFilter({ kind: "bandpass", centre: b.centre, q: b.q, gain: b.gain, resistorLevel: b.resistorLevel, picker, ...tol });
  }
  const c = input as CascadeInput;
  return designFilter({
    kind,
    family: c.response,
    order: c.order,
    rippleDb: c.response === "chebyshev" ? c.rippleDb : undefined,
    normalisation: c.response === "chebyshev" ? (c.cutoffMeaning ?? "-3db") : "-3db",
    cutoff: c.cutoff,
    topology: c.topology,
    firstOrder: c.firstOrder,
    gain: c.fixGain ? (c.gain ?? 1) : null,
    gainSharing: c.gainSharing ?? "equal",
    resistorLevel: c.resistorLevel,
    picker,
    ...tol,
  });
}

/** The single-pole model of a part. */
export function partModel(p: OpAmpParams): { kind: "single-pole"; a0: number; gbw: number } {
  return { kind: "single-pole", a0: 10 ** (p.aolDb / 20), gbw: p.gbw };
}

const fmt = (v: number, unit: string, digits = 4) => formatQuantity(v, unit, { digits });
const pct = (x: number, digits = 3) => `${(x * 100).toFixed(digits)} %`;
const db = (x: number) => 20 * Math.log10(Math.max(Math.abs(x), 1e-300));

/** Golden-section search for the maximum of g on [a, b] (log-frequency), returns the arg max. */
function maximise(g: (f: number) => number, a: number, b: number): number {
  const r = (Math.sqrt(5) - 1) / 2;
  let x1 = Math.log(a), x4 = Math.log(b);
  let x2 = x4 - r * (x4 - x1), x3 = x1 + r * (x4 - x1);
  let g2 = g(Math.exp(x2)), g3 = g(Math.exp(x3));
  for (let i = 0; i < 80 && x4 - x1 > 1e-10; i++) {
    if (g2 >= g3) { x4 = x3; x3 = x2; g3 = g2; x2 = x4 - r * (x4 - x1); g2 = g(Math.exp(x2)); }
    else { x1 = x2; x2 = x3; g2 = g3; x3 = x1 + r * (x4 - x1); g3 = g(Math.exp(x3)); }
  }
  return Math.exp((x1 + x4) / 2);
}

/** A Monte Carlo histogram with the usual markers (target, nominal, mean, ±3σ-equivalent percentiles). */
export function histogramPlot(id: string, title: string, label: string, unit: string, s: FigureStats, target: number): HistogramPlot {
  return {
    kind: "histogram",
    id,
    title,
    x: { label, unit, scale: "linear" },
    edges: s.histogram.edges,
    counts: s.histogram.counts,
    markers: [
      { label: "target", value: target },
      { label: "nominal (chosen values)", value: s.nominal },
      { label: "mean", value: s.mean },
      { label: "0.135 % percentile", value: s.percentiles[0].value },
      { label: "99.865 % percentile", value: s.percentiles[4].value },
    ],
  };
}

/**
 * The compute of every filter type.
 * @param kind low-pass, high-pass or band-pass
 * @param input the parsed input (SI base units)
 */
export function computeFilter(kind: "lowpass" | "highpass" | "bandpass", input: CascadeInput | BandpassInput): CalcOutput {
  const design = designFromInput(kind, input);
  const part = input.opamp;
  const real: OpAmpModel = partModel(part);
  const ideal: OpAmpModel = { kind: "ideal" };
  const out = new OutputBuilder();
  const sheet = out.sheet;
  const cascade = kind === "bandpass" ? null : (input as CascadeInput);
  const bp = kind === "bandpass" ? (input as BandpassInput) : null;
  const targetF = design.targetFrequency;

  // ---- formulas: each section's achieved values from its chosen parts -------------------------
  const partVars: Record<string, { value: number; unit: string; symbol: string }> = {};
  for (const c of design.components) partVars[c.ref] = { value: c.value, unit: c.kind === "resistor" ? "Ω" : "F", symbol: c.ref };
  sheet.define(partVars);
  const gbwNeeded: number[] = [];
  const noiseGains: number[] = [];
  for (const s of design.sections) {
    const ex = sectionExpressions(s.variant.topology, s.variant.kind, s.variant.gainNetwork);
    const names: Record<string, string> = { K: `s${s.index}_K`, Q: `s${s.index}_Q` };
    s.variant.parts.forEach((p, j) => (names[p.name] = s.refs[j]));
    const grp = `Section ${s.index}`;
    const ps = design.prototype?.sections[s.index - 1];
    if (cascade && ps) {
      sheet.eval(
        { key: `s${s.index}_f0t`, label: `Section ${s.index} target ${s.variant.order === 1 ? "pole" : "natural"} frequency`, symbol: `f₀,${s.index},target`, expr: kind === "lowpass" ? `fc * W${s.index}` : `fc / W${s.index}`, unit: "Hz", reference: "Low-pass prototype scaled to the cutoff (s → s/ω_c; high-pass: s → ω_c/s)" },
        { fc: { value: cascade.cutoff, unit: "Hz", symbol: "f_c" }, [`W${s.index}`]: { value: ps.w0, unit: "", symbol: `Ω${s.index}`, digits: 6 } },
      );
    }
    const ref = "Derived from the section's nodal equations (ideal op-amp); agrees with Carter & Mancini, Op Amps for Everyone, 5th ed., ch. 16";
    if (ex.k) out.formula({ key: `s${s.index}_K`, label: `Section ${s.index} amplifier gain`, symbol: `K${s.index}`, expr: renameVariables(ex.k, names), unit: "V/V", reference: "Non-inverting amplifier gain" }, {}, grp);
    out.formula({ key: `s${s.index}_f0`, label: `Section ${s.index} achieved ${s.variant.order === 1 ? "pole frequency" : "natural frequency"}`, symbol: `f₀,${s.index}`, expr: renameVariables(ex.f0, names), unit: "Hz", reference: ref }, {}, grp);
    if (ex.q) out.formula({ key: `s${s.index}_Q`, label: `Section ${s.index} achieved Q`, symbol: `Q${s.index}`, expr: renameVariables(ex.q, names), unit: "", reference: ref }, {}, grp);
    if (ex.gain) out.formula({ key: `s${s.index}_G`, label: `Section ${s.index} achieved passband gain`, symbol: `G${s.index}`, expr: renameVariables(ex.gain, names), unit: "V/V", reference: ref }, {}, grp);
    const ng = sheet.eval({ key: `s${s.index}_NG`, label: `Section ${s.index} noise gain`, symbol: `Gₙ,${s.index}`, expr: renameVariables(ex.noiseGain, names), unit: "V/V" });
    noiseGains.push(ng);
    const gbwExpr =
      s.variant.topology === "mfb-bp"
        ? `10 * s${s.index}_NG * s${s.index}_f0`
        : s.variant.order === 2
          ? `100 * s${s.index}_NG * s${s.index}_Q * s${s.index}_f0`
          : `100 * s${s.index}_NG * s${s.index}_f0`;
    gbwNeeded.push(
      out.formula(
        {
          key: `s${s.index}_GBW`,
          label: `Section ${s.index} GBW needed`,
          symbol: `GBW${s.index}`,
          expr: gbwExpr,
          unit: "Hz",
          reference: s.variant.topology === "mfb-bp" ? "Loop gain ≥ 10 at f₀ with noise gain 1 + 2Q² (common practice margin, no source)" : "Rule of thumb GBW ≥ 100·Gₙ·Q·f₀ (common practice, no source)",
        },
        {},
        grp,
      ),
    );
  }
  const gainTerms = design.sections.map((s) => (sectionExpressions(s.variant.topology, s.variant.kind, s.variant.gainNetwork).gain ? `s${s.index}_G` : "1"));
  const overallGain = out.formula({ key: "G_total", label: "Overall passband gain (chosen values, ideal op-amp)", symbol: "G", expr: gainTerms.join(" * "), unit: "V/V", digits: 5 }, {}, "Overall");

  // ---- nominal figures -----------------------------------------------------------------------
  const f3Ideal = minus3dBFrequency(design);
  const magReal = magnitudeFunction(design, real);
  let refReal: number, refFreqReal: number;
  let f3Real: number;
  if (kind === "bandpass") {
    const fPeak = maximise(magReal, targetF / 3, targetF * 3);
    refFreqReal = fPeak;
    refReal = magReal(fPeak);
    f3Real = fPeak;
  } else {
    refFreqReal = kind === "lowpass" ? targetF * 1e-4 : targetF * 10;
    refReal = magReal(refFreqReal);
    f3Real = minus3dBFrequencyWithModel(design, real);
  }
  const group = "Overall response";
  out.result("f_target", kind === "bandpass" ? "Target centre frequency" : "Target −3 dB frequency", kind === "bandpass" ? "f₀" : "f₋₃dB", targetF, "Hz", group);
  out.result("f_ideal", kind === "bandpass" ? "Achieved centre frequency (ideal op-amp)" : "Achieved −3 dB frequency (ideal op-amp)", kind === "bandpass" ? "f₀,id" : "f₋₃dB,id", f3Ideal, "Hz", group);
  out.result("f_real", kind === "bandpass" ? "Achieved peak frequency (finite GBW)" : "Achieved −3 dB frequency (finite GBW)", kind === "bandpass" ? "f₀,real" : "f₋₃dB,real", f3Real, "Hz", group);
  out.result("f_dev_ideal", "Frequency deviation from target (ideal op-amp)", "Δf/f", (f3Ideal / targetF - 1) * 100, "%", group);
  out.result("f_dev_real", "Frequency deviation from target (finite GBW)", "Δf/f", (f3Real / targetF - 1) * 100, "%", group);
  out.result("gain_target", "Target passband gain", "G", design.targetGain, "V/V", group);
  out.result("gain_ideal", "Achieved passband gain (ideal op-amp)", "G_id", overallGain, "V/V", group);
  out.result("gain_real_db", "Achieved passband gain magnitude (finite GBW)", "|G|real", db(refReal), "dB", group);
  if (cascade?.response === "chebyshev") {
    const edge = rippleEdgeFrequency(design, cascade.rippleDb ?? 1);
    out.result("ripple_edge_target", "Target ripple-band edge", "f_r", design.targetRippleEdge, "Hz", group);
    out.result("ripple_edge", "Achieved ripple-band edge (ideal op-amp)", "f_r,id", edge, "Hz", group);
  }

  // ---- checks: design feasibility --------------------------------------------------------------
  if (design.gainNote) out.check(makeCheck("gain.realise", "fail", "Passband gain cannot be set", design.gainNote, -1));
  for (const s of design.sections) for (const is of s.issues) out.check(makeCheck(`section${s.index}.${is.id}`, is.severity, `Section ${s.index} cannot be realised as asked`, is.message, -1));
  for (const s of design.sections) {
    const v = (name: string) => design.values[s.offset + s.variant.parts.findIndex((p) => p.name === name)];
    const q = s.target.q;
    if (s.variant.topology === "sk-unity" && s.variant.kind === "lowpass") {
      const ratio = v("C1") / v("C2");
      const need = 4 * q * q;
      out.check(
        checkAtLeast(`section${s.index}.sk-ratio`, `Section ${s.index} capacitor ratio`, ratio, need, {
          pass: `The feedback capacitor ${s.refs[2]} is ${ratio.toPrecision(4)} times the grounded capacitor ${s.refs[3]}; a unity-gain Sallen-Key low-pass needs at least 4Q² = ${need.toPrecision(4)} to realise Q = ${q.toPrecision(4)} (Carter & Mancini, Op Amps for Everyone, 5th ed., ch. 16, where the feedback capacitor is named C2; value from memory).`,
          fail: `The feedback capacitor ${s.refs[2]} is only ${ratio.toPrecision(4)} times ${s.refs[3]}; a unity-gain Sallen-Key low-pass needs C_feedback/C_ground ≥ 4Q² = ${need.toPrecision(4)} for Q = ${q.toPrecision(4)} (Carter & Mancini, 5th ed., ch. 16, there named C2/C1). Choose a larger feedback capacitor or the equal-component or multiple-feedback topology.`,
        }),
      );
      if (ratio > 100) out.check(makeCheck(`section${s.index}.sk-spread`, "warning", `Section ${s.index} capacitor spread`, `The capacitor ratio ${ratio.toPrecision(3)} is large (Q = ${q.toPrecision(3)}); such a spread is hard to buy in one dielectric and makes Q sensitive to the capacitor tolerance. Consider the multiple-feedback or equal-component topology for this section (common practice, no source).`));
    }
    if (s.variant.topology === "mfb" && s.variant.kind === "lowpass") {
      const h = Math.abs(s.target.gain);
      const ratio = v("C1") / v("C2");
      const need = 4 * q * q * (1 + h);
      out.check(
        checkAtLeast(`section${s.index}.mfb-ratio`, `Section ${s.index} capacitor ratio`, ratio, need, {
          pass: `The grounded capacitor ${s.refs[3]} is ${ratio.toPrecision(4)} times the feedback capacitor ${s.refs[4]}; a multiple-feedback low-pass needs at least 4Q²(1 + |G|) = ${need.toPrecision(4)}.`,
          fail: `The capacitor ratio ${ratio.toPrecision(4)} is below 4Q²(1 + |G|) = ${need.toPrecision(4)}; the section cannot reach Q = ${q.toPrecision(4)}. Increase the grounded capacitor ${s.refs[3]}.`,
        }),
      );
    }
    if (s.variant.topology === "sk-equal") {
      const k = s.achieved.gain;
      if (k > 2.5) out.check(makeCheck(`section${s.index}.sk-sensitivity`, "warning", `Section ${s.index} Q sensitivity`, `The equal-component Sallen-Key section runs at K = ${k.toPrecision(4)}, close to 3 where it oscillates; Q = 1/(3 − K) then depends strongly on the Rb/Ra ratio. Use 0.1 % resistors for Ra/Rb or another topology (common practice, no source).`, (3 - k) / 3));
    }
  }
  for (const c of design.components) {
    if (c.kind === "resistor" && (c.value < RESISTOR_RANGE.min || c.value > RESISTOR_RANGE.max)) {
      out.check(
        makeCheck(
          `range.${c.ref}`,
          "warning",
          `${c.ref} outside the usual resistor range`,
          `${c.ref} (${c.role}) is ${fmt(c.value, "Ω")}, outside 100 Ω … 1 MΩ (common practice, no source): below it the op-amp must drive a heavy load; above it bias currents, noise and stray capacitance matter. Change the resistor level (now ${fmt(input.resistorLevel, "Ω")}).`,
          c.value < RESISTOR_RANGE.min ? margin(c.value, RESISTOR_RANGE.min, "atLeast") : margin(c.value, RESISTOR_RANGE.max, "atMost"),
        ),
      );
    }
    if (c.kind === "capacitor" && c.value < CAPACITOR_MIN) {
      out.check(makeCheck(`range.${c.ref}`, "warning", `${c.ref} is small`, `${c.ref} (${c.role}) is ${fmt(c.value, "F")}, below 100 pF, comparable to stray and op-amp input capacitance (common practice, no source). Lower the resistor level to raise the capacitors.`, margin(c.value, CAPACITOR_MIN, "atLeast")));
    }
  }

  // ---- checks: op-amp -------------------------------------------------------------------------
  const supply = input.supplyPos - input.supplyNeg;
  out.check(
    supply < part.supplyMin || supply > part.supplyMax
      ? makeCheck("supply.range", "fail", "Supply within the part's range", `The total supply ${fmt(supply, "V")} is outside ${part.name}'s range ${fmt(part.supplyMin, "V")} … ${fmt(part.supplyMax, "V")}; choose another part or supply.`, supply < part.supplyMin ? margin(supply, part.supplyMin, "atLeast") : margin(supply, part.supplyMax, "atMost"))
      : makeCheck("supply.range", "pass", "Supply within the part's range", `The total supply ${fmt(supply, "V")} is within ${part.name}'s range ${fmt(part.supplyMin, "V")} … ${fmt(part.supplyMax, "V")}.`, Math.min(margin(supply, part.supplyMin, "atLeast"), margin(supply, part.supplyMax, "atMost"))),
  );
  design.sections.forEach((s, i) => {
    const need = gbwNeeded[i];
    const c = checkAtLeast(`gbw.section${s.index}`, `Section ${s.index} gain-bandwidth`, part.gbw, need, {
      pass: `${part.name} has GBW ${fmt(part.gbw, "Hz")}, at least the ${fmt(need, "Hz")} section ${s.index} needs (${s.variant.topology === "mfb-bp" ? "loop gain ≥ 10 at f₀ with noise gain 1 + 2Q²" : "rule GBW ≥ 100·Gₙ·Q·f₀"}).`,
      fail: `${part.name} has GBW ${fmt(part.gbw, "Hz")}, below the ${fmt(need, "Hz")} section ${s.index} needs (${s.variant.topology === "mfb-bp" ? "loop gain ≥ 10 at f₀" : "rule GBW ≥ 100·Gₙ·Q·f₀, common practice"}); the finite-GBW response below shows the effect. Choose a faster op-amp or lower the section's Q or gain.`,
    });
    // far below the rule (less than a tenth): fail; otherwise below the rule: warning
    if (c.severity === "fail" && part.gbw >= need / 10) out.check({ ...c, severity: "warning" });
    else out.check(c);
  });
  if (bp) {
    const s = design.sections[0];
    const a0 = 10 ** (part.aolDb / 20);
    const fp = part.gbw / a0;
    const aolF0 = a0 / Math.hypot(1, s.achieved.f0 / fp);
    const need = 10 * (1 + 2 * s.achieved.q ** 2);
    out.result("aol_f0", "Op-amp open-loop gain at f₀", "A_OL(f₀)", aolF0, "V/V", "Band-pass");
    out.check(
      checkAtLeast("bandpass.aol", "Open-loop gain at the centre frequency", aolF0, need, {
        pass: `The op-amp's open-loop gain at f₀ is ${aolF0.toPrecision(4)} V/V, at least 10·(1 + 2Q²) = ${need.toPrecision(4)} V/V (loop gain ≥ 20 dB at f₀; common practice margin).`,
        fail: `The op-amp's open-loop gain at f₀ is only ${aolF0.toPrecision(4)} V/V, below 10·(1 + 2Q²) = ${need.toPrecision(4)} V/V: centre frequency, Q and gain will shift (see the finite-GBW response). Choose a faster op-amp or a lower Q.`,
      }),
    );
    if (bp.q > 20) out.check(makeCheck("bandpass.q", "warning", "Q of a multiple-feedback band-pass section", `Q = ${bp.q} is above about 20, where a single multiple-feedback section becomes very sensitive to component values and op-amp gain (common practice, no source); consider a state-variable or cascaded design.`, margin(bp.q, 20, "atMost")));
  }

  // ---- response sweep -------------------------------------------------------------------------
  const fLo = Math.min(targetF, input.stopbandFreq, cascade?.passbandFreq ?? targetF) / 10;
  const fHi = Math.max(targetF, input.stopbandFreq, cascade?.passbandFreq ?? targetF) * 10;
  const freqs = logSweep(fLo, fHi, 401);
  const swId = sweepResponse(design, freqs, ideal);
  const swReal = sweepResponse(design, freqs, real);
  const plotLine = (id: string, title: string, y: { label: string; unit: string }, a: number[], b: number[], extra: LinePlot["series"] = []): LinePlot => ({
    kind: "line",
    id,
    title,
    x: { label: "Frequency", unit: "Hz", scale: "log" },
    y: { ...y, scale: "linear" },
    series: [
      { name: "Ideal op-amp", role: "ideal", x: freqs, y: a },
      { name: `${part.name} (GBW ${fmt(part.gbw, "Hz")})`, role: "real", x: freqs, y: b },
      ...extra,
    ],
  });
  const refDb = db(kind === "bandpass" ? refReal : Math.abs(design.targetGain));
  out.plots.push(
    plotLine("bode.magnitude", "Magnitude response", { label: "Gain", unit: "dB" }, swId.db, swReal.db, [
      { name: `Stopband limit (${input.stopbandAttenMin} dB below the passband)`, role: "limit", x: [input.stopbandFreq, kind === "lowpass" ? fHi : kind === "highpass" ? fLo : input.stopbandFreq], y: [refDb - input.stopbandAttenMin, refDb - input.stopbandAttenMin] },
    ]),
    plotLine("bode.phase", "Phase response", { label: "Phase", unit: "°" }, swId.phase, swReal.phase),
    plotLine("group-delay", "Group delay", { label: "Group delay", unit: "s" }, swId.delay, swReal.delay),
  );

  // ---- specification checks (finite-GBW response) ---------------------------------------------
  const fTol = input.frequencyTolerance;
  const fDev = Math.abs(f3Real / targetF - 1);
  if (!Number.isFinite(f3Real)) {
    out.check(makeCheck("spec.frequency", "fail", kind === "bandpass" ? "Centre frequency" : "−3 dB frequency", `With ${part.name} (GBW ${fmt(part.gbw, "Hz")}) the response has no ${kind === "bandpass" ? "peak" : "−3 dB point"} near the target ${fmt(targetF, "Hz", 5)} (ideal op-amp: ${fmt(f3Ideal, "Hz", 5)}): the op-amp is far too slow for this design. Choose a part with a much higher GBW.`, -1));
  } else out.check(
    checkAtMost("spec.frequency", kind === "bandpass" ? "Centre frequency" : "−3 dB frequency", fDev, fTol, {
      pass: `With ${part.name} and the chosen values the ${kind === "bandpass" ? "peak" : "−3 dB"} frequency is ${fmt(f3Real, "Hz", 5)}, ${pct(f3Real / targetF - 1, 2)} from the target ${fmt(targetF, "Hz", 5)} (allowed ±${pct(fTol, 1)}); with an ideal op-amp it is ${fmt(f3Ideal, "Hz", 5)}.`,
      fail: `With ${part.name} the ${kind === "bandpass" ? "peak" : "−3 dB"} frequency is ${fmt(f3Real, "Hz", 5)}, ${pct(f3Real / targetF - 1, 2)} from the target ${fmt(targetF, "Hz", 5)}, outside ±${pct(fTol, 1)} (ideal op-amp: ${fmt(f3Ideal, "Hz", 5)}). ${Math.abs(f3Ideal / targetF - 1) > fTol ? "Use a denser resistor series or trim the section resistors." : "The op-amp's GBW causes the shift: choose a faster part."}`,
    }),
  );
  const wantGain = kind === "bandpass" ? bp!.gain : cascade!.fixGain ? (cascade!.gain ?? 1) : Math.abs(overallGain);
  const gainErrDb = Math.abs(db(refReal) - db(wantGain));
  out.check(
    checkAtMost("spec.gain", kind === "bandpass" ? "Centre gain" : "Passband gain", gainErrDb, input.gainToleranceDb, {
      pass: `The ${kind === "bandpass" ? "centre" : "passband"} gain with ${part.name} is ${db(refReal).toFixed(3)} dB (${refReal.toPrecision(5)} V/V), within ±${input.gainToleranceDb} dB of ${db(wantGain).toFixed(3)} dB.`,
      fail: `The ${kind === "bandpass" ? "centre" : "passband"} gain with ${part.name} is ${db(refReal).toFixed(3)} dB (${refReal.toPrecision(5)} V/V), ${gainErrDb.toFixed(3)} dB from ${db(wantGain).toFixed(3)} dB (allowed ±${input.gainToleranceDb} dB). ${design.gainNote ? "The topology cannot set this gain (see above)." : Math.abs(db(kind === "bandpass" ? Math.abs(design.sections[0].achieved.gain) : Math.abs(overallGain)) - db(wantGain)) <= input.gainToleranceDb ? `With an ideal op-amp the chosen values give ${db(Math.abs(kind === "bandpass" ? design.sections[0].achieved.gain : overallGain)).toFixed(3)} dB, so the shortfall comes from the op-amp's GBW: choose a faster part.` : kind === "highpass" && cascade?.topology === "mfb" ? "Multiple-feedback high-pass sections set their gain by the capacitor ratio C1/C3, which a coarse capacitor series cannot match: choose E24 capacitors, or keep these sections at unity gain and take the gain in an inverting first-order stage." : "Use a denser resistor series for the gain-setting resistors or a faster op-amp."}`,
    }),
  );
  const magAtStop = magReal(input.stopbandFreq);
  const atten = db(refReal) - db(magAtStop);
  out.result("stopband_atten", `Attenuation at ${fmt(input.stopbandFreq, "Hz")} (finite GBW)`, "A(f_s)", atten, "dB", group);
  out.check(
    checkAtLeast("spec.stopband", "Stopband attenuation", atten, input.stopbandAttenMin, {
      pass: `At ${fmt(input.stopbandFreq, "Hz")} the response is ${atten.toFixed(2)} dB below the ${kind === "bandpass" ? "centre" : "passband"} gain (at least ${input.stopbandAttenMin} dB asked).`,
      fail: `At ${fmt(input.stopbandFreq, "Hz")} the response is only ${atten.toFixed(2)} dB below the ${kind === "bandpass" ? "centre" : "passband"} gain; ${input.stopbandAttenMin} dB are asked. Raise the order${kind === "bandpass" ? " or Q" : ", use a steeper response"} or move the stopband frequency.`,
    }),
  );
  if (cascade) {
    const fp = cascade.passbandFreq;
    const band = kind === "lowpass" ? logSweep(fp / 1000, fp, 301) : logSweep(fp, fp * 20, 301);
    let lo = Infinity, hi = -Infinity;
    for (const f of band) {
      const m = db(magReal(f));
      lo = Math.min(lo, m);
      hi = Math.max(hi, m);
    }
    const ripple = hi - lo;
    out.result("passband_variation", "Passband variation up to the passband edge (finite GBW)", "A_p", ripple, "dB", group);
    out.check(
      checkAtMost("spec.ripple", "Passband variation", ripple, cascade.passbandRippleMax, {
        pass: `Between ${fmt(band[0], "Hz")} and ${fmt(band[band.length - 1], "Hz")} the gain varies by ${ripple.toFixed(3)} dB peak to valley (at most ${cascade.passbandRippleMax} dB asked).`,
        fail: `Between ${fmt(band[0], "Hz")} and ${fmt(band[band.length - 1], "Hz")} the gain varies by ${ripple.toFixed(3)} dB peak to valley, more than the ${cascade.passbandRippleMax} dB asked. Move the passband edge away from the cutoff, choose a response with less ripple, or raise the cutoff.`,
      }),
    );
  }

  // ---- output swing -----------------------------------------------------------------------------
  const mid = (input.supplyPos + input.supplyNeg) / 2;
  const outMax = input.supplyPos - part.swingPos;
  const outMin = input.supplyNeg + part.swingNeg;
  const avail = Math.min(outMax - mid, mid - outMin);
  let worstPeak = 0, worstSection = 1;
  swReal.perSection.forEach((series, k) => {
    const peak = Math.max(...series) * input.inputAmplitude;
    if (peak > worstPeak) { worstPeak = peak; worstSection = k + 1; }
  });
  out.result("swing_peak", "Largest section output (peak, over frequency)", "V_out,pk", worstPeak, "V", "Output swing");
  out.result("swing_available", "Available output swing about mid-supply (peak)", "V_sw,pk", Math.max(0, avail), "V", "Output swing");
  out.check(
    checkAtMost("swing", "Output swing at the rails", worstPeak, Math.max(avail, 0), {
      pass: `The largest section output, ${fmt(worstPeak, "V")} peak at section ${worstSection} (${fmt(input.inputAmplitude, "V")} peak input, including any peaking), fits in the ${fmt(Math.max(avail, 0), "V")} peak ${part.name} can swing about mid-supply ${fmt(mid, "V")} (headroom ${fmt(part.swingNeg, "V")} / ${fmt(part.swingPos, "V")} from the rails at ${fmt(part.swingLoad, "Ω")}).`,
      fail: `Section ${worstSection} must swing ${fmt(worstPeak, "V")} peak about ${fmt(mid, "V")} but ${part.name} reaches only ${fmt(Math.max(avail, 0), "V")} peak on ${fmt(input.supplyNeg, "V")} … ${fmt(input.supplyPos, "V")} (headroom ${fmt(part.swingNeg, "V")} / ${fmt(part.swingPos, "V")}). Lower the input amplitude or the gain, move gain to the last section, or raise the supply.`,
    }),
  );
  out.plots.push({
    kind: "levels",
    id: "swing",
    title: "Output swing against the rails",
    unit: "V",
    levels: [
      { label: "V+", value: input.supplyPos, role: "rail" },
      { label: "V−", value: input.supplyNeg, role: "rail" },
      { label: "mid-supply", value: mid, role: "bias" },
    ],
    bands: [
      { label: `${part.name} output range`, from: outMin, to: outMax, role: "allowed" },
      { label: `Section ${worstSection} peak signal`, from: mid - worstPeak, to: mid + worstPeak, role: "required" },
    ],
  });

  // ---- tolerance analysis -------------------------------------------------------------------------
  const mc = monteCarlo(design, { trials: input.mcTrials, seed: input.mcSeed, distribution: input.mcDistribution });
  const wc = worstCase(design);
  const tg = "Tolerance analysis";
  const fLabel = kind === "bandpass" ? "centre frequency" : "−3 dB frequency";
  out.result("mc_f_mean", `Monte Carlo mean ${fLabel}`, "μ(f)", mc.frequency.mean, "Hz", tg);
  out.result("mc_f_std", `Monte Carlo standard deviation of the ${fLabel}`, "σ(f)", mc.frequency.std, "Hz", tg);
  out.result("mc_f_p_lo", `${fLabel} 0.135 % percentile`, "f(0.135 %)", mc.frequency.percentiles[0].value, "Hz", tg);
  out.result("mc_f_p_hi", `${fLabel} 99.865 % percentile`, "f(99.865 %)", mc.frequency.percentiles[4].value, "Hz", tg);
  out.result("mc_gain_mean", "Monte Carlo mean passband gain magnitude", "μ(|G|)", mc.gain.mean, "V/V", tg);
  out.result("mc_gain_std", "Monte Carlo standard deviation of the gain", "σ(|G|)", mc.gain.std, "V/V", tg);
  out.result("wc_f_min", `Worst-case lowest ${fLabel}`, "f_min", wc.frequency.min, "Hz", tg);
  out.result("wc_f_max", `Worst-case highest ${fLabel}`, "f_max", wc.frequency.max, "Hz", tg);
  out.result("wc_gain_min", "Worst-case lowest gain magnitude", "|G|min", wc.gain.min, "V/V", tg);
  out.result("wc_gain_max", "Worst-case highest gain magnitude", "|G|max", wc.gain.max, "V/V", tg);
  const spreadHi = Math.max(Math.abs(mc.frequency.percentiles[4].value / targetF - 1), Math.abs(mc.frequency.percentiles[0].value / targetF - 1));
  out.check(
    checkAtMost("tolerance.frequency", `Spread of the ${fLabel}`, spreadHi, fTol, {
      pass: `99.73 % of the Monte Carlo trials (${mc.trials.toLocaleString("en-GB")}, ${mc.distribution}) lie within ${pct(spreadHi, 2)} of the target ${fLabel} (allowed ±${pct(fTol, 1)}); worst case ${fmt(wc.frequency.min, "Hz", 5)} … ${fmt(wc.frequency.max, "Hz", 5)}.`,
      fail: `The Monte Carlo ${fLabel} spreads to ${pct(spreadHi, 2)} from the target at the 0.135 %/99.865 % percentiles, beyond ±${pct(fTol, 1)}; worst case ${fmt(wc.frequency.min, "Hz", 5)} … ${fmt(wc.frequency.max, "Hz", 5)}. Use tighter capacitors (now ±${pct(input.capTolerance, 1)}) or resistors (±${pct(input.resTolerance, 1)}).`,
    }),
  );
  if (mc.rejected > 0 || wc.unstableCorners > 0)
    out.check(makeCheck("tolerance.stability", "fail", "Stability over tolerance", `${mc.rejected} of ${mc.trials} Monte Carlo trials and ${wc.unstableCorners} worst-case corners give an unstable or degenerate response (a section's damping changes sign). Use another topology for the high-Q sections or tighter parts.`, -mc.rejected / mc.trials));
  out.plots.push(histogramPlot("mc.frequency", `Monte Carlo: ${fLabel}`, kind === "bandpass" ? "Centre frequency" : "−3 dB frequency", "Hz", mc.frequency, targetF));
  // A gain set by no toleranced part (unity-gain followers) has no spread: say so instead of
  // drawing a histogram one bin wide.
  const gainSpread = mc.gain.max - mc.gain.min;
  if (gainSpread > 1e-9 * Math.max(Math.abs(mc.gain.mean), 1e-30)) {
    out.plots.push(histogramPlot("mc.gain", "Monte Carlo: passband gain magnitude", kind === "bandpass" ? "Centre gain" : "Passband gain", "V/V", mc.gain, Math.abs(design.targetGain)));
  } else {
    out.assumptions.push(`The passband gain does not depend on any toleranced component in this design (every trial gives ${fmt(mc.gain.mean, "V/V", 6)}), so no gain histogram is drawn.`);
  }

  // ---- tables --------------------------------------------------------------------------------------
  const sectionTable: ResultTable = {
    id: "sections",
    title: "Sections",
    columns: [
      { key: "section", label: "Section" },
      { key: "topology", label: "Topology" },
      { key: "f0", label: "f₀ target", align: "right" },
      { key: "q", label: "Q target", align: "right" },
      { key: "gain", label: "Gain target", align: "right" },
      { key: "parts", label: "Components" },
      { key: "f0a", label: "f₀ achieved", align: "right" },
      { key: "qa", label: "Q achieved", align: "right" },
      { key: "gaina", label: "Gain achieved", align: "right" },
      { key: "gbw", label: "GBW needed", align: "right" },
    ],
    rows: design.sections.map((s, i) => ({
      section: String(s.index),
      topology: `${TOPOLOGY_LABELS[s.variant.topology]} (${s.variant.order === 1 ? "1st" : "2nd"} order)`,
      f0: fmt(s.target.f0, "Hz", 5),
      q: s.variant.order === 2 ? s.target.q.toFixed(4) : "—",
      gain: s.target.gain.toPrecision(4),
      parts: s.refs.map((r, j) => `${r} ${fmt(design.values[s.offset + j], s.variant.parts[j].kind === "resistor" ? "Ω" : "F", 3)}`).join(", ") + `, ${s.opampRef}`,
      f0a: `${fmt(s.achieved.f0, "Hz", 5)} (${pct(s.achieved.f0 / s.target.f0 - 1, 2)})`,
      qa: s.variant.order === 2 ? `${s.achieved.q.toFixed(4)} (${pct(s.achieved.q / s.target.q - 1, 2)})` : "—",
      gaina: s.achieved.gain.toPrecision(4),
      gbw: fmt(gbwNeeded[i], "Hz", 3),
    })),
  };
  const tolTable: ResultTable = {
    id: "tolerance.sections",
    title: `Section spread (Monte Carlo ${mc.trials.toLocaleString("en-GB")} trials, seed ${mc.seed}, ${mc.distribution}; worst case by corners)`,
    columns: [
      { key: "section", label: "Section" },
      { key: "f0", label: "f₀ mean ± σ", align: "right" },
      { key: "f0p", label: "f₀ 0.135 … 99.865 %", align: "right" },
      { key: "f0wc", label: "f₀ worst case", align: "right" },
      { key: "q", label: "Q mean ± σ", align: "right" },
      { key: "qp", label: "Q 0.135 … 99.865 %", align: "right" },
      { key: "qwc", label: "Q worst case", align: "right" },
    ],
    rows: design.sections.map((s, i) => ({
      section: String(s.index),
      f0: `${fmt(mc.sections[i].f0.mean, "Hz", 5)} ± ${fmt(mc.sections[i].f0.std, "Hz", 3)}`,
      f0p: `${fmt(mc.sections[i].f0.percentiles[0].value, "Hz", 5)} … ${fmt(mc.sections[i].f0.percentiles[4].value, "Hz", 5)}`,
      f0wc: `${fmt(wc.sections[i].f0.min, "Hz", 5)} … ${fmt(wc.sections[i].f0.max, "Hz", 5)}`,
      qp: s.variant.order === 2 ? `${mc.sections[i].q.percentiles[0].value.toFixed(4)} … ${mc.sections[i].q.percentiles[4].value.toFixed(4)}` : "—",
      q: s.variant.order === 2 ? `${mc.sections[i].q.mean.toFixed(4)} ± ${mc.sections[i].q.std.toFixed(4)}` : "—",
      qwc: s.variant.order === 2 ? `${wc.sections[i].q.min.toFixed(4)} … ${wc.sections[i].q.max.toFixed(4)}` : "—",
    })),
  };
  out.tables.push(sectionTable, tolTable);
  if (design.prototype) {
    out.tables.push({
      id: "prototype",
      title: `Normalised prototype (${design.prototype.normalisation === "ripple-edge" ? "ripple-band edge" : "−3 dB"} at 1 rad/s), coefficients of 1/(1 + a·s + b·s²)`,
      columns: [
        { key: "section", label: "Section" },
        { key: "a", label: "a", align: "right" },
        { key: "b", label: "b", align: "right" },
        { key: "w0", label: "ω₀ (normalised)", align: "right" },
        { key: "q", label: "Q", align: "right" },
      ],
      rows: design.prototype.sections.map((ps, i) => {
        const { a, b } = sectionCoefficientsAB(ps);
        return { section: String(i + 1), a: a.toFixed(5), b: b.toFixed(5), w0: ps.w0.toFixed(5), q: ps.order === 2 ? ps.q.toFixed(5) : "—" };
      }),
    });
  }

  // ---- components --------------------------------------------------------------------------------
  const comps: Component[] = design.components.map((c) => ({
    ref: c.ref,
    kind: c.kind,
    value: c.value,
    display: fmt(c.value, c.kind === "resistor" ? "Ω" : "F", 3),
    series: c.series,
    tolerance: c.tolerance,
    role: c.role,
  }));
  for (const s of design.sections) comps.push({ ref: s.opampRef, kind: "opamp", value: 0, display: part.name, role: `Op-amp, section ${s.index}` });
  out.components.push(...comps);

  // ---- assumptions ---------------------------------------------------------------------------------
  const a = out.assumptions;
  if (cascade) {
    a.push(
      cascade.response === "chebyshev"
        ? `Chebyshev normalisation: the cutoff ${fmt(cascade.cutoff, "Hz")} is the ${cascade.cutoffMeaning === "ripple-edge" ? "ripple-band edge (where the response leaves the ripple band)" : "−3 dB frequency"}; −3 dB is taken relative to the ${kind === "lowpass" ? "DC" : "high-frequency"} gain, which for even orders lies at the bottom of the ripple band (the normalisation of the tables in Carter & Mancini, Op Amps for Everyone, 5th ed., ch. 16). Published tables differ here.`
        : `The cutoff ${fmt(cascade.cutoff, "Hz")} is the −3 dB frequency relative to the ${kind === "lowpass" ? "DC" : "high-frequency"} gain.`,
      "Prototype poles are computed: Butterworth and Chebyshev from their closed forms, Bessel from the roots of the reverse Bessel polynomial scaled numerically to −3 dB at the cutoff.",
      "Sections are cascaded with the first-order section (odd orders) first and the second-order sections in order of rising Q (common practice: the high-Q sections see a band-limited signal and clip last).",
      kind === "lowpass"
        ? "Passband gain is the DC gain; with the finite-GBW model it is taken at f_c/10,000, and the −3 dB point is relative to it."
        : "Passband gain is the high-frequency gain; with the finite-GBW model it is reported at 10·f_c (the op-amp's bandwidth eventually closes a high-pass passband), and the −3 dB point is taken relative to the ideal high-frequency gain of the chosen values.",
    );
  } else {
    a.push("The band-pass is one multiple-feedback section with equal capacitors; its gain is the gain at the centre frequency, which needs |G₀| < 2Q².");
  }
  a.push(
    "Capacitors are picked first from their series, then resistors are computed from the design equations and snapped to the nearest value of their series; all achieved figures use the snapped values.",
    "The op-amp model is ideal or single-pole, A(s) = A₀/(1 + s/ωp) with ωp = 2π·GBW/A₀ and zero output resistance; slew rate, input capacitance and output resistance are not modelled.",
    "Sections are driven by the previous op-amp's output (zero source impedance) and the filter input by an ideal source.",
    "On a single supply the non-inverting inputs and the signal are referenced to a mid-supply bias, treated as AC ground; the signal is centred at mid-supply for the swing check, and the part's swing headroom applies at its stated load.",
    "GBW needed per section: GBW ≥ 100·Gₙ·Q·f₀ for second-order and 100·Gₙ·f₀ for first-order sections (rule of thumb, common practice, no source); for the band-pass, loop gain ≥ 10 at f₀ (noise gain 1 + 2Q²). Below the rule a check warns; below a tenth of it, it fails.",
    `Tolerance analysis uses the ideal op-amp and independent part variations: ${input.mcDistribution === "uniform" ? "uniform within ± tolerance" : "normal with σ = tolerance/3 (tolerance = 3σ, common practice), not truncated"}; random numbers from xoshiro128** seeded by SplitMix32 (seed ${input.mcSeed}).`,
    `Worst case: every corner of each section's parts for f₀ and Q; for the overall frequency and gain ${wc.method === "corners" ? "every corner of all parts" : `the two sensitivity-directed corners (the design has more than ${MAX_CORNER_PARTS} parts, too many for all 2ⁿ corners), exact for monotonic dependence`}.`,
    ...(cascade?.response === "chebyshev"
      ? ["With a ripple response the −3 dB frequency can jump to a lower value when a ripple valley sags below −3 dB under tolerance; the Monte Carlo shows this, the sensitivity corners may not."]
      : []),
    ...(cascade
      ? [`Passband variation is measured peak to valley on the finite-GBW response from ${kind === "lowpass" ? "f_p/1,000 to f_p" : "f_p to 20·f_p"}; stopband attenuation is taken relative to the passband gain.`]
      : ["Stopband attenuation is taken relative to the centre gain."]),
    "Resistors outside 100 Ω … 1 MΩ and capacitors below 100 pF are flagged (common practice, no source).",
  );
  return out.build();
}

/** The netlist of one of the filter types, with the ideal or the part's single-pole model. */
export function filterTypeNetlist(kind: "lowpass" | "highpass" | "bandpass", input: CascadeInput | BandpassInput, model: "ideal" | "single-pole"): string {
  const design = designFromInput(kind, input);
  return filterNetlist(design, model === "ideal" ? { kind: "ideal" } : { ...partModel(input.opamp), name: input.opamp.name });
}
