/** Calculation types of the amplifier pack, in the order the "new calculation" list shows them. */
import type { CalcType } from "../core/types";

export const amplifierTypes: CalcType[] = [];
