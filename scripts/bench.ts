// npm run bench – runs every bench/*.ts in turn and prints what each measures.
// Benchmarks are scripts, never timed tests: each prints its own medians and targets.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";

const dir = path.join(process.cwd(), "bench");
const only = process.argv.slice(2);
const files = fs
  .readdirSync(dir)
  .filter((f) => f.endsWith(".ts") && !f.startsWith("_"))
  .filter((f) => only.length === 0 || only.some((o) => f.includes(o)))
  .sort();

let failed = 0;
for (const f of files) {
  console.log(`\n=== bench/${f} ===`);
  const r = spawnSync(process.execPath, ["--import", "tsx", path.join(dir, f)], { stdio: "inherit", env: process.env });
  if (r.status !== 0) failed++;
}
console.log(`\n${files.length} benchmark file(s) run${failed ? `, ${failed} failed` : ""}.`);
process.exit(failed ? 1 : 0);
