/**
 * Child process of reports-atomic.test.ts (not a test itself): issues one calculation in the
 * test database named by DATABASE_URL and prints each step of the issue on stdout with the time
 * since the child started ("step:signed 1234.5"). At the step named by the last argument it stops
 * and waits, so the parent can SIGKILL it exactly there; "none" runs to the end.
 *
 * Usage: node --import tsx tests/integration/reports-issue-child.ts <calcId> <slug> <userId> <version> <stopAt>
 */
import { eq } from "drizzle-orm";
import { read } from "@/db/write";
import { users } from "@/db/schema";
import { authorize } from "@/lib/auth/guard";
import { issueReport } from "@/lib/reports/issue";

const [calcId, slug, userId, version, stopAt] = process.argv.slice(2);
const user = await (await read()).query.users.findFirst({ where: eq(users.id, userId) });
const ctx = await authorize(user ?? null, slug, "calc.issue");
process.stdout.write(`step:start ${performance.now().toFixed(1)}\n`);
await issueReport(ctx, calcId, { version: Number(version) }, {
  onStep: async (step) => {
    process.stdout.write(`step:${step} ${performance.now().toFixed(1)}\n`);
    // Wait here until killed (the interval keeps the event loop alive).
    if (step === stopAt) await new Promise(() => setInterval(() => undefined, 1000));
  },
});
process.stdout.write("done\n");
process.exit(0);
