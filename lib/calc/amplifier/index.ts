/** Calculation types of the amplifier pack, in the order the "new calculation" list shows them. */
import type { CalcType } from "../core/types";
import { gainStage } from "./gain-stage";

export const amplifierTypes: CalcType[] = [gainStage as unknown as CalcType];
