/**
 * filter.lowpass — active low-pass filter, orders 1–8, Butterworth, Bessel or Chebyshev
 * (0.5/1/2/3 dB), realised as cascaded unity-gain or equal-component Sallen-Key or
 * multiple-feedback sections; E-series values, finite-GBW response, worst case and Monte Carlo.
 * Engine: compute.ts; inputs: schema.ts (SI units).
 */
import type { CalcType } from "../core/types";
import { computeFilter, filterTypeNetlist } from "./compute";
import { cascadeDefaults, cascadeFields, cascadeSchema } from "./schema";

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
  defaults: cascadeDefaults("lowpass"),
  compute: (input) => computeFilter("lowpass", input),
  netlist: (input, model) => filterTypeNetlist("lowpass", input, model),
};
