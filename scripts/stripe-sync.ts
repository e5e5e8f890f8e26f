/**
 * Creates (or updates) Loopwright's products and prices in Stripe from lib/billing/plans.ts,
 * idempotently by product id and price lookup key: running it twice changes nothing.
 *
 *   npx tsx scripts/stripe-sync.ts
 *
 * Reads STRIPE_SECRET_KEY, and STRIPE_API_HOST / STRIPE_API_PORT / STRIPE_API_PROTOCOL for a
 * local Stripe-compatible server (from the environment, .env.local or .env). Without the three
 * STRIPE_API_* variables it talks to real Stripe: use a test-mode key.
 */
import { loadEnvFiles } from "./env-files";
import { syncCatalog } from "../lib/billing/catalog";
import { createStripeClient } from "../lib/billing/stripe";

async function main(): Promise<void> {
  loadEnvFiles();
  const secretKey = process.env.STRIPE_SECRET_KEY;
  if (!secretKey) throw new Error("STRIPE_SECRET_KEY is required (sk_test_… for a local fake or Stripe test mode). See README.md, \"Configuration\".");
  const host = process.env.STRIPE_API_HOST || undefined;
  const port = process.env.STRIPE_API_PORT ? Number(process.env.STRIPE_API_PORT) : undefined;
  const protocol = process.env.STRIPE_API_PROTOCOL === "http" ? "http" : process.env.STRIPE_API_PROTOCOL === "https" ? "https" : undefined;
  if (port !== undefined && (!Number.isInteger(port) || port < 1 || port > 65535)) throw new Error(`STRIPE_API_PORT must be a port number (got ${process.env.STRIPE_API_PORT}).`);
  const where = host ? `${protocol ?? "https"}://${host}:${port ?? ""}` : "Stripe";
  const changes = await syncCatalog(createStripeClient({ secretKey, host, port, protocol }));
  for (const c of changes) console.log(`[stripe-sync] ${c.object.padEnd(7)} ${c.plan.padEnd(9)} ${c.action.padEnd(9)} ${c.id}`);
  const changed = changes.filter((c) => c.action !== "unchanged").length;
  console.log(`[stripe-sync] ${where}: ${changed === 0 ? "catalogue already up to date" : `${changed} change(s)`}`);
}

main().catch((err: unknown) => {
  console.error(`[stripe-sync] ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
