/**
 * reference.adjustable — divider of an adjustable (programmable) shunt reference:
 * Vout = Vref·(1 + R1/R2) + Iadj·R1, with R1 from the output to the adjust pin and R2 from the
 * adjust pin to the anode. Picks the best preferred-value pair and states the output error from
 * the reference's initial accuracy and drift, the resistor tolerance and the adjust-pin current,
 * worst case and RSS.
 *
 * Units: V, A, Ω, W, °C; accuracy and tolerances as fractions; tempco 1/°C.
 *
 * References:
 * [1] P. Horowitz, W. Hill, The Art of Electronics, 3rd ed., Cambridge 2015, ch. 9 (adjustable
 *     shunt references, Vout = Vref·(1 + R1/R2) + Iref·R1).
 * [2] IEC 60063:2015, preferred number series.
 * Worst-case and RSS combination of independent errors: common practice, no source.
 */
import { z } from "zod";
import type { CalcOutput, CalcType, FieldSpec } from "../core/types";
import { referenceParamsSchema } from "../core/parts";
import { bestPairBy, nearestPreferred, type ESeries } from "../core/eseries";
import { OutputBuilder } from "../core/output";
import { checkAtMost, makeCheck } from "../core/checks";
import { formatQuantity as q } from "../core/units";
import { numberBetween, oneOf, positiveAtMost } from "../core/schema";
import { demoReference, toRawPart } from "../core/demo-parts";

const SERIES = ["E24", "E48", "E96", "E192"] as const;

const REF = {
  vout: "Horowitz & Hill, The Art of Electronics, 3rd ed., ch. 9 (adjustable shunt reference, Vout = Vref·(1 + R1/R2) + Iref·R1)",
  wc: "common practice, no source (worst case: every error at its limit in the same direction)",
  rss: "common practice, no source (root-sum-square of independent error terms)",
  box: "Horowitz & Hill, The Art of Electronics, 3rd ed., ch. 9 (box method: TC = (Vmax − Vmin) / (Vnom·ΔT)); the full box height is the drift bound, and the box spans 25 °C, where the initial accuracy is stated",
};

/** Input schema of the adjustable reference divider, SI base units. */
export const adjustableSchema = z
  .object({
    reference: referenceParamsSchema,
    vOutTarget: positiveAtMost("Target output voltage", 1000, "V"),
    series: oneOf("Resistor series", SERIES),
    tolerance: numberBetween("Resistor tolerance", 0, 0.2, "%", "percent"),
    /** Lower divider resistor target; the design searches half a decade either side, Ω. */
    r2Target: numberBetween("Lower resistor target", 10, 10e6, "Ω"),
    tMin: numberBetween("Minimum temperature", -273, 300, "°C"),
    tMax: numberBetween("Maximum temperature", -273, 300, "°C"),
    /** Cathode (operating) current set by the bias resistor, A. */
    iCathode: positiveAtMost("Cathode current", 10, "A"),
    /** Allowed output error (worst case), fraction. */
    errorMax: positiveAtMost("Allowed output error", 0.5, "%", "percent"),
  })
  .superRefine((v, ctx) => {
    if (v.tMax < v.tMin) ctx.addIssue({ code: "custom", path: ["tMax"], message: "Maximum temperature must not be below the minimum temperature" });
  });

/** Parsed input of the adjustable reference divider (SI base units). */
export type AdjustableInput = z.output<typeof adjustableSchema>;

const fields: FieldSpec[] = [
  { kind: "part", key: "reference", label: "Adjustable reference", symbol: "U1", partKind: "reference", group: "Reference" },
  { kind: "quantity", key: "vOutTarget", label: "Target output voltage", symbol: "Vout,target", unit: "V", placeholder: "5", group: "Specification" },
  { kind: "quantity", key: "errorMax", label: "Allowed output error (worst case)", symbol: "εmax", unit: "%", scale: "percent", placeholder: "2", group: "Specification" },
  { kind: "quantity", key: "iCathode", label: "Cathode current", symbol: "IK", unit: "A", placeholder: "1m", group: "Specification" },
  { kind: "quantity", key: "tMin", label: "Minimum temperature", symbol: "Tmin", unit: "°C", placeholder: "-40", group: "Environment" },
  { kind: "quantity", key: "tMax", label: "Maximum temperature", symbol: "Tmax", unit: "°C", placeholder: "85", group: "Environment" },
  { kind: "select", key: "series", label: "Resistor series", symbol: "", group: "Divider", options: SERIES.map((s) => ({ value: s, label: s })) },
  { kind: "quantity", key: "tolerance", label: "Resistor tolerance", symbol: "tol", unit: "%", scale: "percent", placeholder: "0.1", group: "Divider" },
  { kind: "quantity", key: "r2Target", label: "Lower resistor target (R2)", symbol: "R2,target", unit: "Ω", placeholder: "10k", group: "Divider" },
];

const defaults = {
  reference: toRawPart(demoReference("LW-AR124")),
  vOutTarget: "5",
  errorMax: "2",
  iCathode: "1m",
  tMin: "-40",
  tMax: "85",
  series: "E96",
  tolerance: "0.1",
  r2Target: "10k",
};

/**
 * Compute the adjustable reference divider. Pure; never throws for schema-valid input.
 * @param input parsed input, SI base units
 */
export function computeAdjustable(input: AdjustableInput): CalcOutput {
  const r = input.reference;
  const series = input.series as ESeries;
  const tol = input.tolerance;
  const iadjNom = r.iAdj / 2;
  const b = new OutputBuilder({
    Vref: { value: r.vNom, unit: "V", symbol: "Vref" },
    acc: { value: r.accuracy, unit: "%", symbol: "εinit", scale: "percent" },
    TC: { value: r.tempco, unit: "ppm/°C", symbol: "TC", scale: "ppm" },
    Iadj: { value: r.iAdj, unit: "A", symbol: "Iadj,max" },
    Vt: { value: input.vOutTarget, unit: "V", symbol: "Vout,target" },
    tol: { value: tol, unit: "%", symbol: "tol", scale: "percent" },
    Tmin: { value: input.tMin, unit: "°C", symbol: "Tmin" },
    Tmax: { value: input.tMax, unit: "°C", symbol: "Tmax" },
    T25: { value: 25, unit: "°C", symbol: "25 °C" },
    IK: { value: input.iCathode, unit: "A", symbol: "IK" },
  });
  const f = b.sheet;
  if (r.topology !== "adjustable") {
    b.check(makeCheck("reference.topology", "fail", "Reference type", `${r.name} is a ${r.topology} reference without an adjust pin; choose an adjustable reference for a divider design.`, -1));
    return b.build();
  }
  if (!(input.vOutTarget > r.vNom * (1 + 1e-9))) {
    b.check(
      makeCheck(
        "vout.range",
        "fail",
        "Output voltage",
        `The target ${q(input.vOutTarget, "V")} is not above the internal reference ${q(r.vNom, "V")}: an adjustable shunt reference can only be set to Vref or higher (R1 = 0 gives Vref). Choose a reference with a lower Vref or a higher target.`,
        input.vOutTarget / r.vNom - 1,
      ),
    );
    return b.build();
  }

  const D = "Divider";
  const pair = bestPairBy(
    series,
    input.r2Target / Math.sqrt(10),
    input.r2Target * Math.sqrt(10),
    (r2) => (input.vOutTarget - r.vNom) / (r.vNom / r2 + iadjNom),
    (r1, r2) => (r.vNom * (1 + r1 / r2) + iadjNom * r1) / input.vOutTarget - 1,
  );
  const r2 = pair ? pair.b : nearestPreferred(input.r2Target, series);
  const r1 = pair ? pair.a : nearestPreferred(Math.max(1, ((input.vOutTarget - r.vNom) / r.vNom) * r2), series);
  f.define({ R1: { value: r1, unit: "Ω", symbol: "R1" }, R2: { value: r2, unit: "Ω", symbol: "R2" }, IadjN: { value: iadjNom, unit: "A", symbol: "Iadj,nom" } });
  b.result("r1", "Upper resistor (output to adjust pin)", "R1", r1, "Ω", D);
  b.result("r2", "Lower resistor (adjust pin to anode)", "R2", r2, "Ω", D);
  b.formula({ key: "iadj_nom", label: "Adjust-pin current used for the design (half the maximum)", symbol: "Iadj,nom", expr: "Iadj / 2", unit: "A" }, {}, D);
  b.formula({ key: "vout_nom", label: "Output voltage (nominal)", symbol: "Vout", expr: "Vref * (1 + R1 / R2) + iadj_nom * R1", unit: "V", reference: REF.vout }, {}, D);
  b.formula({ key: "error_design", label: "Error from preferred values", symbol: "εsnap", expr: "vout_nom / Vt - 1", unit: "%", scale: "percent", digits: 6 }, {}, D);
  b.formula({ key: "i_divider", label: "Divider current", symbol: "Idiv", expr: "Vref / R2", unit: "A" }, {}, D);

  const E = "Error budget";
  // The initial accuracy is the error at 25 °C, so the drift that adds to it is V(T) − V(25 °C):
  // the box must contain 25 °C even when the operating range does not.
  b.formula({ key: "dT_span", label: "Temperature span of the box (operating range and 25 °C)", symbol: "ΔT", expr: "max(Tmax, T25) - min(Tmin, T25)", unit: "°C", reference: REF.box }, {}, E);
  b.formula({ key: "drift", label: "Reference drift over the span (box method)", symbol: "εT", expr: "TC * dT_span", unit: "%", scale: "percent", reference: REF.box }, {}, E);
  const vMax = b.formula({ key: "vout_max", label: "Output voltage, worst case high", symbol: "Vout,max", expr: "Vref * (1 + acc) * (1 + drift) * (1 + R1 * (1 + tol) / (R2 * (1 - tol))) + Iadj * R1 * (1 + tol)", unit: "V", reference: REF.wc }, {}, E);
  const vMin = b.formula({ key: "vout_min", label: "Output voltage, worst case low", symbol: "Vout,min", expr: "Vref * (1 - acc) * (1 - drift) * (1 + R1 * (1 - tol) / (R2 * (1 + tol)))", unit: "V", reference: REF.wc }, {}, E);
  const errWc = b.formula({ key: "error_wc", label: "Output error, worst case (against the target)", symbol: "εwc", expr: "max(vout_max / Vt - 1, 1 - vout_min / Vt)", unit: "%", scale: "percent", reference: REF.wc }, {}, E);
  b.formula({ key: "s_r1", label: "Error from R1 tolerance", symbol: "εR1", expr: "R1 * (Vref / R2 + iadj_nom) / vout_nom * tol", unit: "%", scale: "percent" }, {}, E);
  b.formula({ key: "s_r2", label: "Error from R2 tolerance", symbol: "εR2", expr: "Vref * R1 / R2 / vout_nom * tol", unit: "%", scale: "percent" }, {}, E);
  b.formula({ key: "s_ref", label: "Error from Vref (initial and drift)", symbol: "εVref", expr: "Vref * (1 + R1 / R2) / vout_nom * sqrt(acc^2 + drift^2)", unit: "%", scale: "percent" }, {}, E);
  b.formula({ key: "s_iadj", label: "Error from the adjust-pin current spread", symbol: "εIadj", expr: "iadj_nom * R1 / vout_nom", unit: "%", scale: "percent" }, {}, E);
  const errRss = b.formula({ key: "error_rss", label: "Output error, RSS (plus the preferred-value error)", symbol: "εrss", expr: "abs(error_design) + sqrt(s_r1^2 + s_r2^2 + s_ref^2 + s_iadj^2)", unit: "%", scale: "percent", reference: REF.rss }, {}, E);

  const pct = (v: number) => q(v, "%", { scale: "percent" });
  // Worst-case error of this pair at resistor tolerance t (the vout_max / vout_min expressions),
  // and the tolerance that just meets a limit (bisection; the error grows with t).
  const drift = f.value("drift");
  const errorAt = (t: number) => {
    const hi = r.vNom * (1 + r.accuracy) * (1 + drift) * (1 + (r1 * (1 + t)) / (r2 * (1 - t))) + r.iAdj * r1 * (1 + t);
    const lo = r.vNom * (1 - r.accuracy) * (1 - drift) * (1 + (r1 * (1 - t)) / (r2 * (1 + t)));
    return Math.max(hi / input.vOutTarget - 1, 1 - lo / input.vOutTarget);
  };
  const toleranceFor = (limit: number): number => {
    if (!(errorAt(0) < limit)) return NaN;
    let a = 0;
    let c = 0.2;
    if (errorAt(c) <= limit) return c;
    for (let i = 0; i < 60; i++) {
      const m = (a + c) / 2;
      if (errorAt(m) <= limit) a = m;
      else c = m;
    }
    return a;
  };
  b.check(
    checkAtMost("error.wc", "Output error", errWc, input.errorMax, {
      pass: () => `Worst-case output ${q(vMin, "V")} to ${q(vMax, "V")} (error ${pct(errWc)}, RSS ${pct(errRss)}) is within the allowed ${pct(input.errorMax)} of ${q(input.vOutTarget, "V")}.`,
      fail: () => {
        const head = `Worst-case output ${q(vMin, "V")} to ${q(vMax, "V")} (error ${pct(errWc)}, RSS ${pct(errRss)}) exceeds the allowed ${pct(input.errorMax)} of ${q(input.vOutTarget, "V")}`;
        const tNeed = toleranceFor(input.errorMax);
        const refPart = `the reference's accuracy and drift alone give ±${pct(r.accuracy + f.value("drift"))}`;
        if (Number.isFinite(tNeed)) {
          return `${head}; ${refPart}, so resistors of ${q(tNeed, "%", { scale: "percent", digits: 2 })} or better would meet it (${pct(tol)} now).`;
        }
        return `${head}; ${refPart}, and with exact resistors the error would still be ${pct(errorAt(0))}: the reference's own accuracy and drift dominate — choose a better grade, trim the output, or narrow the temperature range.`;
      },
    }),
  );
  const iDiv = f.value("i_divider");
  b.check(
    r.iAdj <= iDiv / 100
      ? makeCheck("divider.current", "pass", "Divider current", `Divider current ${q(iDiv, "A")} is at least 100 × the adjust-pin current ${q(r.iAdj, "A")}, so Iadj adds only ${pct(f.value("s_iadj"))}.`, 1 - (100 * r.iAdj) / iDiv)
      : makeCheck("divider.current", "warning", "Divider current", `Divider current ${q(iDiv, "A")} is less than 100 × the adjust-pin current ${q(r.iAdj, "A")} (common practice, no source); its spread adds ${pct(f.value("s_iadj"))} — lower R2 to make the output less sensitive to Iadj.`, 1 - (100 * r.iAdj) / iDiv),
  );
  const pk = b.formula({ key: "p_ref", label: "Reference dissipation at the cathode current", symbol: "PK", expr: "vout_max * IK", unit: "W" }, {}, E);
  b.check(
    input.iCathode < r.iMin
      ? makeCheck("current.cathode", "fail", "Cathode current", `Cathode current ${q(input.iCathode, "A")} is below the minimum ${q(r.iMin, "A")}: the reference does not regulate. Lower the bias resistor.`, input.iCathode / r.iMin - 1)
      : input.iCathode > r.iMax
        ? makeCheck("current.cathode", "fail", "Cathode current", `Cathode current ${q(input.iCathode, "A")} is above the maximum ${q(r.iMax, "A")}; raise the bias resistor.`, 1 - input.iCathode / r.iMax)
        : makeCheck("current.cathode", "pass", "Cathode current", `Cathode current ${q(input.iCathode, "A")} is within ${q(r.iMin, "A")} to ${q(r.iMax, "A")}.`, Math.min(input.iCathode / r.iMin - 1, 1 - input.iCathode / r.iMax)),
    checkAtMost("power.ref", "Reference dissipation", pk, r.pMax, {
      pass: () => `The reference dissipates ${q(pk, "W")}, within its ${q(r.pMax, "W")} rating.`,
      fail: () => `The reference dissipates ${q(pk, "W")}, above its ${q(r.pMax, "W")} rating; lower the cathode current.`,
    }),
  );

  b.tables.push({
    id: "error-budget",
    title: "Output error budget",
    columns: [
      { key: "term", label: "Term" },
      { key: "error", label: "Error", align: "right" },
    ],
    rows: [
      { term: "Preferred values (design)", error: pct(f.value("error_design")) },
      { term: `R1 tolerance (${pct(tol)})`, error: pct(f.value("s_r1")) },
      { term: `R2 tolerance (${pct(tol)})`, error: pct(f.value("s_r2")) },
      { term: "Vref initial accuracy and drift", error: pct(f.value("s_ref")) },
      { term: "Adjust-pin current spread", error: pct(f.value("s_iadj")) },
      { term: "Total, RSS", error: pct(errRss) },
      { term: "Total, worst case", error: pct(errWc) },
    ],
  });
  b.components.push(
    { ref: "R1", kind: "resistor", value: r1, display: q(r1, "Ω"), series, tolerance: tol, role: "Upper divider resistor (output to adjust pin)" },
    { ref: "R2", kind: "resistor", value: r2, display: q(r2, "Ω"), series, tolerance: tol, role: "Lower divider resistor (adjust pin to anode)" },
    { ref: "U1", kind: "reference", value: r.vNom, display: r.name, role: "Adjustable shunt reference" },
  );
  b.assumptions.push(
    "The adjust-pin current lies between 0 and the stated value; the design uses half of it, so its spread is ± half (stated value taken as a maximum).",
    "Reference drift is bounded by the full box height TC·ΔT (box method, conservative), where ΔT spans the operating range and 25 °C, the temperature of the initial accuracy; the part's TC is taken to hold over that span. Resistor temperature coefficients are not included.",
    "The reference's change with cathode current (dynamic impedance) and its long-term drift are not included; see the ADC reference budget.",
  );
  return b.build();
}

/** The adjustable reference divider calculation type. */
export const adjustableReference: CalcType<typeof adjustableSchema> = {
  id: "reference.adjustable",
  pack: "reference",
  title: "Adjustable reference divider",
  summary: "Chooses the preferred-value divider of an adjustable shunt reference and states its output error, worst case and RSS.",
  version: "1.0.2",
  schema: adjustableSchema,
  fields,
  defaults,
  compute: computeAdjustable,
};
