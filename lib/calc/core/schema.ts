/**
 * zod building blocks for calculation-type schemas: every message names the field and the rule
 * ("Gain must be between 0.01 V/V and 10000 V/V"), so a FieldError can be shown as it is.
 */
import { z } from "zod";
import { formatQuantity } from "./units";

function show(v: number, unit: string, scale?: "percent" | "ppm"): string {
  return formatQuantity(v, unit, { digits: 6, scale });
}

/** A finite number; `name` is the field's label as the message prints it. */
export function finiteNumber(name: string) {
  return z.number({ error: `${name} must be a number` }).refine(Number.isFinite, { message: `${name} must be a finite number` });
}

/**
 * A number in [lo, hi] (inclusive), SI base units.
 * @param name label printed in the message
 * @param unit unit for the message (value shown with prefix, e.g. "10 MΩ")
 * @param scale show the limits as % / ppm (the value itself is a fraction)
 */
export function numberBetween(name: string, lo: number, hi: number, unit: string, scale?: "percent" | "ppm") {
  return finiteNumber(name).refine((v) => v >= lo && v <= hi, {
    message: `${name} must be between ${show(lo, unit, scale)} and ${show(hi, unit, scale)}`,
  });
}

/** A number in (0, hi], SI base units. */
export function positiveAtMost(name: string, hi: number, unit: string, scale?: "percent" | "ppm") {
  return finiteNumber(name)
    .refine((v) => v > 0, { message: `${name} must be greater than 0` })
    .refine((v) => v <= hi, { message: `${name} must be at most ${show(hi, unit, scale)}` });
}

/** A select value from a fixed list. */
export function oneOf<const T extends readonly [string, ...string[]]>(name: string, values: T) {
  return z.enum(values, { error: `${name} must be one of: ${values.join(", ")}` });
}

/** A yes/no value. */
export function yesNo(name: string) {
  return z.boolean({ error: `${name} must be yes or no` });
}
