/**
 * filter.lowpass — active low-pass filter, orders 1–8, Butterworth, Bessel or Chebyshev
 * (0.5/1/2/3 dB), realised as cascaded unity-gain or equal-component Sallen-Key or
 * multiple-feedback sections; E-series values, finite-GBW response, worst case and Monte Carlo.
 * Engine: compute.ts; inputs: schema.ts (SI units).
 */
import type { CalcType } from "../core/types";
import { demoOpAmp, toRawPart } from "../core/demo-parts";
import { computeFilter, filterTypeNetlist } from "./compute";
import { cascadeFields, cascadeSchema } from "./schema";

const schema = cascadeSchema("lowpass");

/** The low-pass calculation type. */
export const lowpassType: CalcType<typeof schema> = {
  id: "filter.lowpass",
  pack: "filter",
  title: "Active low-pass filter",
  summary: "Designs a low-pass filter of order 1 to 8 as cascaded op-amp sections with preferred component values, and checks its response, op-amp and tolerance spread.",
  version: "1.0.1",
  schema,
  fields: cascadeFields("lowpass"),
  defaults: {
    response: "butterworth",
    order: 4,
    rippleDb: 1,
    cutoff: "1k",
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
    passbandFreq: "300",
    passbandRippleMax: "0.5",
    frequencyTolerance: "5",
    gainToleranceDb: "0.5",
    stopbandFreq: "5k",
    stopbandAttenMin: "40",
    opamp: toRawPart(demoOpAmp("LW-OA320")),
    supplyPos: "5",
    supplyNeg: "0",
    inputAmplitude: "1",
    mcTrials: 2000,
    mcDistribution: "uniform",
    mcSeed: 1,
  },
  compute: (input) => computeFilter("lowpass", input),
  netlist: (input, model) => filterTypeNetlist("lowpass", input, model),
};
