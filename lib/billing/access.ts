/**
 * What a workspace's subscription allows right now: full use, a grace period after a failed
 * payment (7 days, with a banner), or read-only. Read-only never hides data: calculations and
 * issued reports stay readable and downloadable; only changes are refused.
 */
import type { Workspace } from "@/db/schema";
import type { PackId } from "@/lib/calc/core/types";
import { AppError } from "@/lib/errors";
import type { Action } from "@/lib/auth/permissions";

/** Days a past-due workspace keeps full use before it becomes read-only. */
export const GRACE_DAYS = 7;
const DAY_MS = 24 * 60 * 60 * 1000;

export type AccessMode = "full" | "grace" | "read_only";

export interface AccessState {
  mode: AccessMode;
  /** Sentence for the banner, when not plain full use. */
  message?: string;
  /** When grace ends (ms), for past-due workspaces. */
  graceEndsAt?: number;
}

/** The access mode of a workspace at `now` (ms). */
export function accessState(ws: Pick<Workspace, "subscriptionStatus" | "trialEndsAt" | "pastDueSince">, now = Date.now()): AccessState {
  switch (ws.subscriptionStatus) {
    case "active":
      return { mode: "full" };
    case "trialing":
      if (ws.trialEndsAt == null || ws.trialEndsAt > now) return { mode: "full" };
      return { mode: "read_only", message: "The trial has ended. Subscribe to keep working; everything you made stays readable." };
    case "past_due": {
      const since = ws.pastDueSince ?? now;
      const graceEndsAt = since + GRACE_DAYS * DAY_MS;
      if (now < graceEndsAt) {
        return {
          mode: "grace",
          graceEndsAt,
          message: `The last payment failed. Update the payment method by ${new Date(graceEndsAt).toISOString().slice(0, 10)} to keep editing.`,
        };
      }
      return { mode: "read_only", graceEndsAt, message: "Payment is overdue, so the workspace is read-only. Update the payment method to resume." };
    }
    case "canceled":
      return { mode: "read_only", message: "The subscription is cancelled: the workspace is read-only. Calculations and issued reports stay readable and downloadable." };
    default:
      return { mode: "read_only", message: "This workspace has no active subscription: it is read-only until the owner subscribes." };
  }
}

/** Actions that change data and so are refused while read-only (billing itself never is). */
const WRITE_ACTIONS: ReadonlySet<Action> = new Set<Action>([
  "workspace.update",
  "project.create",
  "project.update",
  "project.share",
  "calc.create",
  "calc.edit",
  "calc.submit",
  "calc.review",
  "calc.issue",
  "parts.manage",
]);

export function isWriteAction(action: Action): boolean {
  return WRITE_ACTIONS.has(action);
}

/** Throws 403 read_only when the workspace may not be changed now. */
export function assertWritable(ws: Workspace, now = Date.now()): void {
  const state = accessState(ws, now);
  if (state.mode === "read_only") throw new AppError("read_only", state.message ?? "This workspace is read-only.");
}

/** Packs the workspace may run now. */
export function unlockedPacks(ws: Workspace, now = Date.now()): PackId[] {
  if (accessState(ws, now).mode === "read_only") return [];
  return (ws.packs ?? []).filter((p): p is PackId => p === "amplifier" || p === "filter" || p === "reference");
}

/** Throws 402 pack_locked unless the pack is unlocked. */
export function assertPackUnlocked(ws: Workspace, pack: PackId, now = Date.now()): void {
  if (!unlockedPacks(ws, now).includes(pack)) {
    throw new AppError("pack_locked", `The ${pack === "filter" ? "Active filter" : pack[0].toUpperCase() + pack.slice(1)} pack is not part of this workspace's subscription. The owner can add it on the billing page.`);
  }
}
