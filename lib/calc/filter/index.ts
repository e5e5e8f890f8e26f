/** Calculation types of the filter pack, in the order the "new calculation" list shows them. */
import type { CalcType } from "../core/types";
import { bandpassType } from "./bandpass";
import { highpassType } from "./highpass";
import { lowpassType } from "./lowpass";

/** The filter pack's calculation types (one signature pattern: same fields, same compute path). */
export const filterTypes: CalcType[] = [lowpassType, highpassType, bandpassType];

export { lowpassType, highpassType, bandpassType };
export { designFilter, designCircuit, type FilterDesign, type FilterSpec } from "./design";
export { designPrototype, type Prototype } from "./prototype";
export { monteCarlo, runMonteCarlo, worstCase, type MonteCarloResult, type MonteCarloOptions, type MonteCarloControl } from "./tolerance";
export { designFromInput, seriesPicker } from "./compute";
