/**
 * Server environment, validated with zod on first use and at server start (instrumentation.ts).
 * A missing or malformed variable stops the server with a message naming it.
 */
import { z } from "zod";

const schema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  NEXTAUTH_URL: z.url({ error: "NEXTAUTH_URL must be the app's public URL, e.g. http://localhost:3000" }),
  NEXTAUTH_SECRET: z.string({ error: "NEXTAUTH_SECRET is required" }).min(32, "NEXTAUTH_SECRET must be at least 32 characters"),
  DATABASE_URL: z.string().default("file:./data/loopwright.db"),
  DATABASE_AUTH_TOKEN: z.string().optional(),
  SMTP_HOST: z.string().default("127.0.0.1"),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(1025),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  SMTP_SECURE: z.enum(["true", "false"]).default("false"),
  MAIL_FROM: z.string().default("Loopwright <no-reply@loopwright.invalid>"),
  /** "smtp" (default) or "json" (unit tests: messages kept in memory, nothing sent). */
  MAIL_TRANSPORT: z.enum(["smtp", "json"]).default("smtp"),
  STRIPE_SECRET_KEY: z.string({ error: "STRIPE_SECRET_KEY is required (sk_test_… for a local fake or Stripe test mode)" }).min(1, "STRIPE_SECRET_KEY is required"),
  STRIPE_WEBHOOK_SECRET: z.string({ error: "STRIPE_WEBHOOK_SECRET is required (whsec_…)" }).min(1, "STRIPE_WEBHOOK_SECRET is required"),
  /** Set these three to talk to a local Stripe-compatible server; leave unset for real Stripe. */
  STRIPE_API_HOST: z.string().optional(),
  STRIPE_API_PORT: z.coerce.number().int().min(1).max(65535).optional(),
  STRIPE_API_PROTOCOL: z.enum(["http", "https"]).optional(),
  /** Encrypts workspace signing keys at rest. */
  REPORT_KEY_SECRET: z.string({ error: "REPORT_KEY_SECRET is required" }).min(32, "REPORT_KEY_SECRET must be at least 32 characters"),
});

export type Env = z.output<typeof schema>;

let cached: Env | undefined;

/** The validated environment. Throws an Error naming every missing or malformed variable. */
export function env(): Env {
  if (cached) return cached;
  const parsed = schema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join(".") || "(env)"}: ${i.message}`);
    throw new Error(`Loopwright cannot start: the environment is incomplete.\n${lines.join("\n")}\nSee README.md, "Configuration".`);
  }
  cached = parsed.data;
  return cached;
}

/** The app's public base URL without a trailing slash. */
export function appUrl(): string {
  return env().NEXTAUTH_URL.replace(/\/$/, "");
}

/** For tests that change process.env between cases. */
export function resetEnvCache(): void {
  cached = undefined;
}
