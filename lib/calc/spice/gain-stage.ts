/**
 * SPICE netlist of the amplifier pack's gain stage (lib/calc/amplifier/gain-stage.ts), as
 * designed: the resistor values are those its compute() picks (read from its component list,
 * so the netlist never re-designs), with the source resistance, the load RL ∥ CL and the ideal or
 * single-pole op-amp model (A0, GBW and the part's output resistance Ro).
 *
 * Small-signal circuit, the signal reference (ground, or Vbias on a single supply) as node 0:
 * - non-inverting: VIN → Rs → (R3 in series: bias-current compensation, split supply) → +in;
 *   on a single supply R3 is the bias network's Thevenin resistance from +in to the reference;
 *   R1 (Rg) from −in to 0, R2 (Rf) from out to −in; a follower has out tied to −in.
 * - inverting: VIN → Rs → R1 (Rin) → −in, R2 (Rf) from −in to out, +in to 0 through R3 if present.
 */
import { computeGainStage, type GainStageInput } from "../amplifier/gain-stage";
import type { Circuit, CircuitElement } from "../filter/circuit";
import { writeNetlist, type SpiceOpAmpModel } from "./netlist";

/** The netlist's circuit elements of a gain stage (Ω, F), and the values used. */
export function gainStageCircuit(input: GainStageInput): { circuit: Circuit; rg: number; rf: number; r3: number } {
  const out = computeGainStage(input);
  const val = (ref: string) => out.components.find((c) => c.ref === ref)?.value ?? 0;
  const rg = val("R1"), rf = val("R2"), r3 = val("R3");
  const nonInv = input.configuration === "non-inverting";
  const split = input.supply === "split";
  const els: CircuitElement[] = [];
  const R = (ref: string, a: string, b: string, value: number) => els.push({ kind: "R", ref, a, b, value });
  let src = "in";
  if (input.rSource > 0) {
    R("RS", "in", "src", input.rSource);
    src = "src";
  }
  if (nonInv) {
    let plus = src;
    if (r3 > 0 && split) {
      R("R3", src, "inp", r3);
      plus = "inp";
    } else if (r3 > 0) {
      R("R3", plus, "0", r3); // across an ideal source (Rs = 0) it has no effect, as in the circuit
    }
    if (rf > 0 && rg > 0) {
      R("R1", "inn", "0", rg);
      R("R2", "out", "inn", rf);
      els.push({ kind: "U", ref: "U1", plus, minus: "inn", out: "out" });
    } else {
      els.push({ kind: "U", ref: "U1", plus, minus: "out", out: "out" });
    }
  } else {
    R("R1", src, "inn", rg);
    R("R2", "inn", "out", rf);
    if (r3 > 0) R("R3", "inp", "0", r3);
    els.push({ kind: "U", ref: "U1", plus: r3 > 0 ? "inp" : "0", minus: "inn", out: "out" });
  }
  R("RL", "out", "0", input.rLoad);
  if (input.cLoad > 0) els.push({ kind: "C", ref: "CL", a: "out", b: "0", value: input.cLoad });
  return { circuit: { input: "in", output: "out", elements: els }, rg, rf, r3 };
}

/**
 * Netlist of a gain stage with the ideal or the part's single-pole model.
 * @param input parsed gain-stage input (SI units)
 * @param model "ideal" (VCVS 1e9) or "single-pole" (A0, GBW, Ro from the part)
 * @param tail optional lines before ".end" (e.g. an ngspice .control block)
 */
export function gainStageNetlist(input: GainStageInput, model: "ideal" | "single-pole", tail?: string[]): string {
  const { circuit, rg, rf } = gainStageCircuit(input);
  const p = input.opamp;
  const m: SpiceOpAmpModel = model === "ideal" ? { kind: "ideal" } : { kind: "single-pole", a0: 10 ** (p.aolDb / 20), gbw: p.gbw, name: p.name, rout: p.rout };
  const gain = input.configuration === "non-inverting" ? (rg > 0 ? 1 + rf / rg : 1) : -(rf / rg);
  const fB = p.gbw / Math.max(1, Math.abs(gain) + (input.configuration === "inverting" ? 1 : 0));
  return writeNetlist(circuit, {
    title: `* Loopwright gain stage: ${input.configuration}, |G| = ${input.gain} V/V, ${input.supply} supply`,
    comments: [
      `Resistors as designed: R1 (${input.configuration === "non-inverting" ? "Rg" : "Rin"}) = ${rg} Ohm, R2 (Rf) = ${rf} Ohm; source Rs = ${input.rSource} Ohm; load RL = ${input.rLoad} Ohm, CL = ${input.cLoad} F`,
      `Ideal gain with these resistors ${gain.toPrecision(6)} V/V; node 0 is the signal reference (ground or Vbias). Input node: in; output node: out.`,
    ],
    model: m,
    ac: { pointsPerDecade: 50, fStart: Math.max(1e-3, fB / 1e5), fStop: fB * 100 },
    tail,
  });
}
