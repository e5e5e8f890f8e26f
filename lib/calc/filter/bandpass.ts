/**
 * filter.bandpass — multiple-feedback band-pass section (centre frequency, Q, centre gain) with
 * E-series values, finite-GBW response, op-amp gain check, worst case and Monte Carlo.
 * Engine: compute.ts; inputs: schema.ts (SI units).
 */
import type { CalcType } from "../core/types";
import { demoOpAmp, toRawPart } from "../core/demo-parts";
import { computeFilter, filterTypeNetlist } from "./compute";
import { bandpassFields, bandpassSchema } from "./schema";

/** The band-pass calculation type (one multiple-feedback section). */
export const bandpassType: CalcType<typeof bandpassSchema> = {
  id: "filter.bandpass",
  pack: "filter",
  title: "Active band-pass filter (multiple feedback)",
  summary: "Designs a multiple-feedback band-pass section for a centre frequency, Q and centre gain with preferred values, and checks its response, op-amp gain and tolerance spread.",
  version: "1.0.1",
  schema: bandpassSchema,
  fields: bandpassFields,
  defaults: {
    centre: "1k",
    q: "5",
    gain: "2",
    resistorLevel: "10k",
    capSeries: "E12",
    resSeries: "E96",
    resTolerance: "1",
    capTolerance: "2",
    frequencyTolerance: "5",
    gainToleranceDb: "0.5",
    stopbandFreq: "3k",
    stopbandAttenMin: "20",
    opamp: toRawPart(demoOpAmp("LW-OA320")),
    supplyPos: "5",
    supplyNeg: "0",
    inputAmplitude: "0.5",
    mcTrials: 2000,
    mcDistribution: "uniform",
    mcSeed: 1,
  },
  compute: (input) => computeFilter("bandpass", input),
  netlist: (input, model) => filterTypeNetlist("bandpass", input, model),
};
