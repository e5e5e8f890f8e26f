/**
 * SPICE netlist of a designed active filter (lib/calc/filter), with the ideal or the single-pole
 * op-amp model. The circuit is the one the engine evaluated (designCircuit), so a simulation
 * reproduces the engine's response. Output node: "out"; input node: "in" (1 V AC source).
 */
import { designCircuit, type FilterDesign } from "../filter/design";
import { TOPOLOGY_LABELS } from "../filter/topology";
import { writeNetlist, type SpiceOpAmpModel } from "./netlist";

const FAMILY_LABEL: Record<string, string> = { butterworth: "Butterworth", bessel: "Bessel", chebyshev: "Chebyshev" };

/** One-line description of a design, e.g. "4th-order Butterworth low-pass, f−3dB 1 kHz". */
export function describeDesign(design: FilterDesign): string {
  const spec = design.spec;
  if (spec.kind === "bandpass") return `Multiple-feedback band-pass, f0 = ${spec.centre} Hz, Q = ${spec.q}, centre gain ${spec.gain} V/V`;
  const ord = (n: number) => `${n}${n === 1 ? "st" : n === 2 ? "nd" : n === 3 ? "rd" : "th"}`;
  const ripple = spec.family === "chebyshev" ? ` ${spec.rippleDb} dB` : "";
  const norm = spec.family === "chebyshev" && spec.normalisation === "ripple-edge" ? "ripple-band edge" : "-3 dB";
  return `${ord(spec.order)}-order ${FAMILY_LABEL[spec.family]}${ripple} ${spec.kind === "lowpass" ? "low-pass" : "high-pass"}, cutoff (${norm}) ${spec.cutoff} Hz`;
}

/** Options of a filter netlist. */
export interface FilterNetlistOptions {
  /** AC sweep start and stop, Hz (default: target frequency / 100 … × 100). */
  fStart?: number;
  fStop?: number;
  /** Points per decade (default 100). */
  pointsPerDecade?: number;
  /** Lines placed before ".end" (e.g. an ngspice .control block). */
  tail?: string[];
  /** Values to write instead of the chosen ones (Ω, F), in FilterDesign.values order. */
  values?: ArrayLike<number>;
}

/**
 * Netlist of a designed filter.
 * @param design the design
 * @param model op-amp model (ideal VCVS or single pole with A0 and GBW)
 * @param opts AC sweep and extra lines
 */
export function filterNetlist(design: FilterDesign, model: SpiceOpAmpModel, opts: FilterNetlistOptions = {}): string {
  const f = design.targetFrequency;
  const comments = [
    `Loopwright active filter: ${describeDesign(design)}`,
    `Target ${design.kind === "bandpass" ? "centre" : "-3 dB"} frequency ${f.toPrecision(6)} Hz, passband gain ${design.targetGain.toPrecision(5)} V/V`,
    ...design.sections.map(
      (s) =>
        `Section ${s.index}: ${TOPOLOGY_LABELS[s.variant.topology]}, order ${s.variant.order}, f0 ${s.achieved.f0.toPrecision(5)} Hz` +
        (s.variant.order === 2 ? `, Q ${s.achieved.q.toPrecision(4)}` : "") +
        `, gain ${s.achieved.gain.toPrecision(4)} V/V; parts ${s.refs.map((r, j) => `${r}=${s.variant.parts[j].name}`).join(" ")}, op-amp ${s.opampRef}`,
    ),
    "Input node: in (1 V AC source VIN); output node: out.",
  ];
  return writeNetlist(designCircuit(design, opts.values ?? design.values), {
    title: `* ${describeDesign(design)}`,
    comments,
    model,
    ac: { pointsPerDecade: opts.pointsPerDecade ?? 100, fStart: opts.fStart ?? f / 100, fStop: opts.fStop ?? f * 100 },
    tail: opts.tail,
  });
}
