/**
 * Packs through the compute route (POST /api/w/:slug/compute): a trial runs every pack; a
 * subscription to two packs runs those two and answers 402 pack_locked for the third; after a
 * cancellation nothing runs but everything stays readable.
 */
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { users } from "@/db/schema";
import { read } from "@/db/write";
import { authorize } from "@/lib/auth/guard";
import { syncAfterCheckout } from "@/lib/billing/checkout";
import { calcTypesOfPack } from "@/lib/calc/registry";
import type { PackId } from "@/lib/calc/core/types";
import * as computeRoute from "@/app/api/w/[slug]/compute/route";
import * as projectsRoute from "@/app/api/w/[slug]/projects/route";
import { call, makeWorld, setupDb, type World } from "../helpers";
import { deliver, lastEvent, startFake, subscribe, workspaceRow, type FakeStripe } from "./support";

let f: FakeStripe;
beforeAll(async () => {
  await setupDb();
  f = await startFake();
});
afterAll(async () => {
  await f?.fake.close();
});

/** Runs the first calculation type of `pack` with its defaults, as the engineer. */
function compute(w: World, pack: PackId) {
  const type = calcTypesOfPack(pack)[0];
  if (!type) throw new Error(`no calculation type in the ${pack} pack yet`);
  return call(computeRoute.POST, { method: "POST", params: { slug: w.slug }, body: { typeId: type.id, inputs: structuredClone(type.defaults) }, cookie: w.engineer.cookie });
}

async function subscribedTo(packs: PackId[]) {
  const w = await makeWorld();
  const ids = await subscribe(f, w, packs, 3);
  const db = await read();
  const owner = await db.query.users.findFirst({ where: eq(users.id, w.owner.id) });
  await syncAfterCheckout(await authorize(owner ?? null, w.slug, "billing.manage"), ids.sessionId);
  return { w, ...ids };
}

describe("packs and the compute route", () => {
  it("a trial runs every pack", async () => {
    const w = await makeWorld();
    expect((await compute(w, "amplifier")).status).toBe(200);
    expect((await compute(w, "filter")).status).toBe(200);
  });

  it("a subscription to the amplifier and reference packs leaves the filter pack locked (402)", async () => {
    const { w } = await subscribedTo(["amplifier", "reference"]);
    expect(await workspaceRow(w.workspaceId)).toMatchObject({ subscriptionStatus: "active", packs: ["amplifier", "reference"] });
    expect((await compute(w, "amplifier")).status).toBe(200);
    const locked = await compute(w, "filter");
    expect(locked.status).toBe(402);
    expect(locked.body.error).toMatchObject({ code: "pack_locked", message: expect.stringMatching(/Active filter pack is not part of this workspace's subscription/) });
  });

  it("after the subscription ends nothing runs, and projects stay readable", async () => {
    const { w, subscriptionId } = await subscribedTo(["amplifier", "filter"]);
    await f.sdk.subscriptions.cancel(subscriptionId);
    expect((await deliver(await lastEvent(f.sdk, "customer.subscription.deleted", subscriptionId))).status).toBe(200);
    const r = await compute(w, "amplifier");
    expect(r.status).toBe(402);
    expect((r.body.error as { message: string }).message).toMatch(/cancelled/);
    const projects = await call(projectsRoute.GET, { params: { slug: w.slug }, cookie: w.client.cookie });
    expect(projects.status).toBe(200);
  });
});
