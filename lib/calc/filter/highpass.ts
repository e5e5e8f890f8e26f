/**
 * filter.highpass — active high-pass filter, orders 1–8, Butterworth, Bessel or Chebyshev
 * (0.5/1/2/3 dB), realised as cascaded unity-gain or equal-component Sallen-Key or
 * multiple-feedback sections; E-series values, finite-GBW response, worst case and Monte Carlo.
 * Engine: compute.ts; inputs: schema.ts (SI units).
 */
import type { CalcType } from "../core/types";
import { demoOpAmp, toRawPart } from "../core/demo-parts";
import { computeFilter, filterTypeNetlist } from "./compute";
import { cascadeFields, cascadeSchema } from "./schema";

const schema = cascadeSchema("highpass");

/** The high-pass calculation type. */
export const highpassType: CalcType<typeof schema> = {
  id: "filter.highpass",
  pack: "filter",
  title: "Active high-pass filter",
  summary: "Designs a high-pass filter of order 1 to 8 as cascaded op-amp sections with preferred component values, and checks its response, op-amp and tolerance spread.",
  version: "1.0.1",
  schema,
  fields: cascadeFields("highpass"),
  defaults: {
    response: "butterworth",
    order: 4,
    rippleDb: 1,
    cutoff: "100",
    cutoffMeaning: "-3db",
    fixGain: true,
    gain: "1",
    gainSharing: "equal",
    topology: "sk-unity",
    firstOrder: "rc-buffer",
    resistorLevel: "10k",
    capSeries: "E12",
    resSeries: "E96",
    resTolerance: "1",
    capTolerance: "2",
    passbandFreq: "330",
    passbandRippleMax: "0.5",
    frequencyTolerance: "5",
    gainToleranceDb: "0.5",
    stopbandFreq: "20",
    stopbandAttenMin: "40",
    opamp: toRawPart(demoOpAmp("LW-OA320")),
    supplyPos: "5",
    supplyNeg: "0",
    inputAmplitude: "1",
    mcTrials: 2000,
    mcDistribution: "uniform",
    mcSeed: 1,
  },
  compute: (input) => computeFilter("highpass", input),
  netlist: (input, model) => filterTypeNetlist("highpass", input, model),
};
