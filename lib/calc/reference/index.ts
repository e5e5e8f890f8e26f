/** Calculation types of the reference pack, in the order the "new calculation" list shows them. */
import type { CalcType } from "../core/types";

export const referenceTypes: CalcType[] = [];
