/**
 * Filter design: prototype → sections → component values picked from preferred series.
 *
 * Method, per section (all values SI: Ω, F, Hz, rad/s):
 * 1. Capacitors are picked first from the capacitor series, sized from the resistor level
 *    R_L (C ≈ 1/(ω₀·R_L), adjusted per topology so the resistors land near R_L).
 * 2. Resistors follow exactly from the design equations with the chosen capacitors, then are
 *    snapped to the nearest value of the resistor series.
 * 3. The achieved f₀, Q and gain follow from the snapped values (see topology.ts).
 *
 * Design equations (derived from the ideal transfer functions in topology.ts; they agree with
 * Carter & Mancini, Op Amps for Everyone, 5th ed., ch. 16):
 * - unity-gain Sallen-Key low-pass: C1/C2 ≥ 4Q² (C1 = feedback capacitor), R1 + R2 = 1/(ω₀·Q·C2),
 *   R1·R2 = 1/(ω₀²·C1·C2).
 * - equal-component Sallen-Key: R = 1/(ω₀·C), K = 3 − 1/Q = 1 + Rb/Ra.
 * - multiple-feedback low-pass, gain H: C1/C2 ≥ 4Q²(1 + H), R2 + R3(1 + H) = 1/(ω₀·Q·C2),
 *   R2·R3 = 1/(ω₀²·C1·C2), R1 = R2/H.
 * - unity-gain Sallen-Key high-pass (equal capacitors): R1 = 1/(2Q·ω₀·C), R2 = 2Q/(ω₀·C).
 * - multiple-feedback high-pass (C1 = C2, C1/C3 = H from the best series pair): R1 = 1/(ω₀·Q·(C1+C2+C3)),
 *   R2 = Q·(C1+C2+C3)/(ω₀·C2·C3).
 * - multiple-feedback band-pass (C1 = C2 = C, centre gain H < 2Q²): R3 = 2Q/(ω₀·C),
 *   R1 = Q/(H·ω₀·C), R2 = Q/(ω₀·C·(2Q² − H)).
 */
import { designPrototype, type ChebyshevRippleDb, type CutoffNormalisation, type Prototype, type ResponseFamily } from "./prototype";
import {
  sectionFigures,
  sectionVariant,
  type FilterKind,
  type FirstOrderTopology,
  type SecondOrderTopology,
  type SectionFigures,
  type SectionTopology,
  type SectionVariant,
} from "./topology";
import type { Circuit, CircuitElement } from "./circuit";

/** Picks preferred values. All values in SI base units (F, Ω). */
export interface ValuePicker {
  /** Capacitor series name, e.g. "E12". */
  capSeries: string;
  /** Resistor series name, e.g. "E24". */
  resSeries: string;
  /** Nearest capacitor of the series, F. */
  capNearest(x: number): number;
  /** Smallest capacitor of the series that is ≥ x, F. */
  capAtLeast(x: number): number;
  /** Nearest resistor of the series, Ω. */
  resNearest(x: number): number;
  /**
   * Optional: a pair (a, b) of resistor-series values with a/b closest to `ratio`, with b close
   * to `near` (Ω). Used for gain-setting pairs; falls back to snapping each value.
   */
  resRatioPair?(ratio: number, near: number): { a: number; b: number };
  /** Optional: a pair (a, b) of capacitor-series values with a/b closest to `ratio`, b near `near` (F). */
  capRatioPair?(ratio: number, near: number): { a: number; b: number };
}

/** How the passband gain is shared among the sections that can take gain. */
export type GainSharing = "equal" | "first" | "last";

/** Low-pass or high-pass specification. */
export interface CascadeSpec {
  kind: "lowpass" | "highpass";
  family: ResponseFamily;
  /** Order 1 … 8. */
  order: number;
  /** Chebyshev ripple, dB. */
  rippleDb?: ChebyshevRippleDb;
  /** Meaning of `cutoff` for Chebyshev: −3 dB (default) or ripple-band edge. */
  normalisation?: CutoffNormalisation;
  /** Cutoff frequency, Hz. */
  cutoff: number;
  topology: SecondOrderTopology;
  firstOrder: FirstOrderTopology;
  /** Overall passband gain magnitude, V/V; null = whatever the topology gives (1 where free). */
  gain: number | null;
  gainSharing: GainSharing;
  /** Resistor level the design aims at, Ω. */
  resistorLevel: number;
  picker: ValuePicker;
  /** Resistor tolerance as a fraction (0.01 = 1 %). */
  resistorTolerance: number;
  /** Capacitor tolerance as a fraction. */
  capacitorTolerance: number;
}

/** Band-pass specification (one multiple-feedback section). */
export interface BandpassSpec {
  kind: "bandpass";
  /** Centre frequency, Hz. */
  centre: number;
  /** Quality factor (centre frequency / −3 dB bandwidth). */
  q: number;
  /** Centre gain magnitude, V/V. */
  gain: number;
  resistorLevel: number;
  picker: ValuePicker;
  resistorTolerance: number;
  capacitorTolerance: number;
}

/** Any filter specification. */
export type FilterSpec = CascadeSpec | BandpassSpec;

/** One component as designed. */
export interface DesignedComponent {
  /** Global reference designator, e.g. "R3". */
  ref: string;
  /** Name within its section, e.g. "C1". */
  local: string;
  kind: "resistor" | "capacitor";
  /** Chosen (series) value, Ω or F. */
  value: number;
  /** Exact value from the design equations before snapping, Ω or F. */
  calculated: number;
  series: string;
  /** Tolerance as a fraction. */
  tolerance: number;
  role: string;
  /** 1-based section number. */
  section: number;
}

/** One designed section. */
export interface DesignedSection {
  /** 1-based. */
  index: number;
  variant: SectionVariant;
  /** Target natural frequency (Hz), Q (0 for first order) and signed gain (V/V). */
  target: SectionFigures;
  /** Achieved with the chosen values. */
  achieved: SectionFigures;
  /** Ideal coefficients with the chosen values [b0, b1, b2, a1, a2]. */
  coefficients: Float64Array;
  /** Index of the section's first part in FilterDesign.values. */
  offset: number;
  /** Global refs of the parts, in variant.parts order. */
  refs: string[];
  opampRef: string;
  /** Design problems found while choosing values (shown as checks). */
  issues: Array<{ id: string; severity: "warning" | "fail"; message: string }>;
}

/** A complete design. */
export interface FilterDesign {
  kind: FilterKind;
  spec: FilterSpec;
  prototype?: Prototype;
  sections: DesignedSection[];
  components: DesignedComponent[];
  /** All chosen values in section order (for fast evaluation and Monte Carlo), Ω and F. */
  values: Float64Array;
  /** Target −3 dB frequency (low/high-pass) or centre frequency (band-pass), Hz. */
  targetFrequency: number;
  /** Chebyshev ripple-band edge, Hz (equals the −3 dB target for other families). */
  targetRippleEdge: number;
  /** Target passband gain, signed, V/V. */
  targetGain: number;
  /** Where gain could not be set as asked (message), else null. */
  gainNote: string | null;
}

const TWO_PI = 2 * Math.PI;

interface SectionPlan {
  kind: FilterKind;
  order: 1 | 2;
  topology: SectionTopology;
  w0: number;
  q: number;
  /** Gain magnitude assigned to the section. */
  gain: number;
}

/** Whether a section topology can take an assigned gain, and which. */
function gainCapability(t: SectionTopology): "fixed" | "atLeastOne" | "any" {
  if (t === "sk-unity" || t === "sk-equal") return "fixed";
  if (t === "rc-buffer") return "atLeastOne";
  return "any";
}

function fixedGain(p: SectionPlan): number {
  if (p.topology === "sk-equal") return 3 - 1 / p.q;
  return 1;
}

/** Share the remaining gain among the flexible sections (see GainSharing). Returns a note when it cannot be met. */
function allocateGain(plans: SectionPlan[], total: number | null, sharing: GainSharing): string | null {
  for (const p of plans) p.gain = gainCapability(p.topology) === "fixed" ? fixedGain(p) : 1;
  if (total === null) return null;
  const fixed = plans.filter((p) => gainCapability(p.topology) === "fixed").reduce((g, p) => g * p.gain, 1);
  const rest = total / fixed;
  const flex = plans.filter((p) => gainCapability(p.topology) !== "fixed");
  const anyGain = flex.filter((p) => gainCapability(p.topology) === "any");
  if (Math.abs(rest - 1) < 1e-12) return null;
  if (flex.length === 0) {
    return `The chosen topology fixes the passband gain at ${fixed.toPrecision(4)} V/V; use multiple-feedback sections or an inverting first-order stage to set ${total.toPrecision(4)} V/V.`;
  }
  if (rest < 1 && anyGain.length === 0) {
    return `A buffered RC section cannot attenuate; the passband gain stays at ${fixed.toPrecision(4)} V/V instead of ${total.toPrecision(4)} V/V. Use an inverting first-order stage or multiple-feedback sections.`;
  }
  const takers = rest < 1 ? anyGain : flex;
  if (sharing === "equal") {
    const each = rest ** (1 / takers.length);
    for (const p of takers) p.gain = each;
  } else {
    const p = sharing === "first" ? takers[0] : takers[takers.length - 1];
    p.gain = rest;
  }
  return null;
}

interface ChosenValues {
  calculated: number[];
  values: number[];
  issues: DesignedSection["issues"];
}

/** Component values of one section from its plan. */
function chooseValues(plan: SectionPlan, rL: number, pk: ValuePicker): ChosenValues {
  const { w0, q } = plan;
  const g = plan.gain;
  const issues: DesignedSection["issues"] = [];
  const rn = (x: number) => pk.resNearest(x);
  const pair = (ratio: number, near: number): { a: number; b: number } => {
    if (pk.resRatioPair) return pk.resRatioPair(ratio, near);
    const b = rn(near);
    return { a: rn(ratio * b), b };
  };
  switch (`${plan.topology}/${plan.kind}`) {
    case "sk-unity/lowpass": {
      const c2 = pk.capNearest(1 / (2 * q * w0 * rL));
      const c1 = pk.capAtLeast(4 * q * q * c2);
      const s = 1 / (w0 * q * c2);
      const p = 1 / (w0 * w0 * c1 * c2);
      const d = Math.sqrt(Math.max(0, s * s - 4 * p));
      const r1 = (s + d) / 2, r2 = (s - d) / 2;
      return { calculated: [r1, r2, c1, c2], values: [rn(r1), rn(r2), c1, c2], issues };
    }
    case "sk-equal/lowpass":
    case "sk-equal/highpass": {
      const c = pk.capNearest(1 / (w0 * rL));
      const r = 1 / (w0 * c);
      let km1 = 2 - 1 / q;
      if (!(km1 > 1e-3)) {
        issues.push({ id: "realise", severity: "fail", message: `An equal-component Sallen-Key section cannot realise Q = ${q.toFixed(3)} (needs Q > 0.5).` });
        km1 = 1e-3;
      }
      const { a: rb, b: ra } = pair(km1, rL);
      return plan.kind === "lowpass"
        ? { calculated: [r, r, c, c, ra, km1 * ra], values: [rn(r), rn(r), c, c, ra, rb], issues }
        : { calculated: [c, c, r, r, ra, km1 * ra], values: [c, c, rn(r), rn(r), ra, rb], issues };
    }
    case "mfb/lowpass": {
      const c2 = pk.capNearest(1 / (2 * q * Math.sqrt(1 + g) * w0 * rL));
      const c1 = pk.capAtLeast(4 * q * q * (1 + g) * c2);
      const s = 1 / (w0 * q * c2);
      const p = 1 / (w0 * w0 * c1 * c2);
      const d = Math.sqrt(Math.max(0, s * s - 4 * (1 + g) * p));
      const r2 = (s + d) / 2;
      const r3 = p / r2;
      const r2c = rn(r2);
      return { calculated: [r2 / g, r2, r3, c1, c2], values: [rn(r2c / g), r2c, rn(r3), c1, c2], issues };
    }
    case "sk-unity/highpass": {
      const c = pk.capNearest(1 / (w0 * rL));
      const r1 = 1 / (2 * q * w0 * c), r2 = (2 * q) / (w0 * c);
      return { calculated: [c, c, r1, r2], values: [c, c, rn(r1), rn(r2)], issues };
    }
    case "mfb/highpass": {
      // high-frequency gain = C1/C3: the best ratio pair of the capacitor series
      const cRef = pk.capNearest(1 / (w0 * rL));
      const pr = pk.capRatioPair ? pk.capRatioPair(g, cRef / Math.sqrt(g)) : { a: cRef, b: pk.capNearest(cRef / g) };
      const c1 = pr.a, c3 = pr.b;
      const c2 = c1;
      const sum = c1 + c2 + c3;
      const r1 = 1 / (w0 * q * sum), r2 = (q * sum) / (w0 * c2 * c3);
      return { calculated: [c1, c2, c1 / g, r1, r2], values: [c1, c2, c3, rn(r1), rn(r2)], issues };
    }
    case "rc-buffer/lowpass":
    case "rc-buffer/highpass": {
      const c = pk.capNearest(1 / (w0 * rL));
      const r = 1 / (w0 * c);
      const base = plan.kind === "lowpass" ? [r, c] : [c, r];
      const chosen = plan.kind === "lowpass" ? [rn(r), c] : [c, rn(r)];
      if (g > 1 + 1e-12) {
        const { a: rb, b: ra } = pair(g - 1, rL);
        return { calculated: [...base, ra, (g - 1) * ra], values: [...chosen, ra, rb], issues };
      }
      return { calculated: base, values: chosen, issues };
    }
    case "inverting/lowpass": {
      const c1 = pk.capNearest(1 / (w0 * rL));
      const r2 = 1 / (w0 * c1);
      const r2c = rn(r2);
      const r1c = rn(r2c / g);
      return { calculated: [r2 / g, r2, c1], values: [r1c, r2c, c1], issues };
    }
    case "inverting/highpass": {
      const c1 = pk.capNearest(1 / (w0 * rL));
      const r1 = 1 / (w0 * c1);
      const r1c = rn(r1);
      return { calculated: [c1, r1, g * r1], values: [c1, r1c, rn(g * r1c)], issues };
    }
    case "mfb-bp/bandpass": {
      const c = pk.capNearest(1 / (w0 * rL));
      let h = g;
      if (!(h < 2 * q * q)) {
        issues.push({
          id: "realise",
          severity: "fail",
          message: `A multiple-feedback band-pass section with equal capacitors needs centre gain below 2Q² = ${(2 * q * q).toPrecision(4)} V/V; it is designed for ${(q * q).toPrecision(4)} V/V instead of ${g.toPrecision(4)} V/V. Lower the gain or raise Q, or add a gain stage.`,
        });
        h = q * q;
      }
      const r3 = (2 * q) / (w0 * c);
      const r1 = q / (h * w0 * c);
      const r2 = q / (w0 * c * (2 * q * q - h));
      return { calculated: [r1, r2, r3, c, c], values: [rn(r1), rn(r2), rn(r3), c, c], issues };
    }
  }
  throw new RangeError(`no design equations for ${plan.topology}/${plan.kind}`);
}

/** Whether a section plan needs the Ra/Rb gain network (rc-buffer with gain above 1). */
function needsGainNetwork(p: SectionPlan): boolean {
  return p.topology === "sk-equal" || (p.topology === "rc-buffer" && p.gain > 1 + 1e-12);
}

/** Section plans (target ω₀, Q, gain) of a cascade spec. */
function planCascade(spec: CascadeSpec): { prototype: Prototype; plans: SectionPlan[]; gainNote: string | null } {
  const prototype = designPrototype({ family: spec.family, order: spec.order, rippleDb: spec.rippleDb, normalisation: spec.normalisation });
  const wc = TWO_PI * spec.cutoff;
  const plans: SectionPlan[] = prototype.sections.map((s) => ({
    kind: spec.kind,
    order: s.order,
    topology: s.order === 1 ? spec.firstOrder : spec.topology,
    w0: spec.kind === "lowpass" ? wc * s.w0 : wc / s.w0,
    q: s.order === 2 ? s.q : 0,
    gain: 1,
  }));
  const gainNote = allocateGain(plans, spec.gain, spec.gainSharing);
  return { prototype, plans, gainNote };
}

/**
 * Design a filter: prototype, sections, component values and achieved figures.
 *
 * @param spec low-/high-pass cascade or band-pass spec (SI units)
 * @returns the design; never throws for valid specs (problems are listed in section issues)
 * @example designFilter({ kind: "lowpass", family: "butterworth", order: 4, cutoff: 1000, … })
 */
export function designFilter(spec: FilterSpec): FilterDesign {
  let plans: SectionPlan[];
  let prototype: Prototype | undefined;
  let gainNote: string | null = null;
  let targetFrequency: number;
  let targetRippleEdge: number;
  if (spec.kind === "bandpass") {
    plans = [{ kind: "bandpass", order: 2, topology: "mfb-bp", w0: TWO_PI * spec.centre, q: spec.q, gain: spec.gain }];
    targetFrequency = spec.centre;
    targetRippleEdge = spec.centre;
  } else {
    const planned = planCascade(spec);
    plans = planned.plans;
    prototype = planned.prototype;
    gainNote = planned.gainNote;
    const k = prototype.rippleEdgeOverMinus3dB; // ripple edge / −3 dB (≤ 1)
    const isEdge = prototype.normalisation === "ripple-edge";
    const minus3 = isEdge ? (spec.kind === "lowpass" ? spec.cutoff / k : spec.cutoff * k) : spec.cutoff;
    targetFrequency = minus3;
    targetRippleEdge = isEdge ? spec.cutoff : spec.kind === "lowpass" ? spec.cutoff * k : spec.cutoff / k;
  }

  const sections: DesignedSection[] = [];
  const components: DesignedComponent[] = [];
  const values: number[] = [];
  let nR = 0, nC = 0;
  let targetGain = 1;
  plans.forEach((plan, i) => {
    const variant = sectionVariant(plan.topology, plan.kind, needsGainNetwork(plan));
    const chosen = chooseValues(plan, spec.resistorLevel, spec.picker);
    const refs = variant.parts.map((p) => (p.kind === "resistor" ? `R${++nR}` : `C${++nC}`));
    const offset = values.length;
    variant.parts.forEach((p, j) => {
      components.push({
        ref: refs[j],
        local: p.name,
        kind: p.kind,
        value: chosen.values[j],
        calculated: chosen.calculated[j],
        series: p.kind === "resistor" ? spec.picker.resSeries : spec.picker.capSeries,
        tolerance: p.kind === "resistor" ? spec.resistorTolerance : spec.capacitorTolerance,
        role: `${p.role}, section ${i + 1}`,
        section: i + 1,
      });
      values.push(chosen.values[j]);
    });
    const coefficients = new Float64Array(5);
    variant.coefficients(values, offset, coefficients, 0);
    const sign = plan.topology === "mfb" || plan.topology === "inverting" || plan.topology === "mfb-bp" ? -1 : 1;
    const target: SectionFigures = { f0: plan.w0 / TWO_PI, q: plan.q, gain: sign * plan.gain };
    targetGain *= target.gain;
    sections.push({
      index: i + 1,
      variant,
      target,
      achieved: sectionFigures(plan.kind, plan.order, coefficients),
      coefficients,
      offset,
      refs,
      opampRef: `U${i + 1}`,
      issues: chosen.issues,
    });
  });
  return { kind: spec.kind, spec, prototype, sections, components, values: Float64Array.from(values), targetFrequency, targetRippleEdge, targetGain, gainNote };
}

/** Node name of the output of section i (1-based) in a design's circuit. */
export function sectionOutputNode(design: FilterDesign, i: number): string {
  return i === design.sections.length ? "out" : `s${i}o`;
}

/** The circuit of a design (input node "in", output node "out"), with the given values (default: chosen). */
export function designCircuit(design: FilterDesign, values: ArrayLike<number> = design.values): Circuit {
  const elements: CircuitElement[] = [];
  for (const s of design.sections) {
    const local = Array.from({ length: s.variant.parts.length }, (_, j) => values[s.offset + j]);
    const input = s.index === 1 ? "in" : sectionOutputNode(design, s.index - 1);
    elements.push(...s.variant.circuit(local, s.refs, s.opampRef, `s${s.index}`, input, sectionOutputNode(design, s.index)));
  }
  return { input: "in", output: "out", elements };
}

/** The circuit of one section alone (input node = its input, output = its output). */
export function sectionCircuit(design: FilterDesign, s: DesignedSection, values: ArrayLike<number> = design.values): Circuit {
  const local = Array.from({ length: s.variant.parts.length }, (_, j) => values[s.offset + j]);
  const input = s.index === 1 ? "in" : sectionOutputNode(design, s.index - 1);
  const output = sectionOutputNode(design, s.index);
  return { input, output, elements: s.variant.circuit(local, s.refs, s.opampRef, `s${s.index}`, input, output) };
}
