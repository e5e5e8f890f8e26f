/**
 * SPICE netlist writer: plain SPICE3 syntax (R, C, V, E, G and X cards, .subckt, .ac, .end),
 * which ngspice and other SPICE-family simulators read. No simulator-specific extensions in the
 * circuit part; an optional .control block (ngspice) can be appended by the caller.
 *
 * Op-amp models:
 * - ideal: a voltage-controlled voltage source with gain 1e9 (zero output resistance);
 * - single-pole: subcircuit with A(s) = A0/(1 + s/ωp), ωp = 2π·GBW/A0: a unit transconductance
 *   into R = A0 ∥ C = 1/(ωp·A0), buffered by a unit VCVS, with an optional output resistance.
 */
import type { Circuit } from "../filter/circuit";

/** Op-amp model of a netlist. */
export type SpiceOpAmpModel =
  | { kind: "ideal" }
  | { kind: "single-pole"; /** DC open-loop gain, V/V */ a0: number; /** GBW, Hz */ gbw: number; /** part name for the comment */ name?: string; /** open-loop output resistance, Ω (default 0) */ rout?: number };

/** Gain of the "ideal" op-amp VCVS, V/V. */
export const IDEAL_OPAMP_GAIN = 1e9;

/** A number in SPICE form: plain exponent notation, 7 significant figures (no unit suffixes). */
export function spiceNumber(x: number): string {
  if (x === 0) return "0";
  return x.toExponential(6).replace("e+", "e");
}

/** Options of a netlist. */
export interface NetlistOptions {
  /** First line (title card). */
  title: string;
  /** Comment lines after the title (without the leading "*"). */
  comments: string[];
  model: SpiceOpAmpModel;
  /** AC sweep, decade: points per decade and start/stop, Hz. */
  ac: { pointsPerDecade: number; fStart: number; fStop: number };
  /** Optional lines placed before ".end" (e.g. an ngspice .control block). */
  tail?: string[];
}

/** Subcircuit name of the single-pole op-amp model. */
export const SINGLE_POLE_SUBCKT = "LW_OPAMP_1P";

/**
 * Netlist of a circuit driven by an AC source of 1 V at its input node.
 * @param circuit the circuit (ground "0")
 * @param opts title, comments, op-amp model, AC analysis
 * @returns the netlist text (lines joined with "\n", ending with ".end\n")
 */
export function writeNetlist(circuit: Circuit, opts: NetlistOptions): string {
  const lines: string[] = [opts.title.replace(/\r?\n/g, " ")];
  for (const c of opts.comments) lines.push(`* ${c}`);
  const m = opts.model;
  if (m.kind === "ideal") lines.push(`* Op-amp model: ideal (VCVS, gain ${spiceNumber(IDEAL_OPAMP_GAIN)}, zero output resistance)`);
  else {
    const fp = m.gbw / m.a0;
    lines.push(`* Op-amp model: single pole${m.name ? ` (${m.name})` : ""}: A0 = ${spiceNumber(m.a0)} V/V, GBW = ${spiceNumber(m.gbw)} Hz, pole ${spiceNumber(fp)} Hz${m.rout ? `, Ro = ${spiceNumber(m.rout)} Ohm` : ""}`);
    lines.push(`.subckt ${SINGLE_POLE_SUBCKT} inp inn out`);
    lines.push(`G1 0 p1 inp inn 1`);
    lines.push(`R1 p1 0 ${spiceNumber(m.a0)}`);
    lines.push(`C1 p1 0 ${spiceNumber(1 / (2 * Math.PI * fp * m.a0))}`);
    if (m.rout && m.rout > 0) {
      lines.push(`E1 o1 0 p1 0 1`);
      lines.push(`RO o1 out ${spiceNumber(m.rout)}`);
    } else lines.push(`E1 out 0 p1 0 1`);
    lines.push(`.ends ${SINGLE_POLE_SUBCKT}`);
  }
  lines.push(`VIN ${circuit.input} 0 DC 0 AC 1`);
  for (const e of circuit.elements) {
    if (e.kind === "U") {
      if (m.kind === "ideal") lines.push(`E${e.ref} ${e.out} 0 ${e.plus} ${e.minus} ${spiceNumber(IDEAL_OPAMP_GAIN)}`);
      else lines.push(`X${e.ref} ${e.plus} ${e.minus} ${e.out} ${SINGLE_POLE_SUBCKT}`);
    } else {
      lines.push(`${e.ref} ${e.a} ${e.b} ${spiceNumber(e.value)}`);
    }
  }
  lines.push(`.ac dec ${Math.round(opts.ac.pointsPerDecade)} ${spiceNumber(opts.ac.fStart)} ${spiceNumber(opts.ac.fStop)}`);
  if (opts.tail) lines.push(...opts.tail);
  lines.push(".end");
  return lines.join("\n") + "\n";
}
