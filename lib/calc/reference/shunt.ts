/**
 * reference.shunt — bias resistor of a shunt (or Zener) reference fed from a varying supply into
 * a varying load.
 *
 * The resistor must pass the reference's minimum current plus the largest load current at the
 * lowest supply and the highest reference voltage, with the resistor at the top of its
 * tolerance: R·(1 + tol) ≤ Rmax = (Vs,min − Vz,max) / (Iz,min + IL,max). The preferred value is
 * therefore rounded down. The worst case for the reference is then the highest supply, the
 * lowest reference voltage, the resistor at the bottom of its tolerance and the smallest load.
 *
 * Units: V, A, Ω, W.
 *
 * References:
 * [1] R. Boylestad, L. Nashelsky, Electronic Devices and Circuit Theory, ch. "Diode
 *     Applications", Zener diodes (fixed and variable Vi and RL; IZM limit).
 * [2] P. Horowitz, W. Hill, The Art of Electronics, 3rd ed., Cambridge 2015, ch. 9 (voltage
 *     references, shunt references and their bias resistor).
 * [3] IEC 60063:2015, preferred number series.
 */
import { z } from "zod";
import type { CalcOutput, CalcType, FieldSpec } from "../core/types";
import { referenceParamsSchema } from "../core/parts";
import { nextPreferredDown, type ESeries } from "../core/eseries";
import { OutputBuilder, linspace } from "../core/output";
import { checkAtLeast, checkAtMost, makeCheck } from "../core/checks";
import { formatQuantity as q } from "../core/units";
import { numberBetween, oneOf, positiveAtMost } from "../core/schema";
import { demoReference, toRawPart } from "../core/demo-parts";

const SERIES = ["E6", "E12", "E24", "E48", "E96", "E192"] as const;

const REF = {
  rmax: "Boylestad & Nashelsky, Electronic Devices and Circuit Theory, ch. Diode Applications (Zener regulator: R ≤ (Vi,min − VZ)/(IZ,min + IL,max)); Horowitz & Hill 3rd ed., ch. 9",
  izmax: "Boylestad & Nashelsky, Electronic Devices and Circuit Theory, ch. Diode Applications (Zener regulator: IZ = IR − IL ≤ IZM)",
  power: "P = V·I; P = V²/R",
};

/** Input schema of the shunt reference bias calculation, SI base units. */
export const shuntSchema = z
  .object({
    reference: referenceParamsSchema,
    vSupplyMin: positiveAtMost("Lowest supply voltage", 10000, "V"),
    vSupplyMax: positiveAtMost("Highest supply voltage", 10000, "V"),
    iLoadMin: numberBetween("Smallest load current", 0, 100, "A"),
    iLoadMax: numberBetween("Largest load current", 0, 100, "A"),
    series: oneOf("Resistor series", SERIES),
    tolerance: numberBetween("Resistor tolerance", 0, 0.2, "%", "percent"),
    /** Power rating of the bias resistor, W. */
    resistorRating: positiveAtMost("Resistor power rating", 1000, "W"),
  })
  .superRefine((v, ctx) => {
    if (v.vSupplyMax < v.vSupplyMin) ctx.addIssue({ code: "custom", path: ["vSupplyMax"], message: "Highest supply voltage must not be below the lowest" });
    if (v.iLoadMax < v.iLoadMin) ctx.addIssue({ code: "custom", path: ["iLoadMax"], message: "Largest load current must not be below the smallest" });
  });

/** Parsed input of the shunt reference calculation (SI base units). */
export type ShuntInput = z.output<typeof shuntSchema>;

const fields: FieldSpec[] = [
  { kind: "part", key: "reference", label: "Shunt reference or Zener", symbol: "D1", partKind: "reference", group: "Reference" },
  { kind: "quantity", key: "vSupplyMin", label: "Lowest supply voltage", symbol: "Vs,min", unit: "V", placeholder: "10.8", group: "Supply and load" },
  { kind: "quantity", key: "vSupplyMax", label: "Highest supply voltage", symbol: "Vs,max", unit: "V", placeholder: "13.2", group: "Supply and load" },
  { kind: "quantity", key: "iLoadMin", label: "Smallest load current", symbol: "IL,min", unit: "A", placeholder: "0", group: "Supply and load" },
  { kind: "quantity", key: "iLoadMax", label: "Largest load current", symbol: "IL,max", unit: "A", placeholder: "1m", group: "Supply and load" },
  { kind: "select", key: "series", label: "Resistor series", symbol: "", group: "Bias resistor", options: SERIES.map((s) => ({ value: s, label: s })) },
  { kind: "quantity", key: "tolerance", label: "Resistor tolerance", symbol: "tol", unit: "%", scale: "percent", placeholder: "1", group: "Bias resistor" },
  { kind: "quantity", key: "resistorRating", label: "Resistor power rating", symbol: "PR,rated", unit: "W", placeholder: "0.25", group: "Bias resistor" },
];

const defaults = {
  reference: toRawPart(demoReference("LW-SR25")),
  vSupplyMin: "4.5",
  vSupplyMax: "5.5",
  iLoadMin: "0",
  iLoadMax: "1m",
  series: "E24",
  tolerance: "1",
  resistorRating: "0.25",
};

/**
 * Compute the shunt reference bias. Pure; never throws for schema-valid input.
 * @param input parsed input, SI base units
 */
export function computeShunt(input: ShuntInput): CalcOutput {
  const r = input.reference;
  const series = input.series as ESeries;
  const tol = input.tolerance;
  const b = new OutputBuilder({
    Vnom: { value: r.vNom, unit: "V", symbol: "Vz" },
    acc: { value: r.accuracy, unit: "%", symbol: "εinit", scale: "percent" },
    IzMin: { value: r.iMin, unit: "A", symbol: "Iz,min" },
    IzMax: { value: r.iMax, unit: "A", symbol: "Iz,max" },
    Pmax: { value: r.pMax, unit: "W", symbol: "Pz,max" },
    Zd: { value: r.zDyn, unit: "Ω", symbol: "Zd" },
    VsMin: { value: input.vSupplyMin, unit: "V", symbol: "Vs,min" },
    VsMax: { value: input.vSupplyMax, unit: "V", symbol: "Vs,max" },
    ILmin: { value: input.iLoadMin, unit: "A", symbol: "IL,min" },
    ILmax: { value: input.iLoadMax, unit: "A", symbol: "IL,max" },
    tol: { value: tol, unit: "%", symbol: "tol", scale: "percent" },
  });
  const f = b.sheet;

  if (r.topology === "series") {
    b.check(makeCheck("reference.topology", "fail", "Reference type", `${r.name} is a series (three-terminal) reference: it is not biased by a shunt resistor. Use a shunt or Zener reference here, or check the series reference with the ADC reference budget.`, -1));
    b.assumptions.push("A series reference needs no bias resistor; nothing was designed.");
    return b.build();
  }

  const D = "Bias resistor";
  const vzHi = b.formula({ key: "vz_max", label: "Highest reference voltage (initial accuracy)", symbol: "Vz,max", expr: "Vnom * (1 + acc)", unit: "V" }, {}, D);
  b.formula({ key: "vz_min", label: "Lowest reference voltage (initial accuracy)", symbol: "Vz,min", expr: "Vnom * (1 - acc)", unit: "V" }, {}, D);
  if (!(input.vSupplyMin > vzHi)) {
    b.check(
      makeCheck(
        "supply.headroom",
        "fail",
        "Supply headroom",
        `The lowest supply ${q(input.vSupplyMin, "V")} does not exceed the highest reference voltage ${q(vzHi, "V")}: no resistor can keep the reference in regulation. Raise the minimum supply above ${q(vzHi, "V")} plus the drop the resistor needs, or use a lower-voltage reference.`,
        input.vSupplyMin / vzHi - 1,
      ),
    );
    return b.build();
  }
  if (!(r.iMin + input.iLoadMax > 0)) {
    b.check(makeCheck("resistor.design", "fail", "Bias resistor", `With no minimum reference current and no load current there is nothing to size the resistor for; enter the reference's minimum operating current (Iz,min, now ${q(r.iMin, "A")}) or the load current.`, -1));
    return b.build();
  }
  b.formula({ key: "r_max", label: "Largest allowed resistor", symbol: "Rmax", expr: "(VsMin - vz_max) / (IzMin + ILmax)", unit: "Ω", reference: REF.rmax }, {}, D);
  b.formula({ key: "r_max_tol", label: "Largest nominal value with tolerance", symbol: "Rmax/(1 + tol)", expr: "r_max / (1 + tol)", unit: "Ω", reference: REF.rmax }, {}, D);
  const rIdealNom = f.value("r_max_tol");
  const rSel = nextPreferredDown(Math.max(rIdealNom, 1e-6), series);
  f.define({ R: { value: rSel, unit: "Ω", symbol: "R" } });
  b.result("r_selected", `Bias resistor (${series}, rounded down)`, "R", rSel, "Ω", D);

  const W = "Worst case";
  const izLo = b.formula({ key: "iz_min_wc", label: "Reference current, worst case low (Vs,min, IL,max, R high)", symbol: "Iz,lo", expr: "(VsMin - vz_max) / (R * (1 + tol)) - ILmax", unit: "A", reference: REF.izmax }, {}, W);
  const izHi = b.formula({ key: "iz_max_wc", label: "Reference current, worst case high (Vs,max, IL,min, R low)", symbol: "Iz,hi", expr: "(VsMax - vz_min) / (R * (1 - tol)) - ILmin", unit: "A", reference: REF.izmax }, {}, W);
  const pz = b.formula({ key: "p_ref_max", label: "Reference dissipation, worst case", symbol: "Pz", expr: "vz_max * iz_max_wc", unit: "W", reference: REF.power }, {}, W);
  const pr = b.formula({ key: "p_res_max", label: "Resistor dissipation, worst case", symbol: "PR", expr: "(VsMax - vz_min)^2 / (R * (1 - tol))", unit: "W", reference: REF.power }, {}, W);
  const prShort = b.formula({ key: "p_res_short", label: "Resistor dissipation with the output shorted", symbol: "PR,short", expr: "VsMax^2 / (R * (1 - tol))", unit: "W", reference: REF.power }, {}, W);
  const dv = b.formula({ key: "dv_regulation", label: "Output change over supply and load (Zd·ΔIz)", symbol: "ΔVz", expr: "Zd * (iz_max_wc - iz_min_wc)", unit: "V" }, {}, W);

  // When Rmax is itself a preferred value, R = Rmax meets Iz,min exactly; a round-off of 1e-16
  // must not turn that into "60 µA is below its minimum 60 µA". The slack (1e-9 of the current
  // through R) is far below any resistor tolerance.
  const roundOff = 1e-9 * (r.iMin + input.iLoadMax);
  b.check(
    checkAtLeast("current.min", "Minimum reference current", izLo + roundOff, r.iMin, {
      pass: () => `At the lowest supply and the largest load the reference still gets ${q(izLo, "A")}, at least its minimum ${q(r.iMin, "A")} (R = ${q(rSel, "Ω")} at +${q(tol, "%", { scale: "percent" })}).`,
      fail: () => `At the lowest supply and the largest load the reference gets only ${q(izLo, "A")}, below its minimum ${q(r.iMin, "A")}: it drops out of regulation. Lower R or raise the minimum supply.`,
    }),
    checkAtMost("current.max", "Maximum reference current", izHi, r.iMax, {
      pass: () => `At the highest supply and the smallest load the reference carries ${q(izHi, "A")}, within its maximum ${q(r.iMax, "A")}.`,
      fail: () => `At the highest supply and the smallest load the reference carries ${q(izHi, "A")}, above its maximum ${q(r.iMax, "A")}. With R = ${q(rSel, "Ω")} the supply may rise only to ${q(rSel * (1 - tol) * (r.iMax + input.iLoadMin) + f.value("vz_min"), "V")}; the range ${q(input.vSupplyMin, "V")} to ${q(input.vSupplyMax, "V")} with a load swing of ${q(input.iLoadMax - input.iLoadMin, "A")} is too wide for a resistor feed: pre-regulate the supply, keep a minimum load, feed the reference from a current source, or use a series reference.`,
    }, { warnBelow: 0.1 }),
    checkAtMost("power.ref", "Reference dissipation", pz, r.pMax, {
      pass: () => `The reference dissipates at most ${q(pz, "W")}, within its ${q(r.pMax, "W")} rating.`,
      fail: () => `The reference dissipates up to ${q(pz, "W")}, above its ${q(r.pMax, "W")} rating; raise R (if the minimum current allows), narrow the supply range or choose a higher-power part.`,
    }, { warnBelow: 0.2 }),
    checkAtMost("power.resistor", "Resistor dissipation", pr, input.resistorRating, {
      pass: () => `The resistor dissipates at most ${q(pr, "W")}, ${q(pr / input.resistorRating, "%", { scale: "percent", digits: 3 })} of its ${q(input.resistorRating, "W")} rating.`,
      warn: () => `The resistor dissipates up to ${q(pr, "W")}, more than half its ${q(input.resistorRating, "W")} rating; use a resistor rated at least ${q(2 * pr, "W")} (50 % derating, common practice).`,
      fail: () => `The resistor dissipates up to ${q(pr, "W")}, above its ${q(input.resistorRating, "W")} rating; use a resistor rated at least ${q(2 * pr, "W")}.`,
    }, { warnBelow: 0.5 }),
  );
  if (prShort > input.resistorRating) {
    b.check(makeCheck("power.short", "warning", "Output short circuit", `With the reference output shorted the resistor dissipates ${q(prShort, "W")}, above its ${q(input.resistorRating, "W")} rating; size it for the fault or protect the output.`));
  }

  // Plot: reference current over the supply range, at both load extremes (nominal R and Vz).
  const vs = linspace(input.vSupplyMin, input.vSupplyMax > input.vSupplyMin ? input.vSupplyMax : input.vSupplyMin * 1.0001, 41);
  const izAt = (v: number, il: number) => (v - r.vNom) / rSel - il;
  b.plots.push({
    kind: "line",
    id: "reference-current",
    title: "Reference current over the supply range (nominal R and Vz)",
    x: { label: "Supply voltage", unit: "V", scale: "linear" },
    y: { label: "Reference current", unit: "A", scale: "linear" },
    series: [
      { name: `Load ${q(input.iLoadMin, "A")}`, role: "real", x: vs, y: vs.map((v) => izAt(v, input.iLoadMin)) },
      { name: `Load ${q(input.iLoadMax, "A")}`, role: "other", x: vs, y: vs.map((v) => izAt(v, input.iLoadMax)) },
      { name: "Minimum current", role: "limit", x: [vs[0], vs[vs.length - 1]], y: [r.iMin, r.iMin] },
      { name: "Maximum current", role: "limit", x: [vs[0], vs[vs.length - 1]], y: [r.iMax, r.iMax] },
    ],
  });
  b.components.push(
    { ref: "R1", kind: "resistor", value: rSel, display: q(rSel, "Ω"), series, tolerance: tol, role: `Bias resistor, rated ≥ ${q(Math.max(2 * pr, prShort > input.resistorRating ? prShort : 0), "W")}` },
    { ref: "D1", kind: "reference", value: r.vNom, display: r.name, role: "Shunt reference" },
  );
  b.assumptions.push(
    "The reference voltage lies within its initial accuracy; its change with current (Zd·ΔIz) is reported separately and not added to the current limits.",
    "Resistor tolerance is applied in the unfavourable direction for each limit: high for the minimum current, low for the maximum current and dissipation.",
    "Temperature drift of the reference and the resistor's temperature coefficient are not included in the current limits.",
    `The preferred value is rounded down (R·(1 + tol) ≤ Rmax) so the minimum current is met; output change over the operating range ${q(dv, "V")}.`,
  );
  if (input.vSupplyMax > 50) {
    b.cautions.push(`The supply reaches ${q(input.vSupplyMax, "V")}: treat the circuit as hazardous voltage and follow the creepage, clearance and insulation rules of the applicable standard and local codes.`);
  }
  if (pr > 0.5 || pz > 0.5) {
    b.cautions.push("The resistor or the reference runs hot at worst case; keep it away from heat-sensitive parts and check the maker's derating curve at the highest ambient temperature.");
  }
  return b.build();
}

/** The shunt reference bias calculation type. */
export const shuntReference: CalcType<typeof shuntSchema> = {
  id: "reference.shunt",
  pack: "reference",
  title: "Shunt / Zener reference bias resistor",
  summary: "Chooses the bias resistor of a shunt or Zener reference over the supply and load range and checks its current and dissipation limits.",
  version: "1.0.2",
  schema: shuntSchema,
  fields,
  defaults,
  compute: computeShunt,
};
