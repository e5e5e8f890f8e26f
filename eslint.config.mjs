import { defineConfig, globalIgnores } from "eslint/config";
import nextVitals from "eslint-config-next/core-web-vitals";
import nextTs from "eslint-config-next/typescript";

export default defineConfig([
  ...nextVitals,
  ...nextTs,
  globalIgnores([".next/**", "node_modules/**", "data/**", "test-results/**", "playwright-report/**", "next-env.d.ts", "drizzle/**"]),
  {
    rules: {
      "@typescript-eslint/no-explicit-any": "error",
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
    },
  },
  {
    // App code never imports the local fakes of hosted services.
    files: ["app/**", "lib/**", "db/**", "pdf/**", "webhooks/**"],
    rules: {
      "no-restricted-imports": ["error", { patterns: ["@/fakes/*", "**/fakes/*"] }],
    },
  },
  {
    // The calculation engine stays pure: no React, no database, no Next (and no fakes).
    files: ["lib/calc/**/*.ts"],
    rules: {
      "no-restricted-imports": ["error", { patterns: ["react", "react-dom", "next", "next/*", "@/db/*", "@/lib/auth/*", "drizzle-orm", "@libsql/*", "@/app/*", "@/fakes/*", "**/fakes/*"] }],
    },
  },
]);
