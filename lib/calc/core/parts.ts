/**
 * Part parameter sets: the op-amps and references a firm keeps in its library. A calculation
 * snapshots the whole parameter set of the part it used, so a report can be re-verified years
 * later even if the library entry has changed since.
 *
 * Every value is in SI base units. Swing and common-mode limits are given as headroom from each
 * rail (positive = inside the rail, negative = beyond it), which is how data sheets state them.
 */
import { z } from "zod";
import type { QuantityField } from "./types";

const finite = (field: string) =>
  z.number({ error: `${field} must be a number` }).refine(Number.isFinite, { message: `${field} must be finite` });
const positive = (field: string) => finite(field).refine((v) => v > 0, { message: `${field} must be greater than 0` });
const nonNegative = (field: string) => finite(field).refine((v) => v >= 0, { message: `${field} must be 0 or more` });
const headroom = (field: string) =>
  finite(field).refine((v) => v > -1 && v < 10, { message: `${field} must be between −1 V and 10 V (headroom from the rail)` });

export const opAmpParamsSchema = z
  .object({
    name: z.string().trim().min(1, "name is required").max(80, "name must be at most 80 characters"),
    /** Minimum total supply (V+ − V−), V. */
    supplyMin: positive("supplyMin"),
    /** Maximum total supply (V+ − V−), V. */
    supplyMax: positive("supplyMax"),
    /** Gain-bandwidth product, Hz. */
    gbw: positive("gbw"),
    /** Slew rate, V/s (1 V/µs = 1e6 V/s). */
    slewRate: positive("slewRate"),
    /** Open-loop DC gain, dB. */
    aolDb: finite("aolDb").refine((v) => v >= 40 && v <= 200, { message: "aolDb must be between 40 dB and 200 dB" }),
    /** Input offset voltage (maximum), V. */
    vos: nonNegative("vos"),
    /** Input offset voltage drift, V/°C. */
    vosDrift: nonNegative("vosDrift"),
    /** Input bias current (maximum), A. */
    ib: nonNegative("ib"),
    /** Input offset current (maximum), A. */
    ios: nonNegative("ios"),
    /** Input voltage noise density (white region), V/√Hz. */
    en: nonNegative("en"),
    /** Input current noise density (white region), A/√Hz. */
    in: nonNegative("in"),
    /** 1/f corner of the voltage noise, Hz (0 = ignore flicker noise). */
    enCorner: nonNegative("enCorner"),
    /** Input common-mode headroom from the negative rail, V (min input = V− + vicmNeg). */
    vicmNeg: headroom("vicmNeg"),
    /** Input common-mode headroom from the positive rail, V (max input = V+ − vicmPos). */
    vicmPos: headroom("vicmPos"),
    /** Output swing headroom from the negative rail at swingLoad, V (min output = V− + swingNeg). */
    swingNeg: headroom("swingNeg"),
    /** Output swing headroom from the positive rail at swingLoad, V (max output = V+ − swingPos). */
    swingPos: headroom("swingPos"),
    /** Load resistance at which the swing is specified, Ω. */
    swingLoad: positive("swingLoad"),
    /** Maximum output current (source or sink), A. */
    ioutMax: positive("ioutMax"),
    /** Open-loop output resistance, Ω. */
    rout: nonNegative("rout"),
  })
  .refine((p) => p.supplyMax >= p.supplyMin, { message: "supplyMax must be at least supplyMin", path: ["supplyMax"] })
  .refine((p) => p.ios <= p.ib || p.ib === 0, { message: "ios (offset current) must not exceed ib (bias current)", path: ["ios"] });

export type OpAmpParams = z.output<typeof opAmpParamsSchema>;

export const referenceParamsSchema = z
  .object({
    name: z.string().trim().min(1, "name is required").max(80, "name must be at most 80 characters"),
    /** "shunt" (two-terminal shunt / Zener), "series" (three-terminal), "adjustable" (shunt with a
     * feedback pin, Vout = Vref·(1 + R1/R2) + Iadj·R1). */
    topology: z.enum(["shunt", "series", "adjustable"], { error: "topology must be shunt, series or adjustable" }),
    /** Nominal output (or internal reference for adjustable), V. */
    vNom: positive("vNom"),
    /** Initial accuracy, fraction (0.001 = 0.1 %). */
    accuracy: nonNegative("accuracy").refine((v) => v < 0.2, { message: "accuracy must be below 20 %" }),
    /** Temperature coefficient (box method), 1/°C (10e-6 = 10 ppm/°C). */
    tempco: nonNegative("tempco"),
    /** Minimum operating (cathode) current, A. */
    iMin: nonNegative("iMin"),
    /** Maximum operating current, A. */
    iMax: positive("iMax"),
    /** Maximum power dissipation, W. */
    pMax: positive("pMax"),
    /** Dynamic impedance (shunt) or load regulation (series), Ω (= V/A). */
    zDyn: nonNegative("zDyn"),
    /** Low-frequency noise, 0.1 Hz to 10 Hz, peak-to-peak, V. */
    noisePp: nonNegative("noisePp"),
    /** Long-term drift, fraction per 1000 h (50e-6 = 50 ppm/1000 h). */
    longTermDrift: nonNegative("longTermDrift"),
    /** Feedback (adjust) pin current, A; 0 for fixed references. */
    iAdj: nonNegative("iAdj"),
  })
  .refine((p) => p.iMax > p.iMin, { message: "iMax must be greater than iMin", path: ["iMax"] });

export type ReferenceParams = z.output<typeof referenceParamsSchema>;

/** Field descriptions of the op-amp parameters, for forms, CSV import and reports. */
export const OPAMP_FIELDS: ReadonlyArray<Omit<QuantityField, "kind"> & { key: keyof OpAmpParams }> = [
  { key: "supplyMin", label: "Minimum total supply", symbol: "Vs,min", unit: "V" },
  { key: "supplyMax", label: "Maximum total supply", symbol: "Vs,max", unit: "V" },
  { key: "gbw", label: "Gain-bandwidth product", symbol: "GBW", unit: "Hz" },
  { key: "slewRate", label: "Slew rate", symbol: "SR", unit: "V/s" },
  { key: "aolDb", label: "Open-loop DC gain", symbol: "A₀", unit: "dB" },
  { key: "vos", label: "Input offset voltage (max)", symbol: "Vos", unit: "V" },
  { key: "vosDrift", label: "Offset voltage drift", symbol: "ΔVos/ΔT", unit: "V/°C" },
  { key: "ib", label: "Input bias current (max)", symbol: "Ib", unit: "A" },
  { key: "ios", label: "Input offset current (max)", symbol: "Ios", unit: "A" },
  { key: "en", label: "Voltage noise density", symbol: "en", unit: "V/√Hz" },
  { key: "in", label: "Current noise density", symbol: "in", unit: "A/√Hz" },
  { key: "enCorner", label: "Voltage noise 1/f corner", symbol: "fc", unit: "Hz" },
  { key: "vicmNeg", label: "Input CM headroom, negative rail", symbol: "Vicm−", unit: "V" },
  { key: "vicmPos", label: "Input CM headroom, positive rail", symbol: "Vicm+", unit: "V" },
  { key: "swingNeg", label: "Output headroom, negative rail", symbol: "Vsw−", unit: "V" },
  { key: "swingPos", label: "Output headroom, positive rail", symbol: "Vsw+", unit: "V" },
  { key: "swingLoad", label: "Load for swing spec", symbol: "RL,sw", unit: "Ω" },
  { key: "ioutMax", label: "Output current (max)", symbol: "Iout", unit: "A" },
  { key: "rout", label: "Open-loop output resistance", symbol: "Ro", unit: "Ω" },
];

/** Field descriptions of the reference parameters (topology is a select, not listed here). */
export const REFERENCE_FIELDS: ReadonlyArray<Omit<QuantityField, "kind"> & { key: keyof ReferenceParams }> = [
  { key: "vNom", label: "Nominal voltage", symbol: "Vref", unit: "V" },
  { key: "accuracy", label: "Initial accuracy", symbol: "εinit", unit: "%", scale: "percent" },
  { key: "tempco", label: "Temperature coefficient", symbol: "TC", unit: "ppm/°C", scale: "ppm" },
  { key: "iMin", label: "Minimum operating current", symbol: "Imin", unit: "A" },
  { key: "iMax", label: "Maximum operating current", symbol: "Imax", unit: "A" },
  { key: "pMax", label: "Maximum dissipation", symbol: "Pmax", unit: "W" },
  { key: "zDyn", label: "Dynamic impedance / load regulation", symbol: "Zd", unit: "Ω" },
  { key: "noisePp", label: "Noise 0.1–10 Hz (p-p)", symbol: "en,pp", unit: "V" },
  { key: "longTermDrift", label: "Long-term drift per 1000 h", symbol: "εLT", unit: "ppm", scale: "ppm" },
  { key: "iAdj", label: "Adjust pin current", symbol: "Iadj", unit: "A" },
];
