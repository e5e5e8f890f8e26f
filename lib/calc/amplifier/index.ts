/** Calculation types of the amplifier pack, in the order the "new calculation" list shows them. */
import type { CalcType } from "../core/types";
import { gainStage } from "./gain-stage";
import { differenceAmplifier } from "./difference";
import { powerStage } from "./power-stage";

export const amplifierTypes: CalcType[] = [gainStage, differenceAmplifier, powerStage] as unknown as CalcType[];
