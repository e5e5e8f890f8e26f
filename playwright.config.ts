import { defineConfig } from "@playwright/test";
import { execFileSync } from "node:child_process";

// Free ports are picked once, in the main process, and inherited by the workers through the
// environment, so the tests never collide with a running demo (3000/1025/1080/12111).
if (!process.env.E2E_APP_PORT) {
  const script =
    "const n=require('net');const p=[];let k=0;for(let i=0;i<4;i++){const s=n.createServer();s.listen(0,'127.0.0.1',()=>{p[i]=s.address().port;s.close();if(++k===4)console.log(p.join(','))})}";
  const [app, smtp, mailWeb, stripe] = execFileSync(process.execPath, ["-e", script]).toString().trim().split(",");
  Object.assign(process.env, { E2E_APP_PORT: app, E2E_SMTP_PORT: smtp, E2E_MAIL_WEB_PORT: mailWeb, E2E_STRIPE_PORT: stripe });
}

export default defineConfig({
  testDir: "tests/e2e",
  testMatch: /.*\.spec\.ts$/,
  fullyParallel: false,
  workers: 1,
  retries: 0,
  timeout: 90_000,
  expect: { timeout: 15_000 },
  reporter: [["list"]],
  globalSetup: "./tests/e2e/global-setup.ts",
  outputDir: "test-results",
  use: {
    baseURL: `http://127.0.0.1:${process.env.E2E_APP_PORT}`,
    trace: "retain-on-failure",
    screenshot: "only-on-failure",
    launchOptions: {
      executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
      args: ["--no-sandbox", "--disable-gpu", "--disable-quic", "--disable-background-networking", "--disable-component-update", "--disable-sync", "--no-first-run"],
    },
  },
  projects: [{ name: "chromium", use: { browserName: "chromium" } }],
});
