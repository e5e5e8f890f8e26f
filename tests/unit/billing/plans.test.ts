/** The price list: one plan per pack plus the bundle, unique lookup keys, totals per month. */
import { describe, expect, it } from "vitest";
import { formatMoney, monthlyTotal, PACK_IDS, planByLookupKey, PLANS, plansForPacks } from "@/lib/billing/plans";
import { PACKS } from "@/lib/calc/core/types";
import { checkoutSchema, changeSeatsSchema } from "@/lib/billing/schemas";

describe("plans", () => {
  it("has one plan per pack of the engine plus the bundle, with unique lookup keys and product ids", () => {
    expect(PACK_IDS).toEqual(PACKS.map((p) => p.id));
    expect(PLANS.map((p) => p.id)).toEqual(["amplifier", "filter", "reference", "bundle"]);
    expect(new Set(PLANS.map((p) => p.lookupKey)).size).toBe(PLANS.length);
    expect(new Set(PLANS.map((p) => p.productId)).size).toBe(PLANS.length);
    for (const p of PLANS) expect(planByLookupKey(p.lookupKey)).toBe(p);
    expect(planByLookupKey("someone_elses_price")).toBeUndefined();
  });

  it("the bundle costs less per seat than the three packs apart", () => {
    const apart = PACK_IDS.reduce((s, id) => s + PLANS.find((p) => p.id === id)!.unitAmount, 0);
    expect(PLANS.find((p) => p.id === "bundle")!.unitAmount).toBeLessThan(apart);
  });

  it("bills all three packs as the bundle and fewer as one line each, in catalogue order", () => {
    expect(plansForPacks(["reference", "amplifier", "filter"]).map((p) => p.id)).toEqual(["bundle"]);
    expect(plansForPacks(["reference", "amplifier"]).map((p) => p.id)).toEqual(["amplifier", "reference"]);
  });

  it("totals per month: seats × unit price per line", () => {
    // 3 seats × ($29.00 + $19.00) = $144.00, by hand from the prices in plans.ts.
    expect(monthlyTotal(["amplifier", "reference"], 3)).toBe(14_400);
    // 2 seats × $65.00 bundle = $130.00.
    expect(monthlyTotal(["amplifier", "filter", "reference"], 2)).toBe(13_000);
    expect(formatMoney(14_400)).toBe("$144.00");
  });
});

describe("billing form rules", () => {
  it("names the field and the rule for bad seats and packs", () => {
    const bad = (v: unknown) => changeSeatsSchema.safeParse({ seats: v }).error?.issues[0]?.message;
    expect(bad(0)).toBe("must be at least 1 seat");
    expect(bad(-2)).toBe("must be at least 1 seat");
    expect(bad(2.5)).toBe("must be a whole number of seats");
    expect(bad("3")).toBe("must be a whole number of seats");
    expect(bad(501)).toMatch(/at most 500/);
    const packs = checkoutSchema.safeParse({ packs: ["amplifier", "power"], seats: 3 });
    expect(packs.error?.issues[0]).toMatchObject({ path: ["packs", 1], message: '"power" is not a pack; use amplifier, filter or reference' });
    expect(checkoutSchema.safeParse({ packs: [], seats: 3 }).error?.issues[0]?.message).toBe("choose at least one pack");
    expect(checkoutSchema.safeParse({ packs: ["filter", "filter"], seats: 3 }).error?.issues[0]?.message).toBe("lists a pack more than once");
  });
});
