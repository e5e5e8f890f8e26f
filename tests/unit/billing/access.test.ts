/** Entitlements: access modes over time, unlocked packs and the 402 pack_locked refusal. */
import { describe, expect, it } from "vitest";
import { accessState, assertPackUnlocked, assertWritable, GRACE_DAYS, unlockedPacks } from "@/lib/billing/access";
import { AppError } from "@/lib/errors";

const NOW = Date.UTC(2026, 2, 10, 12, 0, 0);
const DAY = 86_400_000;
type Ws = Parameters<typeof unlockedPacks>[0];
const ws = (over: Partial<Ws>): Ws => ({ subscriptionStatus: "active", trialEndsAt: null, pastDueSince: null, packs: ["amplifier", "filter"], ...over });

function thrown(fn: () => void): AppError {
  try {
    fn();
  } catch (e) {
    if (e instanceof AppError) return e;
    throw e;
  }
  throw new Error("did not throw");
}

describe("accessState", () => {
  it("trial: full until its end, read-only after, without losing anything", () => {
    expect(accessState(ws({ subscriptionStatus: "trialing", trialEndsAt: NOW + 1 }), NOW).mode).toBe("full");
    const over = accessState(ws({ subscriptionStatus: "trialing", trialEndsAt: NOW }), NOW);
    expect(over.mode).toBe("read_only");
    expect(over.message).toMatch(/stays readable/);
  });

  it(`past due: grace for ${GRACE_DAYS} days from the failed payment, then read-only`, () => {
    const pd = ws({ subscriptionStatus: "past_due", pastDueSince: NOW });
    expect(GRACE_DAYS).toBe(7);
    const grace = accessState(pd, NOW + 7 * DAY - 1);
    expect(grace.mode).toBe("grace");
    expect(grace.graceEndsAt).toBe(NOW + 7 * DAY);
    expect(grace.message).toContain("2026-03-17");
    expect(accessState(pd, NOW + 7 * DAY).mode).toBe("read_only");
  });

  it("cancelled, unpaid, incomplete and none are read-only with a reason", () => {
    for (const s of ["canceled", "unpaid", "incomplete", "none"] as const) {
      const a = accessState(ws({ subscriptionStatus: s }), NOW);
      expect(a.mode, s).toBe("read_only");
      expect(a.message, s).toBeTruthy();
    }
    expect(accessState(ws({ subscriptionStatus: "canceled" }), NOW).message).toMatch(/readable and downloadable/);
  });
});

describe("packs", () => {
  it("unlocks the subscribed packs while usable, none while read-only", () => {
    expect(unlockedPacks(ws({}), NOW)).toEqual(["amplifier", "filter"]);
    expect(unlockedPacks(ws({ subscriptionStatus: "past_due", pastDueSince: NOW - DAY }), NOW)).toEqual(["amplifier", "filter"]);
    expect(unlockedPacks(ws({ subscriptionStatus: "canceled" }), NOW)).toEqual([]);
    expect(unlockedPacks(ws({ packs: ["reference", "bogus"] }), NOW)).toEqual(["reference"]);
  });

  it("refuses a locked pack with 402 pack_locked and says why", () => {
    const notSubscribed = thrown(() => assertPackUnlocked(ws({}), "reference", NOW));
    expect(notSubscribed.status).toBe(402);
    expect(notSubscribed.code).toBe("pack_locked");
    expect(notSubscribed.message).toMatch(/Reference pack is not part of this workspace's subscription/);
    const readOnly = thrown(() => assertPackUnlocked(ws({ subscriptionStatus: "canceled" }), "amplifier", NOW));
    expect(readOnly.code).toBe("pack_locked");
    expect(readOnly.message).toMatch(/Amplifier pack cannot run calculations now\. The subscription is cancelled/);
    expect(() => assertPackUnlocked(ws({}), "filter", NOW)).not.toThrow();
  });

  it("refuses writes with 403 read_only only when read-only", () => {
    expect(() => assertWritable(ws({ subscriptionStatus: "past_due", pastDueSince: NOW }), NOW)).not.toThrow();
    const e = thrown(() => assertWritable(ws({ subscriptionStatus: "canceled" }), NOW));
    expect([e.status, e.code]).toEqual([403, "read_only"]);
  });
});
