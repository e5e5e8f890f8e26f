/** Loads .env.local then .env into process.env for scripts (Next loads them itself for the app). */
import nextEnv from "@next/env";

export function loadEnvFiles(dir = process.cwd()): void {
  nextEnv.loadEnvConfig(dir, process.env.NODE_ENV !== "production", { info: () => {}, error: console.error });
}
