import { defineConfig } from "vitest/config";
import path from "node:path";
import { fileURLToPath } from "node:url";

export default defineConfig({
  resolve: { alias: { "@": path.dirname(fileURLToPath(import.meta.url)) } },
  test: {
    include: ["tests/unit/**/*.test.ts", "tests/reference/**/*.test.ts", "tests/integration/**/*.test.ts", "tests/spice/**/*.test.ts", "fakes/**/*.test.ts"],
    environment: "node",
    setupFiles: ["tests/setup-env.ts"],
    testTimeout: 30_000,
    hookTimeout: 60_000,
    pool: "forks",
  },
});
