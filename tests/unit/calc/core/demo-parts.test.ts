import { describe, expect, it } from "vitest";
import { DEMO_OPAMPS, DEMO_REFERENCES, toRawPart } from "@/lib/calc/core/demo-parts";
import { opAmpParamsSchema, referenceParamsSchema } from "@/lib/calc/core/parts";

describe("demo parts", () => {
  it("6–8 op-amps and the named references, all valid under the part schemas", () => {
    expect(DEMO_OPAMPS.length).toBeGreaterThanOrEqual(6);
    expect(DEMO_OPAMPS.length).toBeLessThanOrEqual(8);
    for (const p of DEMO_OPAMPS) expect(opAmpParamsSchema.safeParse(p).success).toBe(true);
    for (const r of DEMO_REFERENCES) expect(referenceParamsSchema.safeParse(r).success).toBe(true);
    const topologies = new Set(DEMO_REFERENCES.map((r) => r.topology));
    expect(topologies).toEqual(new Set(["shunt", "adjustable", "series"]));
  });
  it("use invented LW- names only", () => {
    for (const p of [...DEMO_OPAMPS, ...DEMO_REFERENCES]) expect(p.name).toMatch(/^LW-/);
    expect(new Set(DEMO_OPAMPS.map((p) => p.name)).size).toBe(DEMO_OPAMPS.length);
  });
  it("toRawPart keeps every parameter", () => {
    const raw = toRawPart(DEMO_OPAMPS[0], "lib-1");
    expect(raw.partId).toBe("lib-1");
    expect(Object.keys(raw.values).length).toBe(Object.keys(DEMO_OPAMPS[0]).length - 1);
  });
});
