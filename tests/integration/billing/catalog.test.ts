/**
 * scripts/stripe-sync.ts's work (lib/billing/catalog.ts) against the local Stripe fake: the
 * first run creates every product and price, a second run changes nothing (no request that
 * writes, no event), and a changed amount moves the lookup key to a new price.
 */
import { execFile } from "node:child_process";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startStripeFake, type StripeFake } from "@/fakes/stripe/server";
import { sdkFor } from "@/fakes/stripe/testing";
import { syncCatalog } from "@/lib/billing/catalog";
import { PLANS } from "@/lib/billing/plans";

let fake: StripeFake;
beforeAll(async () => {
  fake = await startStripeFake({ port: 0 });
});
afterAll(async () => {
  await fake?.close();
});

const eventCount = () => Object.keys(fake.engine.state.events).length;

describe("catalogue sync", () => {
  it("creates every plan once; running it again changes nothing", async () => {
    fake.reset();
    const sdk = sdkFor(fake);
    const first = await syncCatalog(sdk);
    expect(first.filter((c) => c.action === "created")).toHaveLength(PLANS.length * 2);
    for (const plan of PLANS) {
      const [price] = (await sdk.prices.list({ lookup_keys: [plan.lookupKey] })).data;
      expect(price).toMatchObject({ unit_amount: plan.unitAmount, currency: "usd", active: true, product: plan.productId, recurring: { interval: "month", interval_count: 1 } });
      expect((await sdk.products.retrieve(plan.productId)).name).toBe(plan.title);
    }
    const events = eventCount();
    const second = await syncCatalog(sdk);
    expect(second.every((c) => c.action === "unchanged")).toBe(true);
    expect(eventCount()).toBe(events);
  });

  it("a new amount gets a new price under the same lookup key; the old one is archived", async () => {
    fake.reset();
    const sdk = sdkFor(fake);
    await syncCatalog(sdk);
    const old = (await sdk.prices.list({ lookup_keys: [PLANS[0].lookupKey] })).data[0];
    const dearer = PLANS.map((p, i) => (i === 0 ? { ...p, unitAmount: p.unitAmount + 500 } : p));
    const changes = await syncCatalog(sdk, dearer);
    expect(changes.filter((c) => c.action !== "unchanged")).toEqual([{ plan: PLANS[0].id, object: "price", action: "replaced", id: expect.stringMatching(/^price_/) }]);
    const now = (await sdk.prices.list({ lookup_keys: [PLANS[0].lookupKey] })).data;
    expect(now).toHaveLength(1);
    expect(now[0]).toMatchObject({ unit_amount: PLANS[0].unitAmount + 500, active: true });
    expect((await sdk.prices.retrieve(old.id)).active).toBe(false);
    expect((await syncCatalog(sdk, dearer)).every((c) => c.action === "unchanged")).toBe(true);
  });

  it("scripts/stripe-sync.ts reads the env and reports an up-to-date catalogue on the second run", async () => {
    fake.reset();
    const env = { ...process.env, STRIPE_SECRET_KEY: "sk_test_sync_script", STRIPE_API_HOST: "127.0.0.1", STRIPE_API_PORT: String(fake.port), STRIPE_API_PROTOCOL: "http" };
    const run = () => promisify(execFile)(process.execPath, ["--import", "tsx", "scripts/stripe-sync.ts"], { env, cwd: process.cwd() });
    expect((await run()).stdout).toMatch(/8 change\(s\)/);
    expect((await run()).stdout).toMatch(/catalogue already up to date/);
    const missing = await promisify(execFile)(process.execPath, ["--import", "tsx", "scripts/stripe-sync.ts"], { env: { ...env, STRIPE_SECRET_KEY: "" }, cwd: process.cwd() }).catch((e: { code: number; stderr: string }) => e);
    expect("code" in missing && missing.code).toBe(1);
    expect("stderr" in missing && missing.stderr).toMatch(/STRIPE_SECRET_KEY is required/);
  }, 60_000);
});
