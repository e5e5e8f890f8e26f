/**
 * A flat circuit description of a designed filter: resistors, capacitors and op-amps between
 * named nodes ("0" is ground). The same description feeds the engine's nodal solver
 * (lib/calc/filter/mna.ts) and the SPICE netlist writer (lib/calc/spice), so the netlist a user
 * simulates is the circuit the engine evaluated.
 */

/** Ground node name (SPICE convention). */
export const GROUND = "0";

/** A two-terminal passive element. */
export interface PassiveElement {
  kind: "R" | "C";
  /** Reference designator, e.g. "R3". */
  ref: string;
  a: string;
  b: string;
  /** Ω for R, F for C. */
  value: number;
}

/** An op-amp: output node driven by A(s)·(V+ − V−). */
export interface OpAmpElement {
  kind: "U";
  ref: string;
  plus: string;
  minus: string;
  out: string;
}

/** Any element of a circuit. */
export type CircuitElement = PassiveElement | OpAmpElement;

/** A circuit with one voltage-driven input node and one output node. */
export interface Circuit {
  /** Node the 1 V (AC) source drives. */
  input: string;
  /** Node whose voltage is the response. */
  output: string;
  elements: CircuitElement[];
}
