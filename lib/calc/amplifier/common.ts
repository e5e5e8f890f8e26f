/**
 * Pieces shared by the op-amp stages of the amplifier pack: output swing against the rails at
 * the real load, output current, and the supply range check. Each adds its formulas, results and
 * checks to the caller's OutputBuilder, so the report shows them the same way for every stage.
 */
import type { OpAmpParams } from "../core/parts";
import type { OutputBuilder } from "../core/output";
import { checkAtMost, makeCheck } from "../core/checks";
import { formatQuantity as q } from "../core/units";

/** Source line for the swing-derating approximation. */
export const SWING_REFERENCE = "common practice, no source (headroom from data-sheet swing plus Ro·ΔI)";

/** What {@link outputSwingSection} needs. Voltages in V, resistances in Ω. */
export interface SwingSpec {
  part: OpAmpParams;
  vPos: number;
  vNeg: number;
  /** Signal reference the output swings around, V. */
  vRef: number;
  /** Required output amplitude, V peak. */
  vPeak: number;
  /** Advice for the fail sentence, e.g. "re-centre Vbias". */
  advice: string;
  /** Result group heading. */
  group: string;
}

/**
 * Output swing and output current at the real load. The sheet must already hold
 * `r_load_total` (the total load on the output, Ω) and `Vpk` (the required amplitude, V).
 * A load heavier than the part's swing-spec load raises the headroom by Ro·ΔI, where ΔI is the
 * extra peak current over what the spec load draws at the same amplitude (stated as a warning).
 * @returns the highest and lowest output voltages, V
 */
export function outputSwingSection(b: OutputBuilder, s: SwingSpec): { vOmax: number; vOmin: number } {
  const p = s.part;
  const f = b.sheet;
  f.define({
    Vpos: { value: s.vPos, unit: "V", symbol: "V+" },
    Vneg: { value: s.vNeg, unit: "V", symbol: "V−" },
    Ro: { value: p.rout, unit: "Ω", symbol: "Ro" },
    RLsw: { value: p.swingLoad, unit: "Ω", symbol: "RL,sw" },
    swPos: { value: p.swingPos, unit: "V", symbol: "Vsw+" },
    swNeg: { value: p.swingNeg, unit: "V", symbol: "Vsw−" },
  });
  const g = s.group;
  const ipk = b.formula({ key: "i_out_peak", label: "Peak output current", symbol: "Io,pk", expr: "Vpk / r_load_total", unit: "A" }, {}, g);
  const rTot = f.value("r_load_total");
  const extra = b.formula({ key: "swing_derating", label: "Extra headroom for the heavier load", symbol: "ΔVsw", expr: "Ro * max(0, i_out_peak - Vpk / RLsw)", unit: "V", reference: SWING_REFERENCE }, {}, g);
  const vOmax = b.formula({ key: "v_out_max", label: "Highest output voltage", symbol: "Vo,max", expr: "Vpos - swPos - swing_derating", unit: "V", reference: SWING_REFERENCE }, {}, g);
  const vOmin = b.formula({ key: "v_out_min", label: "Lowest output voltage", symbol: "Vo,min", expr: "Vneg + swNeg + swing_derating", unit: "V", reference: SWING_REFERENCE }, {}, g);
  const needHi = s.vRef + s.vPeak;
  const needLo = s.vRef - s.vPeak;
  b.check(
    checkAtMost("swing.high", "Output swing, positive rail", s.vPeak, vOmax - s.vRef, {
      pass: () => `Output peak ${q(needHi, "V")} stays below the highest output ${q(vOmax, "V")} (V+ ${q(s.vPos, "V")} less ${q(p.swingPos + extra, "V")} headroom).`,
      fail: () => `Output peak ${q(needHi, "V")} is above the highest output ${q(vOmax, "V")} (V+ ${q(s.vPos, "V")} less ${q(p.swingPos + extra, "V")} headroom): the output clips. Raise V+, reduce the amplitude${s.advice} or choose a part with more output swing.`,
    }, { warnBelow: 0.05 }),
    checkAtMost("swing.low", "Output swing, negative rail", s.vPeak, s.vRef - vOmin, {
      pass: () => `Output trough ${q(needLo, "V")} stays above the lowest output ${q(vOmin, "V")} (V− ${q(s.vNeg, "V")} plus ${q(p.swingNeg + extra, "V")} headroom).`,
      fail: () => `Output trough ${q(needLo, "V")} is below the lowest output ${q(vOmin, "V")} (V− ${q(s.vNeg, "V")} plus ${q(p.swingNeg + extra, "V")} headroom): the output clips. Lower V−, reduce the amplitude${s.advice} or choose a part with more output swing.`,
    }, { warnBelow: 0.05 }),
  );
  if (rTot < p.swingLoad) {
    b.check(
      makeCheck(
        "swing.load",
        "warning",
        "Load heavier than the swing specification",
        `The output drives ${q(rTot, "Ω")} (load with feedback network), heavier than the ${q(p.swingLoad, "Ω")} at which the part's swing is specified; the headroom was increased by Ro·ΔI = ${q(p.rout, "Ω")} × ${q(Math.max(0, ipk - s.vPeak / p.swingLoad), "A")} = ${q(extra, "V")} on each rail. Confirm with the maker's swing-versus-load curve.`,
      ),
    );
  }
  b.check(
    checkAtMost("output.current", "Output current", ipk, p.ioutMax, {
      pass: () => `Peak output current ${q(ipk, "A")} is within the part's ${q(p.ioutMax, "A")}.`,
      fail: () => `Peak output current ${q(ipk, "A")} exceeds the part's ${q(p.ioutMax, "A")}; raise the load or feedback resistances or add a buffer.`,
    }, { warnBelow: 0.2 }),
  );
  return { vOmax, vOmin };
}

/** Supply range check: total supply V+ − V− against the part's range (V). */
export function supplySection(b: OutputBuilder, p: OpAmpParams, vPos: number, vNeg: number, group: string): void {
  const vs = vPos - vNeg;
  b.result("supply_total", "Total supply", "Vs", vs, "V", group);
  const m = Math.min(vs / p.supplyMin - 1, 1 - vs / p.supplyMax);
  if (vs < p.supplyMin || vs > p.supplyMax) {
    b.check(makeCheck("supply.range", "fail", "Supply range", `Total supply ${q(vs, "V")} is outside the part's ${q(p.supplyMin, "V")} to ${q(p.supplyMax, "V")}; choose a part rated for this supply or change the rails.`, m));
  } else {
    b.check(makeCheck("supply.range", "pass", "Supply range", `Total supply ${q(vs, "V")} is within the part's ${q(p.supplyMin, "V")} to ${q(p.supplyMax, "V")}.`, m));
  }
  if (vs > 50) {
    b.cautions.push(`Total supply ${q(vs, "V")}: treat the circuit as hazardous voltage; follow the creepage, clearance and insulation rules of the applicable standard and local codes.`);
  }
}
