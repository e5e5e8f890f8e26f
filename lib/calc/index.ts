/**
 * Public API of the Loopwright calculation engine. Pure TypeScript, SI base units throughout.
 * See lib/calc/README.md for the units, each calculation type's formulas and references.
 */
export * from "./core/types";
export * from "./core/parts";
export * from "./core/units";
export * from "./core/eseries";
export * from "./core/formula";
export * from "./core/checks";
export * from "./core/output";
export * from "./core/inputs";
export * from "./core/demo-parts";
export { calcTypes, getCalcType, calcTypesOfPack } from "./registry";
export * from "./core/schema";
