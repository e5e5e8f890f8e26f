/**
 * What a workspace's subscription allows right now: full use, a grace period after a failed
 * payment (7 days, with a banner), or read-only. Read-only never hides data: calculations and
 * issued reports stay readable and downloadable; only changes are refused.
 */
import type { Workspace } from "@/db/schema";
import type { PackId } from "@/lib/calc/core/types";
import { AppError } from "@/lib/errors";
import type { Action } from "@/lib/auth/permissions";
import { PACK_IDS, packTitle } from "./plans";

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
    case "incomplete":
      return { mode: "read_only", message: "The first payment has not gone through yet, so the workspace is read-only. The owner can finish it on the billing page." };
    case "unpaid":
      return { mode: "read_only", message: "Invoices are unpaid, so the workspace is read-only. Everything stays readable; the owner can pay on the billing page to resume." };
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

/** Whether `action` changes data (and so is refused while the workspace is read-only). */
export function isWriteAction(action: Action): boolean {
  return WRITE_ACTIONS.has(action);
}

/** Throws 403 read_only when the workspace may not be changed now. */
export function assertWritable(ws: Pick<Workspace, "subscriptionStatus" | "trialEndsAt" | "pastDueSince">, now = Date.now()): void {
  const state = accessState(ws, now);
  if (state.mode === "read_only") throw new AppError("read_only", state.message ?? "This workspace is read-only.");
}

/** Packs the workspace may run now: none while read-only, else the subscription's (or the trial's). */
export function unlockedPacks(ws: Pick<Workspace, "subscriptionStatus" | "trialEndsAt" | "pastDueSince" | "packs">, now = Date.now()): PackId[] {
  if (accessState(ws, now).mode === "read_only") return [];
  const packs = new Set(ws.packs ?? []);
  return PACK_IDS.filter((p) => packs.has(p));
}

/**
 * Throws 402 pack_locked unless the pack is unlocked. The message says why: the pack is not
 * subscribed, or the whole workspace is read-only (trial over, cancelled, payment overdue).
 */
export function assertPackUnlocked(ws: Pick<Workspace, "subscriptionStatus" | "trialEndsAt" | "pastDueSince" | "packs">, pack: PackId, now = Date.now()): void {
  if (unlockedPacks(ws, now).includes(pack)) return;
  const state = accessState(ws, now);
  if (state.mode === "read_only") {
    throw new AppError("pack_locked", `The ${packTitle(pack)} cannot run calculations now. ${state.message ?? "The workspace is read-only."}`);
  }
  throw new AppError("pack_locked", `The ${packTitle(pack)} is not part of this workspace's subscription. The owner can add it on the billing page.`);
}
