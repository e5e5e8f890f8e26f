/**
 * Section topologies of the active filter pack: their ideal transfer functions in terms of the
 * actual component values, their design equations, and their circuits.
 *
 * Every section is H(s) = (b0 + b1·s + b2·s²) / (1 + a1·s + a2·s²) with s in rad/s, derived
 * here by nodal analysis with an ideal op-amp (and cross-checked against ngspice in
 * tests/spice). Component names are local to the section and say what each part does, because
 * published texts swap the meaning of C1/C2 between topologies:
 *
 * | topology              | parts (input side first)                                              |
 * |-----------------------|------------------------------------------------------------------------|
 * | sk-unity low-pass     | R1 in→A, R2 A→B, C1 A→out (feedback), C2 B→0; follower on B            |
 * | sk-equal low-pass     | as sk-unity plus Ra (−in→0), Rb (out→−in): K = 1 + Rb/Ra               |
 * | mfb low-pass          | R1 in→A, R2 A→out, R3 A→−in, C1 A→0, C2 −in→out                        |
 * | sk-unity high-pass    | C1 in→A, C2 A→B, R1 A→out (feedback), R2 B→0; follower on B            |
 * | sk-equal high-pass    | as sk-unity plus Ra, Rb                                                 |
 * | mfb high-pass         | C1 in→A, C2 A→−in, C3 A→out, R1 A→0, R2 −in→out                        |
 * | rc-buffer (1st order) | low-pass R1 in→A, C1 A→0; high-pass C1 in→A, R1 A→0; follower or Ra/Rb |
 * | inverting (1st order) | low-pass R1 in→−in, R2 ∥ C1 −in→out; high-pass C1–R1 in→−in, R2 −in→out |
 * | mfb band-pass         | R1 in→A, R2 A→0, C1 A→−in, C2 A→out, R3 −in→out                        |
 *
 * References:
 * [1] B. Carter, R. Mancini, Op Amps for Everyone, 5th ed., Newnes 2017, ch. 16 (Sallen-Key,
 *     multiple-feedback and band-pass sections; there the unity-gain Sallen-Key feedback
 *     capacitor is called C2, so its condition reads C2 ≥ 4Q²·C1 — value from memory).
 * [2] S. Franco, Design with Operational Amplifiers and Analog Integrated Circuits, 4th ed.,
 *     McGraw-Hill 2015, ch. 3 (second-order active filters).
 */
import type { CircuitElement } from "./circuit";
import { GROUND } from "./circuit";

/** Filter kind. */
export type FilterKind = "lowpass" | "highpass" | "bandpass";
/** Topology of the second-order sections. */
export type SecondOrderTopology = "sk-unity" | "sk-equal" | "mfb";
/** Topology of the first-order section. */
export type FirstOrderTopology = "rc-buffer" | "inverting";
/** Any section topology. */
export type SectionTopology = SecondOrderTopology | FirstOrderTopology | "mfb-bp";

/** Labels as printed in tables and reports. */
export const TOPOLOGY_LABELS: Record<SectionTopology, string> = {
  "sk-unity": "Sallen-Key, unity gain",
  "sk-equal": "Sallen-Key, equal components",
  mfb: "Multiple feedback",
  "rc-buffer": "RC with buffer",
  inverting: "Inverting first-order stage",
  "mfb-bp": "Multiple-feedback band-pass",
};

/** Ideal section coefficients: H(s) = (b0 + b1·s + b2·s²)/(1 + a1·s + a2·s²), a1 in s, a2 in s². */
export interface SectionCoefficients {
  b0: number;
  b1: number;
  b2: number;
  a1: number;
  a2: number;
}

/** Writes the five coefficients [b0, b1, b2, a1, a2] of a section into out[oo…oo+4], from values v[o…]. */
export type CoefficientFn = (v: ArrayLike<number>, o: number, out: Float64Array, oo: number) => void;

/** One part of a section: local name and what it does. */
export interface PartRole {
  name: string;
  kind: "resistor" | "capacitor";
  role: string;
}

/** Everything the engine knows about one section variant. */
export interface SectionVariant {
  topology: SectionTopology;
  kind: FilterKind;
  order: 1 | 2;
  /** True when Ra/Rb set a non-inverting gain (sk-equal, rc-buffer with gain). */
  gainNetwork: boolean;
  parts: PartRole[];
  coefficients: CoefficientFn;
  /**
   * The section's circuit. refs: global designators for the parts (same order), op-amp ref,
   * node prefix, input and output node names.
   */
  circuit(values: ArrayLike<number>, refs: readonly string[], opampRef: string, prefix: string, input: string, output: string): CircuitElement[];
}

const R = (name: string, role: string): PartRole => ({ name, kind: "resistor", role });
const C = (name: string, role: string): PartRole => ({ name, kind: "capacitor", role });

function el(kind: "R" | "C", ref: string, a: string, b: string, value: number): CircuitElement {
  return { kind, ref, a, b, value };
}

/** Non-inverting amplifier around node `plus`: follower, or gain 1 + Rb/Ra with Ra, Rb at values[ia], values[ia+1]. */
function amp(
  values: ArrayLike<number>,
  refs: readonly string[],
  ia: number | null,
  opampRef: string,
  plus: string,
  prefix: string,
  output: string,
): CircuitElement[] {
  if (ia === null) return [{ kind: "U", ref: opampRef, plus, minus: output, out: output }];
  const minus = `${prefix}n`;
  return [
    el("R", refs[ia], minus, GROUND, values[ia]),
    el("R", refs[ia + 1], output, minus, values[ia + 1]),
    { kind: "U", ref: opampRef, plus, minus, out: output },
  ];
}

// ---- coefficient functions (ideal op-amp), each derived by nodal analysis ---------------------

const skLowpassUnity: CoefficientFn = (v, o, out, oo) => {
  const r1 = v[o], r2 = v[o + 1], c1 = v[o + 2], c2 = v[o + 3];
  out[oo + 0] = 1; out[oo + 1] = 0; out[oo + 2] = 0;
  out[oo + 3] = c2 * (r1 + r2);
  out[oo + 4] = r1 * r2 * c1 * c2;
};
const skLowpassGain: CoefficientFn = (v, o, out, oo) => {
  const r1 = v[o], r2 = v[o + 1], c1 = v[o + 2], c2 = v[o + 3];
  const k = 1 + v[o + 5] / v[o + 4];
  out[oo + 0] = k; out[oo + 1] = 0; out[oo + 2] = 0;
  out[oo + 3] = c2 * (r1 + r2) + r1 * c1 * (1 - k);
  out[oo + 4] = r1 * r2 * c1 * c2;
};
const mfbLowpass: CoefficientFn = (v, o, out, oo) => {
  const r1 = v[o], r2 = v[o + 1], r3 = v[o + 2], c1 = v[o + 3], c2 = v[o + 4];
  out[oo + 0] = -r2 / r1; out[oo + 1] = 0; out[oo + 2] = 0;
  out[oo + 3] = c2 * (r2 + r3 + (r2 * r3) / r1);
  out[oo + 4] = r2 * r3 * c1 * c2;
};
const skHighpassUnity: CoefficientFn = (v, o, out, oo) => {
  const c1 = v[o], c2 = v[o + 1], r1 = v[o + 2], r2 = v[o + 3];
  const p = r1 * r2 * c1 * c2;
  out[oo + 0] = 0; out[oo + 1] = 0; out[oo + 2] = p;
  out[oo + 3] = r1 * (c1 + c2);
  out[oo + 4] = p;
};
const skHighpassGain: CoefficientFn = (v, o, out, oo) => {
  const c1 = v[o], c2 = v[o + 1], r1 = v[o + 2], r2 = v[o + 3];
  const k = 1 + v[o + 5] / v[o + 4];
  const p = r1 * r2 * c1 * c2;
  out[oo + 0] = 0; out[oo + 1] = 0; out[oo + 2] = k * p;
  out[oo + 3] = r1 * (c1 + c2) + r2 * c2 * (1 - k);
  out[oo + 4] = p;
};
const mfbHighpass: CoefficientFn = (v, o, out, oo) => {
  const c1 = v[o], c2 = v[o + 1], c3 = v[o + 2], r1 = v[o + 3], r2 = v[o + 4];
  out[oo + 0] = 0; out[oo + 1] = 0; out[oo + 2] = -r1 * r2 * c1 * c2;
  out[oo + 3] = r1 * (c1 + c2 + c3);
  out[oo + 4] = r1 * r2 * c2 * c3;
};
const rcLowpass = (gain: boolean): CoefficientFn => (v, o, out, oo) => {
  out[oo + 0] = gain ? 1 + v[o + 3] / v[o + 2] : 1; out[oo + 1] = 0; out[oo + 2] = 0;
  out[oo + 3] = v[o] * v[o + 1];
  out[oo + 4] = 0;
};
const rcHighpass = (gain: boolean): CoefficientFn => (v, o, out, oo) => {
  const tau = v[o] * v[o + 1];
  out[oo + 0] = 0; out[oo + 1] = (gain ? 1 + v[o + 3] / v[o + 2] : 1) * tau; out[oo + 2] = 0;
  out[oo + 3] = tau;
  out[oo + 4] = 0;
};
const invLowpass: CoefficientFn = (v, o, out, oo) => {
  const r1 = v[o], r2 = v[o + 1], c1 = v[o + 2];
  out[oo + 0] = -r2 / r1; out[oo + 1] = 0; out[oo + 2] = 0;
  out[oo + 3] = r2 * c1;
  out[oo + 4] = 0;
};
const invHighpass: CoefficientFn = (v, o, out, oo) => {
  const c1 = v[o], r1 = v[o + 1], r2 = v[o + 2];
  out[oo + 0] = 0; out[oo + 1] = -r2 * c1; out[oo + 2] = 0;
  out[oo + 3] = r1 * c1;
  out[oo + 4] = 0;
};
const mfbBandpass: CoefficientFn = (v, o, out, oo) => {
  const r1 = v[o], r2 = v[o + 1], r3 = v[o + 2], c1 = v[o + 3], c2 = v[o + 4];
  const rp = (r1 * r2) / (r1 + r2);
  out[oo + 0] = 0; out[oo + 1] = (-c1 * r3 * r2) / (r1 + r2); out[oo + 2] = 0;
  out[oo + 3] = (c1 + c2) * rp;
  out[oo + 4] = c1 * c2 * r3 * rp;
};

const GAIN_PARTS = [R("Ra", "gain-setting resistor, inverting input to ground"), R("Rb", "gain-setting resistor, output to inverting input")];

/**
 * The section variant for a topology, filter kind and order.
 * @param topology section topology; @param kind low-, high- or band-pass
 * @param gainNetwork for rc-buffer: true when Ra/Rb set a gain above 1 (sk-equal always has them)
 */
export function sectionVariant(topology: SectionTopology, kind: FilterKind, gainNetwork = false): SectionVariant {
  switch (topology) {
    case "sk-unity":
    case "sk-equal": {
      const g = topology === "sk-equal";
      if (kind === "lowpass")
        return {
          topology, kind, order: 2, gainNetwork: g,
          parts: [R("R1", "input resistor"), R("R2", "second series resistor"), C("C1", "feedback capacitor (to output)"), C("C2", "capacitor to ground"), ...(g ? GAIN_PARTS : [])],
          coefficients: g ? skLowpassGain : skLowpassUnity,
          circuit: (v, refs, u, p, i, o) => [
            el("R", refs[0], i, `${p}a`, v[0]), el("R", refs[1], `${p}a`, `${p}b`, v[1]),
            el("C", refs[2], `${p}a`, o, v[2]), el("C", refs[3], `${p}b`, GROUND, v[3]),
            ...amp(v, refs, g ? 4 : null, u, `${p}b`, p, o),
          ],
        };
      if (kind === "highpass")
        return {
          topology, kind, order: 2, gainNetwork: g,
          parts: [C("C1", "input capacitor"), C("C2", "second series capacitor"), R("R1", "feedback resistor (to output)"), R("R2", "resistor to ground"), ...(g ? GAIN_PARTS : [])],
          coefficients: g ? skHighpassGain : skHighpassUnity,
          circuit: (v, refs, u, p, i, o) => [
            el("C", refs[0], i, `${p}a`, v[0]), el("C", refs[1], `${p}a`, `${p}b`, v[1]),
            el("R", refs[2], `${p}a`, o, v[2]), el("R", refs[3], `${p}b`, GROUND, v[3]),
            ...amp(v, refs, g ? 4 : null, u, `${p}b`, p, o),
          ],
        };
      break;
    }
    case "mfb":
      if (kind === "lowpass")
        return {
          topology, kind, order: 2, gainNetwork: false,
          parts: [R("R1", "input resistor"), R("R2", "feedback resistor (to output)"), R("R3", "resistor to inverting input"), C("C1", "capacitor to ground"), C("C2", "feedback capacitor (inverting input to output)")],
          coefficients: mfbLowpass,
          circuit: (v, refs, u, p, i, o) => [
            el("R", refs[0], i, `${p}a`, v[0]), el("R", refs[1], `${p}a`, o, v[1]), el("R", refs[2], `${p}a`, `${p}n`, v[2]),
            el("C", refs[3], `${p}a`, GROUND, v[3]), el("C", refs[4], `${p}n`, o, v[4]),
            { kind: "U", ref: u, plus: GROUND, minus: `${p}n`, out: o },
          ],
        };
      if (kind === "highpass")
        return {
          topology, kind, order: 2, gainNetwork: false,
          parts: [C("C1", "input capacitor"), C("C2", "capacitor to inverting input"), C("C3", "feedback capacitor (to output)"), R("R1", "resistor to ground"), R("R2", "feedback resistor (inverting input to output)")],
          coefficients: mfbHighpass,
          circuit: (v, refs, u, p, i, o) => [
            el("C", refs[0], i, `${p}a`, v[0]), el("C", refs[1], `${p}a`, `${p}n`, v[1]), el("C", refs[2], `${p}a`, o, v[2]),
            el("R", refs[3], `${p}a`, GROUND, v[3]), el("R", refs[4], `${p}n`, o, v[4]),
            { kind: "U", ref: u, plus: GROUND, minus: `${p}n`, out: o },
          ],
        };
      break;
    case "rc-buffer":
      if (kind === "lowpass")
        return {
          topology, kind, order: 1, gainNetwork,
          parts: [R("R1", "series resistor"), C("C1", "capacitor to ground"), ...(gainNetwork ? GAIN_PARTS : [])],
          coefficients: rcLowpass(gainNetwork),
          circuit: (v, refs, u, p, i, o) => [
            el("R", refs[0], i, `${p}a`, v[0]), el("C", refs[1], `${p}a`, GROUND, v[1]),
            ...amp(v, refs, gainNetwork ? 2 : null, u, `${p}a`, p, o),
          ],
        };
      if (kind === "highpass")
        return {
          topology, kind, order: 1, gainNetwork,
          parts: [C("C1", "series capacitor"), R("R1", "resistor to ground"), ...(gainNetwork ? GAIN_PARTS : [])],
          coefficients: rcHighpass(gainNetwork),
          circuit: (v, refs, u, p, i, o) => [
            el("C", refs[0], i, `${p}a`, v[0]), el("R", refs[1], `${p}a`, GROUND, v[1]),
            ...amp(v, refs, gainNetwork ? 2 : null, u, `${p}a`, p, o),
          ],
        };
      break;
    case "inverting":
      if (kind === "lowpass")
        return {
          topology, kind, order: 1, gainNetwork: false,
          parts: [R("R1", "input resistor"), R("R2", "feedback resistor"), C("C1", "feedback capacitor (across R2)")],
          coefficients: invLowpass,
          circuit: (v, refs, u, p, i, o) => [
            el("R", refs[0], i, `${p}n`, v[0]), el("R", refs[1], `${p}n`, o, v[1]), el("C", refs[2], `${p}n`, o, v[2]),
            { kind: "U", ref: u, plus: GROUND, minus: `${p}n`, out: o },
          ],
        };
      if (kind === "highpass")
        return {
          topology, kind, order: 1, gainNetwork: false,
          parts: [C("C1", "input capacitor"), R("R1", "input resistor"), R("R2", "feedback resistor")],
          coefficients: invHighpass,
          circuit: (v, refs, u, p, i, o) => [
            el("C", refs[0], i, `${p}a`, v[0]), el("R", refs[1], `${p}a`, `${p}n`, v[1]), el("R", refs[2], `${p}n`, o, v[2]),
            { kind: "U", ref: u, plus: GROUND, minus: `${p}n`, out: o },
          ],
        };
      break;
    case "mfb-bp":
      return {
        topology, kind: "bandpass", order: 2, gainNetwork: false,
        parts: [R("R1", "input resistor"), R("R2", "resistor to ground"), R("R3", "feedback resistor (inverting input to output)"), C("C1", "capacitor to inverting input"), C("C2", "feedback capacitor (to output)")],
        coefficients: mfbBandpass,
        circuit: (v, refs, u, p, i, o) => [
          el("R", refs[0], i, `${p}a`, v[0]), el("R", refs[1], `${p}a`, GROUND, v[1]), el("R", refs[2], `${p}n`, o, v[2]),
          el("C", refs[3], `${p}a`, `${p}n`, v[3]), el("C", refs[4], `${p}a`, o, v[4]),
          { kind: "U", ref: u, plus: GROUND, minus: `${p}n`, out: o },
        ],
      };
  }
  throw new RangeError(`topology ${topology} has no ${kind} variant`);
}

/** Achieved section parameters from its coefficients. */
export interface SectionFigures {
  /** Natural (or pole) frequency, Hz. */
  f0: number;
  /** Quality factor (NaN-free: 0 for first-order sections). */
  q: number;
  /** Passband gain (signed): DC for low-pass, high-frequency for high-pass, centre for band-pass, V/V. */
  gain: number;
}

/** f0 (Hz), Q and signed passband gain (V/V) of a section from its coefficients. */
export function sectionFigures(kind: FilterKind, order: 1 | 2, c: ArrayLike<number>): SectionFigures {
  const [b0, b1, b2, a1, a2] = [c[0], c[1], c[2], c[3], c[4]];
  if (order === 1) {
    return { f0: 1 / (2 * Math.PI * a1), q: 0, gain: kind === "lowpass" ? b0 : b1 / a1 };
  }
  const f0 = 1 / (2 * Math.PI * Math.sqrt(a2));
  const q = Math.sqrt(a2) / a1;
  const gain = kind === "lowpass" ? b0 : kind === "highpass" ? b2 / a2 : b1 / a1;
  return { f0, q, gain };
}
