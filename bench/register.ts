// The calculation register with 1,000 calculations in one project: time per page query
// (filter, search, sort, paginate in SQL) through lib/calculations, on a temporary SQLite file.
// Target (issue: "pagination that stays fast with 1,000 calculations"): median under 50 ms.
import os from "node:os";
import path from "node:path";
import fs from "node:fs";

const dir = fs.mkdtempSync(path.join(os.tmpdir(), "lw-bench-register-"));
process.env.DATABASE_URL = `file:${path.join(dir, "bench.db")}`;

const { runMigrations } = await import("../db/migrate");
const { write } = await import("../db/write");
const { closeDb } = await import("../db/client");
const schema = await import("../db/schema");
const { newId } = await import("../lib/ids");
const { trialFields } = await import("../lib/billing/trial");
const { listCalculations, listQuerySchema } = await import("../lib/calculations");

await runMigrations();
const now = Date.now();
const ws = { id: newId(), name: "Bench Firm", slug: "bench", createdAt: now, ...trialFields(now) };
const user = { id: newId(), email: "bench@example.test", name: "Bench User", createdAt: now };
const project = { id: newId(), workspaceId: ws.id, name: "Big project", createdBy: user.id, createdAt: now, updatedAt: now };
const types = ["amplifier.gain-stage", "filter.lowpass", "reference.shunt", "filter.bandpass"];
const statuses = ["draft", "in_check", "approved", "issued"] as const;
await write(async (db) => {
  await db.batch([
    db.insert(schema.users).values(user),
    db.insert(schema.workspaces).values(ws),
    db.insert(schema.memberships).values({ id: newId(), workspaceId: ws.id, userId: user.id, role: "owner", createdAt: now }),
    db.insert(schema.projects).values(project),
  ]);
  for (let i = 0; i < 1000; i += 100) {
    await db.insert(schema.calculations).values(
      Array.from({ length: 100 }, (_, k) => {
        const n = i + k;
        return {
          id: newId(),
          workspaceId: ws.id,
          projectId: project.id,
          number: `C-${String(n + 1).padStart(4, "0")}`,
          title: `${n % 7 === 0 ? "Reference" : "Sensor"} stage ${n}`,
          typeId: types[n % types.length],
          engineVersion: "1.0.0",
          status: statuses[n % statuses.length],
          inputs: { note: "x".repeat(2000) },
          results: { results: [], checks: [], blob: "y".repeat(20000) },
          checkSummary: { pass: 10, warning: 1, fail: 0 },
          preparedBy: user.id,
          createdAt: now + n,
          updatedAt: now + n,
        };
      }),
    );
  }
});

const ctx = { user: { ...user, passwordHash: null, sessionVersion: 1 }, workspace: { ...ws, stripeCustomerId: null, stripeSubscriptionId: null, seatsPaid: 0, currentPeriodEnd: null, cancelAtPeriodEnd: false, pastDueSince: null, subscriptionWatermark: 0 }, role: "owner" as const };
const queries: Record<string, Record<string, string>> = {
  "page 1, newest first": {},
  "page 10 of 20": { page: "10" },
  "sort by preparer": { sort: "preparer", dir: "asc" },
  "filter status + pack": { status: "in_check", pack: "filter" },
  "text search": { q: "Reference" },
};
console.log("Calculation register, 1,000 calculations in one project (median of 50 after 5 warm-up):");
let worst = 0;
for (const [name, q] of Object.entries(queries)) {
  const parsed = listQuerySchema.parse(q);
  for (let i = 0; i < 5; i++) await listCalculations(ctx as never, project.id, parsed);
  const times: number[] = [];
  let rows = 0;
  for (let i = 0; i < 50; i++) {
    const t = performance.now();
    const r = await listCalculations(ctx as never, project.id, parsed);
    times.push(performance.now() - t);
    rows = r.total;
  }
  times.sort((a, b) => a - b);
  const med = times[25];
  worst = Math.max(worst, med);
  console.log(`  ${name.padEnd(24)} ${med.toFixed(2).padStart(7)} ms  (${rows} matching)`);
}
console.log(`Target: median under 50 ms per page — ${worst < 50 ? "met" : "NOT met"} (worst ${worst.toFixed(2)} ms).`);
await closeDb();
fs.rmSync(dir, { recursive: true, force: true });
