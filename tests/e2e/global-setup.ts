/**
 * Starts everything the browser tests need, on the free ports chosen in playwright.config.ts:
 * a fresh SQLite file, the mail sink, the local Stripe fake and the built app (`next start`).
 * Returns the teardown that stops them.
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import crypto from "node:crypto";
import { runScript, startApp, startMailSink, startStripeFake, ROOT, type Service } from "../../scripts/services";

export default async function globalSetup(): Promise<() => Promise<void>> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "loopwright-e2e-"));
  const appPort = Number(process.env.E2E_APP_PORT);
  const appUrl = `http://127.0.0.1:${appPort}`;
  const webhookSecret = `whsec_${crypto.randomBytes(16).toString("hex")}`;
  const env: Record<string, string> = {
    NODE_ENV: "production",
    NEXTAUTH_URL: appUrl,
    NEXTAUTH_SECRET: crypto.randomBytes(32).toString("hex"),
    REPORT_KEY_SECRET: crypto.randomBytes(32).toString("hex"),
    DATABASE_URL: `file:${path.join(dir, "e2e.db")}`,
    SMTP_HOST: "127.0.0.1",
    SMTP_PORT: String(process.env.E2E_SMTP_PORT),
    STRIPE_SECRET_KEY: "sk_test_e2e_local_fake",
    STRIPE_WEBHOOK_SECRET: webhookSecret,
    STRIPE_API_HOST: "127.0.0.1",
    STRIPE_API_PORT: String(process.env.E2E_STRIPE_PORT),
    STRIPE_API_PROTOCOL: "http",
  };
  if (!fs.existsSync(path.join(ROOT, ".next", "BUILD_ID"))) throw new Error("No production build: run `npm run build` before the browser tests (npm test does).");

  const services: Service[] = [];
  const log = (name: string) => path.join(dir, `${name}.log`);
  try {
    services.push(await startMailSink({ smtpPort: Number(process.env.E2E_SMTP_PORT), webPort: Number(process.env.E2E_MAIL_WEB_PORT), logFile: log("mail") }));
    if (fs.existsSync(path.join(ROOT, "fakes", "stripe", "server.ts"))) {
      services.push(await startStripeFake({ port: Number(process.env.E2E_STRIPE_PORT), webhookUrl: `${appUrl}/api/webhooks/stripe`, webhookSecret, logFile: log("stripe") }));
      if (fs.existsSync(path.join(ROOT, "scripts", "stripe-sync.ts"))) await runScript(["scripts/stripe-sync.ts"], env);
    }
    services.push(await startApp({ port: appPort, env, mode: "start", logFile: log("app") }));
  } catch (err) {
    for (const f of fs.readdirSync(dir).filter((f) => f.endsWith(".log"))) console.error(`--- ${f}\n${fs.readFileSync(path.join(dir, f), "utf8").slice(-4000)}`);
    await Promise.all(services.map((s) => s.stop()));
    throw err;
  }
  process.env.E2E_BASE_URL = appUrl;
  process.env.E2E_MAIL_API = `http://127.0.0.1:${process.env.E2E_MAIL_WEB_PORT}`;
  process.env.E2E_STRIPE_URL = `http://127.0.0.1:${process.env.E2E_STRIPE_PORT}`;
  process.env.E2E_DATABASE_URL = env.DATABASE_URL;
  process.env.E2E_LOG_DIR = dir;
  process.env.E2E_WEBHOOK_SECRET = webhookSecret;
  return async () => {
    await Promise.all(services.reverse().map((s) => s.stop()));
  };
}
