/**
 * The registry of every calculation type, keyed by id. The app, the reports and the tests find
 * types only through here.
 */
import type { CalcType, PackId } from "./core/types";
import { amplifierTypes } from "./amplifier";
import { filterTypes } from "./filter";
import { referenceTypes } from "./reference";

export const calcTypes: ReadonlyArray<CalcType> = [...amplifierTypes, ...filterTypes, ...referenceTypes];

const byId = new Map(calcTypes.map((t) => [t.id, t]));

/** The calculation type with this id, or undefined. */
export function getCalcType(id: string): CalcType | undefined {
  return byId.get(id);
}

/** The calculation types of one pack, in display order. */
export function calcTypesOfPack(pack: PackId): CalcType[] {
  return calcTypes.filter((t) => t.pack === pack);
}
