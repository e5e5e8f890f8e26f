/** Applies the SQL migrations in drizzle/ to the database named by DATABASE_URL. */
import { migrate } from "drizzle-orm/libsql/migrator";
import path from "node:path";
import { dbReady } from "./client";

export async function runMigrations(): Promise<void> {
  const db = await dbReady();
  await migrate(db, { migrationsFolder: path.join(process.cwd(), "drizzle") });
}
