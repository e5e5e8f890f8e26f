/** Calculation types of the filter pack, in the order the "new calculation" list shows them. */
import type { CalcType } from "../core/types";

export const filterTypes: CalcType[] = [];
