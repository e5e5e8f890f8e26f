/** The free trial every new workspace starts with: all packs, no card. */
import type { PackId } from "@/lib/calc/core/types";

export const TRIAL_DAYS = 14;
export const ALL_PACKS: PackId[] = ["amplifier", "filter", "reference"];

/** Workspace columns for a new trial starting at `now` (ms). */
export function trialFields(now = Date.now()) {
  return {
    subscriptionStatus: "trialing" as const,
    packs: [...ALL_PACKS],
    trialEndsAt: now + TRIAL_DAYS * 24 * 60 * 60 * 1000,
  };
}
