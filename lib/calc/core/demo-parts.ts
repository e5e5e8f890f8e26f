/**
 * A small demo parts library with invented generic names (never real part numbers or brands).
 * Parameter values are realistic for each class of part, in SI base units (see parts.ts).
 * New workspaces are seeded with these; calculation defaults use them.
 */
import type { RawPart } from "./types";
import { opAmpParamsSchema, referenceParamsSchema, type OpAmpParams, type ReferenceParams } from "./parts";

/** Demo op-amps, one of each common class. */
export const DEMO_OPAMPS: readonly OpAmpParams[] = [
  {
    name: "LW-OA110 general-purpose bipolar ±15 V",
    supplyMin: 10, supplyMax: 36, gbw: 1e6, slewRate: 0.5e6, aolDb: 106,
    vos: 5e-3, vosDrift: 15e-6, ib: 500e-9, ios: 200e-9,
    en: 20e-9, in: 0.5e-12, enCorner: 200,
    vicmNeg: 3, vicmPos: 3, swingNeg: 2, swingPos: 2, swingLoad: 2e3, ioutMax: 20e-3, rout: 75,
  },
  {
    name: "LW-OA220 JFET-input audio ±15 V",
    supplyMin: 10, supplyMax: 36, gbw: 4e6, slewRate: 13e6, aolDb: 106,
    vos: 3e-3, vosDrift: 10e-6, ib: 200e-12, ios: 100e-12,
    en: 18e-9, in: 0.01e-12, enCorner: 100,
    vicmNeg: 4, vicmPos: 1, swingNeg: 1.5, swingPos: 1.5, swingLoad: 2e3, ioutMax: 25e-3, rout: 100,
  },
  {
    name: "LW-OA320 rail-to-rail CMOS 5 V",
    supplyMin: 1.8, supplyMax: 5.5, gbw: 10e6, slewRate: 8e6, aolDb: 110,
    vos: 1.5e-3, vosDrift: 2e-6, ib: 10e-12, ios: 5e-12,
    en: 12e-9, in: 3e-15, enCorner: 1e3,
    vicmNeg: -0.1, vicmPos: -0.1, swingNeg: 0.05, swingPos: 0.05, swingLoad: 2e3, ioutMax: 40e-3, rout: 100,
  },
  {
    name: "LW-OA410 low-noise bipolar ±15 V",
    supplyMin: 8, supplyMax: 36, gbw: 8e6, slewRate: 2.8e6, aolDb: 120,
    vos: 100e-6, vosDrift: 1e-6, ib: 40e-9, ios: 15e-9,
    en: 3e-9, in: 1e-12, enCorner: 10,
    vicmNeg: 2, vicmPos: 2, swingNeg: 1.5, swingPos: 1.5, swingLoad: 2e3, ioutMax: 30e-3, rout: 50,
  },
  {
    name: "LW-OA520 high-speed voltage-feedback ±5 V",
    supplyMin: 5, supplyMax: 12, gbw: 200e6, slewRate: 400e6, aolDb: 80,
    vos: 3e-3, vosDrift: 10e-6, ib: 4e-6, ios: 1e-6,
    en: 6e-9, in: 2e-12, enCorner: 3e3,
    vicmNeg: 1.2, vicmPos: 1.2, swingNeg: 1, swingPos: 1, swingLoad: 150, ioutMax: 80e-3, rout: 20,
  },
  {
    name: "LW-OA610 precision low-drift bipolar",
    supplyMin: 4, supplyMax: 36, gbw: 1e6, slewRate: 0.4e6, aolDb: 130,
    vos: 25e-6, vosDrift: 0.3e-6, ib: 2e-9, ios: 1e-9,
    en: 10e-9, in: 0.1e-12, enCorner: 3,
    vicmNeg: 1.5, vicmPos: 1.5, swingNeg: 1.2, swingPos: 1.2, swingLoad: 2e3, ioutMax: 15e-3, rout: 60,
  },
  {
    name: "LW-OA710 micropower rail-to-rail CMOS",
    supplyMin: 1.6, supplyMax: 5.5, gbw: 100e3, slewRate: 0.04e6, aolDb: 100,
    vos: 3e-3, vosDrift: 4e-6, ib: 1e-12, ios: 1e-12,
    en: 60e-9, in: 1e-15, enCorner: 100,
    vicmNeg: -0.1, vicmPos: -0.1, swingNeg: 0.02, swingPos: 0.02, swingLoad: 100e3, ioutMax: 5e-3, rout: 1000,
  },
  {
    name: "LW-OA340 zero-drift rail-to-rail CMOS 5 V",
    supplyMin: 2.7, supplyMax: 5.5, gbw: 2e6, slewRate: 1e6, aolDb: 130,
    vos: 5e-6, vosDrift: 0.02e-6, ib: 100e-12, ios: 50e-12,
    en: 22e-9, in: 0.1e-12, enCorner: 0,
    vicmNeg: -0.1, vicmPos: 0, swingNeg: 0.03, swingPos: 0.03, swingLoad: 10e3, ioutMax: 30e-3, rout: 150,
  },
].map((p) => opAmpParamsSchema.parse(p));

/** Demo voltage references. */
export const DEMO_REFERENCES: readonly ReferenceParams[] = [
  {
    name: "LW-SR25 2.5 V shunt", topology: "shunt" as const,
    vNom: 2.5, accuracy: 0.005, tempco: 50e-6, iMin: 60e-6, iMax: 15e-3, pMax: 0.3,
    zDyn: 0.3, noisePp: 30e-6, longTermDrift: 100e-6, iAdj: 0,
  },
  {
    name: "LW-AR124 adjustable shunt, 1.24 V reference", topology: "adjustable" as const,
    vNom: 1.24, accuracy: 0.005, tempco: 50e-6, iMin: 100e-6, iMax: 15e-3, pMax: 0.3,
    zDyn: 0.25, noisePp: 20e-6, longTermDrift: 100e-6, iAdj: 0.3e-6,
  },
  {
    name: "LW-Z51 5.1 V Zener, 500 mW", topology: "shunt" as const,
    vNom: 5.1, accuracy: 0.05, tempco: 300e-6, iMin: 1e-3, iMax: 90e-3, pMax: 0.5,
    zDyn: 17, noisePp: 100e-6, longTermDrift: 500e-6, iAdj: 0,
  },
  {
    name: "LW-VR4096 4.096 V series reference", topology: "series" as const,
    vNom: 4.096, accuracy: 0.0005, tempco: 3e-6, iMin: 0, iMax: 10e-3, pMax: 0.25,
    zDyn: 0.08, noisePp: 12e-6, longTermDrift: 50e-6, iAdj: 0,
  },
  {
    name: "LW-SR12 1.225 V micropower shunt", topology: "shunt" as const,
    vNom: 1.225, accuracy: 0.001, tempco: 25e-6, iMin: 45e-6, iMax: 12e-3, pMax: 0.3,
    zDyn: 0.5, noisePp: 14e-6, longTermDrift: 60e-6, iAdj: 0,
  },
].map((p) => referenceParamsSchema.parse(p));

/** The demo op-amp with this name prefix (e.g. "LW-OA320"). Throws if there is none. */
export function demoOpAmp(prefix: string): OpAmpParams {
  const p = DEMO_OPAMPS.find((x) => x.name.startsWith(prefix));
  if (!p) throw new Error(`No demo op-amp "${prefix}"`);
  return p;
}

/** The demo reference with this name prefix (e.g. "LW-SR25"). Throws if there is none. */
export function demoReference(prefix: string): ReferenceParams {
  const p = DEMO_REFERENCES.find((x) => x.name.startsWith(prefix));
  if (!p) throw new Error(`No demo reference "${prefix}"`);
  return p;
}

/**
 * A part's parameter set as a RawPart (form value), numbers in SI base units.
 * @param params op-amp or reference parameters
 * @param partId library id, if the part comes from a library
 */
export function toRawPart(params: OpAmpParams | ReferenceParams, partId?: string): RawPart {
  const { name, ...rest } = params;
  const values: Record<string, string | number> = {};
  for (const [k, v] of Object.entries(rest)) values[k] = v as string | number;
  return { ...(partId !== undefined ? { partId } : {}), name, values };
}
