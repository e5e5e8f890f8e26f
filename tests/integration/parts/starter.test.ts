/** The starter set: generic example parts added to a library on request, never twice. */
import { beforeAll, describe, expect, it } from "vitest";
import { call, makeWorld, setupDb } from "../helpers";
import * as starterRoute from "@/app/api/w/[slug]/parts/starter/route";
import * as partsRoute from "@/app/api/w/[slug]/parts/route";
import { DEMO_OPAMPS, DEMO_REFERENCES } from "@/lib/calc/core/demo-parts";
import { opAmpParamsSchema } from "@/lib/calc/core/parts";

beforeAll(setupDb);

describe("starter parts", () => {
  it("adds every example op-amp once, marked as an invented example, and skips names already there", async () => {
    const w = await makeWorld();
    const first = await call(starterRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: { kind: "opamp" } });
    expect(first.status).toBe(201);
    expect(first.body).toEqual({ added: DEMO_OPAMPS.length, skipped: 0 });
    const list = await call(partsRoute.GET, { params: { slug: w.slug }, cookie: w.engineer.cookie, url: "http://x/api?kind=opamp" });
    const rows = list.body.parts as Array<{ name: string; notes: string; values: Record<string, unknown> }>;
    expect(rows.map((r) => r.name).sort()).toEqual(DEMO_OPAMPS.map((p) => p.name).sort());
    for (const r of rows) {
      expect(r.notes).toMatch(/invented values/);
      expect(opAmpParamsSchema.safeParse({ name: r.name, ...r.values }).success).toBe(true);
    }
    const again = await call(starterRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: { kind: "opamp" } });
    expect(again.body).toEqual({ added: 0, skipped: DEMO_OPAMPS.length });
    const refs = await call(starterRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: { kind: "reference" } });
    expect(refs.body).toEqual({ added: DEMO_REFERENCES.length, skipped: 0 });
  });

  it("refuses an unknown kind with 422 naming the field", async () => {
    const w = await makeWorld();
    const r = await call(starterRoute.POST, { params: { slug: w.slug }, cookie: w.engineer.cookie, body: { kind: "transistor" } });
    expect(r.status).toBe(422);
    expect((r.body.error as { fields: Record<string, string> }).fields.kind).toMatch(/opamp or reference/);
  });
});
