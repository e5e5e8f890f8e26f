/**
 * Starting the local pieces: the mail sink (maildev), the local Stripe-compatible fake and the
 * app itself, each as a child process, waiting until each answers. Used by `npm run demo`
 * (fixed ports) and by the end-to-end tests (free ports, temporary database).
 */
import { spawn, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import net from "node:net";
import path from "node:path";

const ROOT = path.resolve(path.dirname(new URL(import.meta.url).pathname), "..");

export interface Service {
  name: string;
  child: ChildProcess;
  stop(): Promise<void>;
}

/** A free TCP port on 127.0.0.1. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.unref();
    srv.on("error", reject);
    srv.listen(0, "127.0.0.1", () => {
      const addr = srv.address();
      const port = typeof addr === "object" && addr ? addr.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

/** Whether something already listens on host:port. */
export function portInUse(port: number, host = "127.0.0.1"): Promise<boolean> {
  return new Promise((resolve) => {
    const sock = net.connect({ port, host });
    sock.once("connect", () => {
      sock.destroy();
      resolve(true);
    });
    sock.once("error", () => resolve(false));
  });
}

async function waitForHttp(url: string, timeoutMs: number, child: ChildProcess, name: string): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  let lastErr = "";
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`${name} exited with code ${child.exitCode} before it was ready`);
    try {
      const res = await fetch(url, { signal: AbortSignal.timeout(2000) });
      if (res.status < 500) return;
      lastErr = `HTTP ${res.status}`;
    } catch (e) {
      lastErr = e instanceof Error ? e.message : String(e);
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`${name} did not answer at ${url} within ${timeoutMs} ms (${lastErr})`);
}

function launch(name: string, cmd: string, args: string[], env: Record<string, string | undefined>, logFile?: string): ChildProcess {
  const out = logFile ? fs.openSync(logFile, "a") : "inherit";
  const child = spawn(cmd, args, {
    cwd: ROOT,
    env: env as NodeJS.ProcessEnv,
    stdio: ["ignore", out, out],
    detached: process.platform !== "win32",
  });
  child.on("error", (e) => console.error(`[${name}] failed to start: ${e.message}`));
  return child;
}

function stopper(name: string, child: ChildProcess): () => Promise<void> {
  return () =>
    new Promise((resolve) => {
      if (child.exitCode !== null || child.pid === undefined) return resolve();
      child.once("exit", () => resolve());
      try {
        process.kill(-child.pid, "SIGTERM");
      } catch {
        child.kill("SIGTERM");
      }
      setTimeout(() => {
        try {
          if (child.pid) process.kill(-child.pid, "SIGKILL");
        } catch {
          /* already gone */
        }
        resolve();
      }, 5000).unref();
    });
}

/** The mail sink: SMTP on smtpPort, web UI and REST API (/api/email) on webPort. */
export async function startMailSink(opts: { smtpPort: number; webPort: number; logFile?: string }): Promise<Service & { apiUrl: string }> {
  const bin = path.join(ROOT, "node_modules", "maildev", "dist", "bin", "maildev.js");
  const child = launch(
    "mail",
    process.execPath,
    [bin, "--ip", "127.0.0.1", "--web-ip", "127.0.0.1", "-s", String(opts.smtpPort), "-w", String(opts.webPort), "--silent"],
    process.env,
    opts.logFile,
  );
  const apiUrl = `http://127.0.0.1:${opts.webPort}`;
  await waitForHttp(`${apiUrl}/api/email`, 20_000, child, "mail sink");
  return { name: "mail", child, apiUrl, stop: stopper("mail", child) };
}

/** The local Stripe-compatible fake (fakes/stripe), delivering webhooks to webhookUrl. */
export async function startStripeFake(opts: { port: number; webhookUrl: string; webhookSecret: string; stateFile?: string; logFile?: string }): Promise<Service & { url: string }> {
  const args = ["--import", "tsx", path.join(ROOT, "fakes", "stripe", "server.ts"), "--port", String(opts.port), "--webhook-url", opts.webhookUrl, "--webhook-secret", opts.webhookSecret];
  if (opts.stateFile) args.push("--state-file", opts.stateFile);
  const child = launch("stripe-fake", process.execPath, args, process.env, opts.logFile);
  const url = `http://127.0.0.1:${opts.port}`;
  await waitForHttp(`${url}/_fake/health`, 20_000, child, "Stripe fake");
  return { name: "stripe-fake", child, url, stop: stopper("stripe-fake", child) };
}

/** The app: `next start` (after `next build`) or `next dev`, with the given environment. */
export async function startApp(opts: { port: number; env: Record<string, string | undefined>; mode: "start" | "dev"; logFile?: string; timeoutMs?: number }): Promise<Service & { url: string }> {
  const bin = path.join(ROOT, "node_modules", "next", "dist", "bin", "next");
  const child = launch("app", process.execPath, [bin, opts.mode, "-p", String(opts.port), "-H", "127.0.0.1"], { ...process.env, ...opts.env }, opts.logFile);
  const url = `http://127.0.0.1:${opts.port}`;
  await waitForHttp(`${url}/api/auth/csrf`, opts.timeoutMs ?? 90_000, child, "app");
  return { name: "app", child, url, stop: stopper("app", child) };
}

/** Run a script to completion (e.g. migrations), inheriting output. */
export function runScript(args: string[], env: Record<string, string | undefined>): Promise<void> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ["--import", "tsx", ...args], { cwd: ROOT, env: { ...process.env, ...env } as NodeJS.ProcessEnv, stdio: "inherit" });
    child.on("exit", (code) => (code === 0 ? resolve() : reject(new Error(`${args.join(" ")} exited with ${code}`))));
  });
}

export { ROOT };
