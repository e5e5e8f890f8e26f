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
  /**
   * Largest output current magnitude (A), as a formula over the sheet's variables; default
   * "Vpk / r_load_total". Checked against the part's output current.
   */
  peakCurrent?: { expr: string; label: string; reference?: string };
  /**
   * Output current at the instant the output is at its voltage peak (A), which sets the extra
   * headroom; default: the peak current. (A capacitive load draws no current at the voltage peak.)
   */
  swingCurrent?: { expr: string; label: string };
  /** Advice for the output-current fail sentence (default: raise the resistances or buffer). */
  currentAdvice?: string;
}

/**
 * Output swing and output current at the real load. The sheet must already hold `Vpk` (the
 * required amplitude, V) and either `r_load_total` (the total load on the output, Ω, for the
 * default current Vpk / r_load_total) or whatever the given current formulas use.
 * A load heavier than the part's swing-spec load raises the headroom by Ro·ΔI, where ΔI is the
 * extra current at the voltage peak over what the spec load draws at the same amplitude (stated
 * as a warning). An output cannot pass its own rail, so a negative headroom in the part data is
 * limited to the rail (with a warning).
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
  const pc = s.peakCurrent ?? { expr: "Vpk / r_load_total", label: "Peak output current" };
  const ipk = b.formula({ key: "i_out_peak", label: pc.label, symbol: "Io,pk", expr: pc.expr, unit: "A", ...(pc.reference ? { reference: pc.reference } : {}) }, {}, g);
  let iSwingKey = "i_out_peak";
  if (s.swingCurrent) {
    b.formula({ key: "i_out_at_vpk", label: s.swingCurrent.label, symbol: "Io(Vo,pk)", expr: s.swingCurrent.expr, unit: "A" }, {}, g);
    iSwingKey = "i_out_at_vpk";
  }
  const iSwing = f.value(iSwingKey);
  const extra = b.formula({ key: "swing_derating", label: "Extra headroom for the heavier load", symbol: "ΔVsw", expr: `Ro * max(0, ${iSwingKey} - Vpk / RLsw)`, unit: "V", reference: SWING_REFERENCE }, {}, g);
  // An output stage cannot drive past its own supply: a negative headroom is limited to the rail.
  const vOmax = b.formula({ key: "v_out_max", label: "Highest output voltage", symbol: "Vo,max", expr: "min(Vpos, Vpos - swPos - swing_derating)", unit: "V", reference: SWING_REFERENCE }, {}, g);
  const vOmin = b.formula({ key: "v_out_min", label: "Lowest output voltage", symbol: "Vo,min", expr: "max(Vneg, Vneg + swNeg + swing_derating)", unit: "V", reference: SWING_REFERENCE }, {}, g);
  const needHi = s.vRef + s.vPeak;
  const needLo = s.vRef - s.vPeak;
  const roomHi = s.vPos - vOmax;
  const roomLo = vOmin - s.vNeg;
  b.check(
    checkAtMost("swing.high", "Output swing, positive rail", s.vPeak, vOmax - s.vRef, {
      pass: () => `Output peak ${q(needHi, "V")} stays below the highest output ${q(vOmax, "V")} (V+ ${q(s.vPos, "V")} less ${q(roomHi, "V")} headroom).`,
      fail: () => `Output peak ${q(needHi, "V")} is above the highest output ${q(vOmax, "V")} (V+ ${q(s.vPos, "V")} less ${q(roomHi, "V")} headroom): the output clips. Raise V+ by at least ${q(needHi - vOmax, "V")}, reduce the amplitude to ${q(Math.max(0, vOmax - s.vRef), "V")} peak${s.advice} or choose a part with more output swing.`,
    }, { warnBelow: 0.05 }),
    checkAtMost("swing.low", "Output swing, negative rail", s.vPeak, s.vRef - vOmin, {
      pass: () => `Output trough ${q(needLo, "V")} stays above the lowest output ${q(vOmin, "V")} (V− ${q(s.vNeg, "V")} plus ${q(roomLo, "V")} headroom).`,
      fail: () => `Output trough ${q(needLo, "V")} is below the lowest output ${q(vOmin, "V")} (V− ${q(s.vNeg, "V")} plus ${q(roomLo, "V")} headroom): the output clips. Lower V− by at least ${q(vOmin - needLo, "V")}, reduce the amplitude to ${q(Math.max(0, s.vRef - vOmin), "V")} peak${s.advice} or choose a part with more output swing.`,
    }, { warnBelow: 0.05 }),
  );
  if (p.swingPos < 0 || p.swingNeg < 0) {
    b.check(
      makeCheck(
        "swing.part",
        "warning",
        "Output headroom in the part data",
        `The part's output headroom is entered as ${q(p.swingPos, "V")} (positive rail) and ${q(p.swingNeg, "V")} (negative rail); a negative value means beyond the rail, which an output stage cannot reach, so the output was limited to the rail. Check the part data: output headroom is 0 or more (input common-mode headroom may be negative).`,
      ),
    );
  }
  if (iSwing > s.vPeak / p.swingLoad) {
    const rEq = s.vPeak / iSwing;
    b.check(
      makeCheck(
        "swing.load",
        "warning",
        "Load heavier than the swing specification",
        `At its peak the output supplies ${q(iSwing, "A")} (an equivalent load of ${q(rEq, "Ω")}, from the load and the feedback network), more than the ${q(s.vPeak / p.swingLoad, "A")} the ${q(p.swingLoad, "Ω")} of the part's swing specification draws; the headroom was increased by Ro·ΔI = ${q(p.rout, "Ω")} × ${q(Math.max(0, iSwing - s.vPeak / p.swingLoad), "A")} = ${q(extra, "V")} on each rail. Confirm with the maker's swing-versus-load curve.`,
      ),
    );
  }
  b.check(
    checkAtMost("output.current", "Output current", ipk, p.ioutMax, {
      pass: () => `Peak output current ${q(ipk, "A")} is within the part's ${q(p.ioutMax, "A")}.`,
      fail: () => `Peak output current ${q(ipk, "A")} exceeds the part's ${q(p.ioutMax, "A")}; ${s.currentAdvice ?? "raise the load or feedback resistances or add a buffer"}.`,
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
