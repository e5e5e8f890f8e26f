// Runs once when the server starts: validate the environment, then apply migrations.
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { env } = await import("./lib/env");
  env();
  const { runMigrations } = await import("./db/migrate");
  await runMigrations();
}
