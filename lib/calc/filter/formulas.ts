/**
 * The achieved-value formulas of each section topology as mathjs expressions over the section's
 * local part names (see topology.ts), for the report's formula sheet. They are the same
 * relations as the coefficient functions in topology.ts (a unit test checks that both agree):
 * f₀ = 1/(2π√a2), Q = √a2/a1 and the passband gain.
 *
 * Units: Ω, F, Hz; gains in V/V.
 */
import type { FilterKind, SectionTopology } from "./topology";

/** Expressions of one section variant. "K" names the section's non-inverting gain 1 + Rb/Ra. */
export interface SectionExpressions {
  /** Gain-network expression (only where Ra/Rb exist). */
  k?: string;
  f0: string;
  /** Absent for first-order sections. */
  q?: string;
  /** Signed passband gain; absent when it is exactly 1 (followers). */
  gain?: string;
  /** Noise gain relevant to the GBW rule (uses K, Q where named). */
  noiseGain: string;
}

/** Expressions by topology and kind; `gainNetwork` selects the Ra/Rb form of rc-buffer. */
export function sectionExpressions(topology: SectionTopology, kind: FilterKind, gainNetwork: boolean): SectionExpressions {
  switch (`${topology}/${kind}`) {
    case "sk-unity/lowpass":
      return { f0: "1 / (2 * pi * sqrt(R1 * R2 * C1 * C2))", q: "sqrt(R1 * R2 * C1 * C2) / (C2 * (R1 + R2))", noiseGain: "1" };
    case "sk-equal/lowpass":
      return { k: "1 + Rb / Ra", f0: "1 / (2 * pi * sqrt(R1 * R2 * C1 * C2))", q: "sqrt(R1 * R2 * C1 * C2) / (C2 * (R1 + R2) + R1 * C1 * (1 - K))", gain: "K", noiseGain: "K" };
    case "mfb/lowpass":
      return { f0: "1 / (2 * pi * sqrt(R2 * R3 * C1 * C2))", q: "sqrt(R2 * R3 * C1 * C2) / (C2 * (R2 + R3 + R2 * R3 / R1))", gain: "-R2 / R1", noiseGain: "1 + R2 / R1" };
    case "sk-unity/highpass":
      return { f0: "1 / (2 * pi * sqrt(R1 * R2 * C1 * C2))", q: "sqrt(R1 * R2 * C1 * C2) / (R1 * (C1 + C2))", noiseGain: "1" };
    case "sk-equal/highpass":
      return { k: "1 + Rb / Ra", f0: "1 / (2 * pi * sqrt(R1 * R2 * C1 * C2))", q: "sqrt(R1 * R2 * C1 * C2) / (R1 * (C1 + C2) + R2 * C2 * (1 - K))", gain: "K", noiseGain: "K" };
    case "mfb/highpass":
      return { f0: "1 / (2 * pi * sqrt(R1 * R2 * C2 * C3))", q: "sqrt(R1 * R2 * C2 * C3) / (R1 * (C1 + C2 + C3))", gain: "-C1 / C3", noiseGain: "1 + C1 / C3" };
    case "rc-buffer/lowpass":
    case "rc-buffer/highpass":
      return gainNetwork ? { k: "1 + Rb / Ra", f0: "1 / (2 * pi * R1 * C1)", gain: "K", noiseGain: "K" } : { f0: "1 / (2 * pi * R1 * C1)", noiseGain: "1" };
    case "inverting/lowpass":
      return { f0: "1 / (2 * pi * R2 * C1)", gain: "-R2 / R1", noiseGain: "1 + R2 / R1" };
    case "inverting/highpass":
      return { f0: "1 / (2 * pi * R1 * C1)", gain: "-R2 / R1", noiseGain: "1 + R2 / R1" };
    case "mfb-bp/bandpass":
      return {
        f0: "1 / (2 * pi * sqrt(C1 * C2 * R3 * R1 * R2 / (R1 + R2)))",
        q: "sqrt(C1 * C2 * R3 * R1 * R2 / (R1 + R2)) / ((C1 + C2) * R1 * R2 / (R1 + R2))",
        gain: "-R3 * C1 / (R1 * (C1 + C2))",
        noiseGain: "1 + 2 * Q ^ 2",
      };
  }
  throw new RangeError(`no expressions for ${topology}/${kind}`);
}

/**
 * Rename the variables of an expression (whole identifiers only, all at once).
 * @example renameVariables("R1 / R2", { R1: "R5", R2: "R6" }) // "R5 / R6"
 */
export function renameVariables(expr: string, names: Record<string, string>): string {
  return expr.replace(/[A-Za-z_][A-Za-z0-9_]*/g, (id) => names[id] ?? id);
}
