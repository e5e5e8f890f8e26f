/** Calculation types of the reference pack, in the order the "new calculation" list shows them. */
import type { CalcType } from "../core/types";
import { shuntReference } from "./shunt";
import { adjustableReference } from "./adjustable";
import { adcReferenceBudget } from "./adc-budget";

export const referenceTypes: CalcType[] = [shuntReference, adjustableReference, adcReferenceBudget] as unknown as CalcType[];
