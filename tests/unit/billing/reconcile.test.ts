/**
 * The rules that keep webhook ordering safe (lib/billing/subscription.ts reconcile), on
 * workspace rows and subscription snapshots written out by hand.
 */
import { describe, expect, it } from "vitest";
import type { Workspace } from "@/db/schema";
import { reconcile, type SubscriptionSnapshot } from "@/lib/billing/subscription";

const NOW = Date.UTC(2026, 2, 10, 12, 0, 0);
const DAY = 86_400_000;

function ws(over: Partial<Workspace> = {}): Workspace {
  return {
    id: "ws_1",
    name: "Test Firm",
    slug: "test-firm",
    createdAt: NOW - 30 * DAY,
    stripeCustomerId: "cus_1",
    stripeSubscriptionId: "sub_1",
    subscriptionStatus: "active",
    packs: ["amplifier"],
    seatsPaid: 3,
    trialEndsAt: NOW - 16 * DAY,
    currentPeriodEnd: NOW + 20 * DAY,
    cancelAtPeriodEnd: false,
    pastDueSince: null,
    subscriptionWatermark: NOW - DAY,
    ...over,
  };
}

function snap(over: Partial<SubscriptionSnapshot> = {}): SubscriptionSnapshot {
  return { subscriptionId: "sub_1", customerId: "cus_1", status: "active", packs: ["amplifier"], seats: 3, currentPeriodEnd: NOW + 20 * DAY, cancelAtPeriodEnd: false, trialEndsAt: null, ...over };
}

describe("reconcile", () => {
  it("applies the current state of the same subscription and moves the watermark to the event's time", () => {
    const d = reconcile(ws(), snap({ seats: 5, packs: ["amplifier", "filter"] }), { eventCreatedMs: NOW - 1000, now: NOW });
    expect(d.kind).toBe("apply");
    if (d.kind !== "apply") return;
    expect(d.patch).toMatchObject({ seatsPaid: 5, packs: ["amplifier", "filter"], subscriptionStatus: "active", subscriptionWatermark: NOW - 1000 });
    expect(d.patch.stripeCustomerId).toBeUndefined(); // already set: never overwritten
  });

  it("calls an event older than the watermark stale; an equal time is applied (Stripe's created is in whole seconds)", () => {
    expect(reconcile(ws(), snap(), { eventCreatedMs: NOW - DAY - 1000, now: NOW }).kind).toBe("stale");
    expect(reconcile(ws(), snap(), { eventCreatedMs: NOW - DAY, now: NOW }).kind).toBe("apply");
  });

  it("a sync of our own (no event) never moves the watermark", () => {
    const d = reconcile(ws(), snap({ seats: 7 }), { eventCreatedMs: null, now: NOW });
    expect(d.kind === "apply" && d.patch.subscriptionWatermark).toBe(NOW - DAY);
  });

  it("never revives a cancelled subscription, even from a state fetched before the cancellation", () => {
    const cancelled = ws({ subscriptionStatus: "canceled" });
    expect(reconcile(cancelled, snap({ status: "active" }), { eventCreatedMs: NOW, now: NOW })).toMatchObject({ kind: "ignore" });
    expect(reconcile(cancelled, snap({ status: "past_due" }), { eventCreatedMs: null, now: NOW })).toMatchObject({ kind: "ignore" });
    expect(reconcile(cancelled, snap({ status: "canceled" }), { eventCreatedMs: NOW, now: NOW }).kind).toBe("apply");
  });

  it("an ended other subscription never replaces a paying one or a running trial", () => {
    expect(reconcile(ws(), snap({ subscriptionId: "sub_old", status: "canceled" }), { eventCreatedMs: NOW, now: NOW })).toMatchObject({ kind: "ignore" });
    const trial = ws({ stripeSubscriptionId: null, subscriptionStatus: "trialing", trialEndsAt: NOW + 5 * DAY, packs: ["amplifier", "filter", "reference"] });
    expect(reconcile(trial, snap({ status: "incomplete" }), { eventCreatedMs: NOW, now: NOW })).toMatchObject({ kind: "ignore" });
    // After the trial ended there is nothing to protect: the ended subscription is recorded.
    const over = ws({ stripeSubscriptionId: null, subscriptionStatus: "trialing", trialEndsAt: NOW - DAY });
    expect(reconcile(over, snap({ status: "canceled" }), { eventCreatedMs: NOW, now: NOW }).kind).toBe("apply");
  });

  it("a new paying subscription replaces an ended one (subscribing again)", () => {
    const d = reconcile(ws({ subscriptionStatus: "canceled" }), snap({ subscriptionId: "sub_2", status: "active", packs: ["reference"] }), { eventCreatedMs: NOW, now: NOW });
    expect(d.kind === "apply" && d.patch).toMatchObject({ stripeSubscriptionId: "sub_2", subscriptionStatus: "active", packs: ["reference"] });
  });

  it("keeps the first past-due time while the subscription stays past due, and clears it when paid", () => {
    const first = reconcile(ws(), snap({ status: "past_due" }), { eventCreatedMs: NOW - 5000, now: NOW });
    expect(first.kind === "apply" && first.patch.pastDueSince).toBe(NOW - 5000);
    const again = reconcile(ws({ subscriptionStatus: "past_due", pastDueSince: NOW - 3 * DAY }), snap({ status: "past_due" }), { eventCreatedMs: NOW, now: NOW });
    expect(again.kind === "apply" && again.patch.pastDueSince).toBe(NOW - 3 * DAY);
    const paid = reconcile(ws({ subscriptionStatus: "past_due", pastDueSince: NOW - 3 * DAY }), snap({ status: "active" }), { eventCreatedMs: NOW, now: NOW });
    expect(paid.kind === "apply" && paid.patch.pastDueSince).toBeNull();
  });

  it("records the customer on a workspace that has none", () => {
    const d = reconcile(ws({ stripeCustomerId: null, stripeSubscriptionId: null, subscriptionStatus: "trialing", trialEndsAt: NOW + DAY }), snap({ customerId: "cus_9" }), { eventCreatedMs: NOW, now: NOW });
    expect(d.kind === "apply" && d.patch.stripeCustomerId).toBe("cus_9");
  });
});
