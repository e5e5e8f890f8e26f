// npm run db:seed – the invented demo firm (idempotent); writes data/demo-logins.json.
import { loadEnvFiles } from "./env-files";
loadEnvFiles();
// Seeding sends no mail (the sink may not run yet): messages stay in memory.
process.env.MAIL_TRANSPORT = "json";
const { seedDemo } = await import("./seed-demo");
const { closeDb } = await import("../db/client");
const logins = await seedDemo();
const fs = await import("node:fs");
fs.mkdirSync("data", { recursive: true });
fs.writeFileSync("data/demo-logins.json", JSON.stringify(logins, null, 2));
console.log(`demo firm ready (${logins.length} logins in data/demo-logins.json)`);
await closeDb();
