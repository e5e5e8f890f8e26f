import { describe, expect, it } from "vitest";
import { checkAtLeast, checkAtMost, guardValue, margin, worstMargin, worstSeverity } from "@/lib/calc/core/checks";

describe("checks", () => {
  it("margin follows Check.margin: (limit − actual)/limit, > 0 passes", () => {
    expect(margin(8, 10, "atMost")).toBeCloseTo(0.2, 12);
    expect(margin(12, 10, "atMost")).toBeCloseTo(-0.2, 12);
    expect(margin(12, 10, "atLeast")).toBeCloseTo(0.2, 12);
    expect(margin(1, 0, "atMost")).toBe(-1); // limit 0: scaled by |actual|
    expect(margin(NaN, 1, "atMost")).toBe(-1);
  });
  it("checkAtMost / checkAtLeast pick pass, warning, fail", () => {
    const msgs = { pass: "ok", fail: "bad", warn: "close" };
    expect(checkAtMost("a", "A", 5, 10, msgs).severity).toBe("pass");
    expect(checkAtMost("a", "A", 9.5, 10, msgs, { warnBelow: 0.1 }).severity).toBe("warning");
    expect(checkAtMost("a", "A", 9.5, 10, msgs, { warnBelow: 0.1 }).message).toBe("close");
    expect(checkAtMost("a", "A", 11, 10, msgs).severity).toBe("fail");
    expect(checkAtLeast("a", "A", 11, 10, msgs).severity).toBe("pass");
    expect(checkAtLeast("a", "A", NaN, 10, msgs).severity).toBe("fail");
  });
  it("guardValue turns impossible values into failing checks", () => {
    expect(guardValue("g", "G", 3, "x")).toBeNull();
    expect(guardValue("g", "G", -3, "must be positive", (v) => v > 0)?.severity).toBe("fail");
    expect(guardValue("g", "G", Infinity, "overflow")?.message).toBe("overflow");
  });
  it("worst margin and severity", () => {
    const cs = [checkAtMost("a", "A", 5, 10, { pass: "", fail: "" }), checkAtMost("b", "B", 12, 10, { pass: "", fail: "" })];
    expect(worstMargin(cs)).toBeCloseTo(-0.2, 12);
    expect(worstSeverity(cs)).toBe("fail");
    expect(worstSeverity([])).toBe("pass");
  });
});
