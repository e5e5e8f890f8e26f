import { describe, expect, it } from "vitest";
import { z } from "zod";
import type { CalcType } from "@/lib/calc/core/types";
import { describeInputs, parseRawInputs } from "@/lib/calc/core/inputs";
import { opAmpParamsSchema } from "@/lib/calc/core/parts";
import { demoOpAmp, toRawPart } from "@/lib/calc/core/demo-parts";
import { OutputBuilder } from "@/lib/calc/core/output";

const schema = z.object({
  mode: z.enum(["a", "b"], { error: "mode must be a or b" }),
  r: z.number({ error: "r (resistance) is required" }).min(1, "r must be at least 1 Ω"),
  tol: z.number().max(0.2, "tol must be at most 20 %"),
  order: z.number().int().min(1, "order must be between 1 and 8").max(8, "order must be between 1 and 8"),
  extra: z.number({ error: "extra is required" }).optional(),
  flag: z.boolean(),
  opamp: opAmpParamsSchema,
});

const type: CalcType<typeof schema> = {
  id: "test.type",
  pack: "amplifier",
  title: "t",
  summary: "s",
  version: "1.0.0",
  schema,
  fields: [
    { kind: "select", key: "mode", label: "Mode", symbol: "", options: [{ value: "a", label: "A" }, { value: "b", label: "B" }] },
    { kind: "quantity", key: "r", label: "Resistance", symbol: "R", unit: "Ω" },
    { kind: "quantity", key: "tol", label: "Tolerance", symbol: "t", unit: "%", scale: "percent" },
    { kind: "integer", key: "order", label: "Order", symbol: "n", min: 1, max: 8 },
    { kind: "quantity", key: "extra", label: "Extra", symbol: "x", unit: "V", when: { key: "mode", in: ["b"] } },
    { kind: "boolean", key: "flag", label: "Flag", symbol: "" },
    { kind: "part", key: "opamp", label: "Op-amp", symbol: "U1", partKind: "opamp" },
  ],
  defaults: {},
  compute: () => new OutputBuilder().build(),
};

const part = toRawPart(demoOpAmp("LW-OA320"), "p1");

describe("parseRawInputs", () => {
  it("parses typed values into SI and validates", () => {
    const r = parseRawInputs(type, { mode: "a", r: "4k7", tol: "1 %", order: "4", extra: "garbage, hidden", flag: true, opamp: part });
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.input.r).toBe(4700);
      expect(r.input.tol).toBe(0.01);
      expect(r.input.order).toBe(4);
      expect(r.input.extra).toBeUndefined(); // hidden by `when`, ignored
      expect(r.input.opamp.gbw).toBe(10e6);
    }
  });
  it("parses typed part overrides", () => {
    const p = { ...part, values: { ...part.values, gbw: "5 MHz", slewRate: "2 V/µs" }, overrides: { gbw: { note: "derated" } } };
    const r = parseRawInputs(type, { mode: "a", r: "1k", tol: "1", order: 2, flag: false, opamp: p });
    expect(r.ok && r.input.opamp.gbw).toBe(5e6);
    expect(r.ok && r.input.opamp.slewRate).toBe(2e6);
    if (r.ok) {
      const rows = describeInputs(type, r.input, { opamp: p });
      expect(rows.find((x) => x.key === "opamp.gbw")?.source).toBe("override: derated");
      expect(rows.find((x) => x.key === "opamp.slewRate")?.source).toBe(`part library: ${part.name}`);
      expect(rows.find((x) => x.key === "opamp.slewRate")?.display).toBe("2 V/µs");
      expect(rows.find((x) => x.key === "r")?.display).toBe("1 kΩ");
      expect(rows.find((x) => x.key === "tol")?.display).toBe("1 %");
      expect(rows.find((x) => x.key === "extra")).toBeUndefined();
    }
  });
  it("names the field and the rule for each error", () => {
    const r = parseRawInputs(type, { mode: "b", r: "0.5", tol: "30", order: 9, flag: false, opamp: { ...part, values: { ...part.values, gbw: "abc" } } });
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.errors.map((e) => e.field).sort()).toEqual(["extra", "opamp.gbw"]);
    }
    const r2 = parseRawInputs(type, { mode: "a", r: "0.5", tol: "30", order: 9, flag: false, opamp: { ...part, values: { ...part.values, gbw: -1 } } });
    expect(r2.ok).toBe(false);
    if (!r2.ok) {
      const byField = Object.fromEntries(r2.errors.map((e) => [e.field, e.message]));
      expect(byField.r).toBe("r must be at least 1 Ω");
      expect(byField.tol).toBe("tol must be at most 20 %");
      expect(byField.order).toBe("order must be between 1 and 8");
      expect(byField["opamp.gbw"]).toBe("gbw must be greater than 0");
    }
  });
  it("reports a missing part and a wrong select value", () => {
    const r = parseRawInputs(type, { mode: "c", r: "1k", tol: "1", order: 2, flag: false });
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors.map((e) => e.field).sort()).toEqual(["mode", "opamp"]);
  });
});
