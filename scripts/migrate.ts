// npm run db:migrate – apply drizzle/ migrations to DATABASE_URL.
import { loadEnvFiles } from "./env-files";
loadEnvFiles();
const { runMigrations } = await import("../db/migrate");
const { closeDb, databaseUrl } = await import("../db/client");
await runMigrations();
console.log(`migrations applied to ${databaseUrl()}`);
await closeDb();
