// npm run demo – the whole product on this machine: writes .env.local with random secrets if it
// is missing, migrates, seeds the invented demo firm, starts the mail sink, the local Stripe fake
// and the app on http://localhost:3000, and prints the demo logins. Ctrl-C stops everything.
import crypto from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { spawnSync } from "node:child_process";
import { portInUse, ROOT, runScript, startApp, startMailSink, startStripeFake, type Service } from "./services";

const PORTS = { app: 3000, smtp: 1025, mailWeb: 1080, stripe: 12111 };
const envFile = path.join(ROOT, ".env.local");

function secret(bytes = 32): string {
  return crypto.randomBytes(bytes).toString("base64url");
}

function ensureEnvFile(): void {
  if (fs.existsSync(envFile)) {
    console.log("Using the existing .env.local");
    return;
  }
  const lines = [
    "# Written by `npm run demo` with fresh random secrets. Safe to delete: it is re-created.",
    `NEXTAUTH_URL=http://localhost:${PORTS.app}`,
    `NEXTAUTH_SECRET=${secret()}`,
    `REPORT_KEY_SECRET=${secret()}`,
    "DATABASE_URL=file:./data/loopwright.db",
    "SMTP_HOST=127.0.0.1",
    `SMTP_PORT=${PORTS.smtp}`,
    "MAIL_FROM=Loopwright <no-reply@loopwright.invalid>",
    "STRIPE_SECRET_KEY=sk_test_loopwright_local_fake",
    `STRIPE_WEBHOOK_SECRET=whsec_${secret(24)}`,
    "STRIPE_API_HOST=127.0.0.1",
    `STRIPE_API_PORT=${PORTS.stripe}`,
    "STRIPE_API_PROTOCOL=http",
    "",
  ];
  fs.writeFileSync(envFile, lines.join("\n"), { mode: 0o600 });
  console.log("Wrote .env.local with new random secrets");
}

function readEnvFile(): Record<string, string> {
  const out: Record<string, string> = {};
  for (const line of fs.readFileSync(envFile, "utf8").split("\n")) {
    const m = /^([A-Z0-9_]+)=(.*)$/.exec(line.trim());
    if (m) out[m[1]] = m[2];
  }
  return out;
}

async function main(): Promise<void> {
  ensureEnvFile();
  const env = readEnvFile();
  Object.assign(process.env, env);

  for (const [name, port] of Object.entries(PORTS)) {
    if (await portInUse(port)) {
      console.error(`Port ${port} (${name}) is already in use. Stop whatever runs there (an earlier demo?) and try again.`);
      process.exit(1);
    }
  }

  await runScript(["scripts/migrate.ts"], env);
  await runScript(["scripts/seed.ts"], env);

  const services: Service[] = [];
  const stopAll = async () => {
    await Promise.all(services.reverse().map((s) => s.stop()));
  };
  process.on("SIGINT", () => void stopAll().then(() => process.exit(0)));
  process.on("SIGTERM", () => void stopAll().then(() => process.exit(0)));

  try {
    services.push(await startMailSink({ smtpPort: PORTS.smtp, webPort: PORTS.mailWeb }));
    const appUrl = env.NEXTAUTH_URL ?? `http://localhost:${PORTS.app}`;
    if (fs.existsSync(path.join(ROOT, "fakes", "stripe", "server.ts"))) {
      fs.mkdirSync(path.join(ROOT, "data"), { recursive: true });
      services.push(
        await startStripeFake({
          port: PORTS.stripe,
          webhookUrl: `${appUrl.replace("localhost", "127.0.0.1")}/api/webhooks/stripe`,
          webhookSecret: env.STRIPE_WEBHOOK_SECRET,
          stateFile: path.join(ROOT, "data", "stripe-fake.json"),
        }),
      );
      if (fs.existsSync(path.join(ROOT, "scripts", "stripe-sync.ts"))) await runScript(["scripts/stripe-sync.ts"], env);
    }

    if (!process.argv.includes("--no-build")) {
      console.log("Building the app (next build)…");
      const b = spawnSync(process.execPath, [path.join(ROOT, "node_modules", "next", "dist", "bin", "next"), "build"], { cwd: ROOT, stdio: "inherit", env: { ...process.env, ...env } });
      if (b.status !== 0) throw new Error("next build failed");
    }
    const app = await startApp({ port: PORTS.app, env, mode: "start" });
    services.push(app);

    const logins = JSON.parse(fs.readFileSync(path.join(ROOT, "data", "demo-logins.json"), "utf8")) as Array<{ role: string; email: string; password: string }>;
    console.log(`
Loopwright is running: http://localhost:${PORTS.app}
  Mail sink (every e-mail the app sends): http://localhost:${PORTS.mailWeb}
  Local Stripe fake: http://127.0.0.1:${PORTS.stripe}

Demo logins (invented firm, invented people):
${logins.map((l) => `  ${l.role.padEnd(9)} ${l.email.padEnd(34)} ${l.password}`).join("\n")}

Press Ctrl-C to stop.`);
  } catch (err) {
    console.error(err instanceof Error ? err.message : err);
    await stopAll();
    process.exit(1);
  }
}

void main();
