/**
 * Issuing is atomic even when the process dies: a child process issues a calculation and is
 * killed with SIGKILL at each step (before and after the signing identity, in the middle of
 * rendering and signing, just before, during and just after the database batch). After every
 * kill the database holds either the approved calculation and no report, or the issued revision
 * with its complete signed PDF, never anything in between; and an interrupted issue can simply
 * be repeated.
 */
import { spawn } from "node:child_process";
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { read, write } from "@/db/write";
import { calculationHistory, calculations, reports } from "@/db/schema";
import { newId } from "@/lib/ids";
import { draftCalculation, makeWorld, setupDb, type World } from "./helpers";
import { approve, assertInvariant, calcVersion, download, issueAs, pdfsig } from "./reports-support";

beforeAll(async () => {
  await setupDb();
});

/** When to kill: when the child prints `step`, either holding there or `delayMs` after it while it runs on. */
interface KillPoint {
  name: string;
  step: "start" | "checked" | "identity" | "built" | "signed" | "committed";
  hold: boolean;
  delayMs?: number;
}

// A cold child takes ~7 s to start, ~8 s to render and sign, and ~25 ms from "signed" to the
// commit (measured here): the delays after "signed" aim into the batch itself.
const POINTS: KillPoint[] = [
  { name: "before the signing identity", step: "checked", hold: true },
  { name: "after the signing identity", step: "identity", hold: true },
  { name: "while rendering", step: "built", hold: false, delayMs: 1500 },
  { name: "while rendering or signing", step: "built", hold: false, delayMs: 5000 },
  { name: "signed, before the batch", step: "signed", hold: true },
  { name: "racing the batch (0 ms)", step: "signed", hold: false, delayMs: 0 },
  { name: "racing the batch (10 ms)", step: "signed", hold: false, delayMs: 10 },
  { name: "racing the batch (18 ms)", step: "signed", hold: false, delayMs: 18 },
  { name: "racing the batch (26 ms)", step: "signed", hold: false, delayMs: 26 },
  { name: "after the commit, before the mail", step: "committed", hold: true },
];

/** Run the child until the kill point (or its end); resolves with the steps it printed. */
function runAndKill(w: World, calcId: string, version: number, p: KillPoint): Promise<{ steps: string[]; times: Record<string, number>; killed: boolean; stderr: string }> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ["--import", "tsx", "tests/integration/reports-issue-child.ts", calcId, w.slug, w.checker.id, String(version), p.hold ? p.step : "none"], {
      cwd: process.cwd(),
      env: process.env,
      stdio: ["ignore", "pipe", "pipe"],
    });
    const steps: string[] = [];
    const times: Record<string, number> = {};
    let stderr = "";
    let killed = false;
    let buf = "";
    const kill = () => {
      if (!killed) {
        killed = true;
        child.kill("SIGKILL");
      }
    };
    child.stdout.on("data", (d: Buffer) => {
      buf += d.toString();
      let i: number;
      while ((i = buf.indexOf("\n")) >= 0) {
        const line = buf.slice(0, i).trim();
        buf = buf.slice(i + 1);
        if (!line.startsWith("step:")) continue;
        const [s, t] = line.slice(5).split(" ");
        times[s] = Number(t);
        steps.push(s);
        if (s === p.step) {
          if (p.hold || !p.delayMs) kill();
          else setTimeout(kill, p.delayMs);
        }
      }
    });
    child.stderr.on("data", (d: Buffer) => (stderr += d.toString()));
    child.on("error", reject);
    child.on("exit", () => resolve({ steps, times, killed, stderr }));
  });
}

/** A fresh approved calculation in project P. */
async function approvedCalc(w: World, number: string): Promise<string> {
  const id = newId();
  const row = draftCalculation({ id, workspaceId: w.workspaceId, projectId: w.projectP, preparedBy: w.engineer.id, number, now: Date.now() });
  await write((db) =>
    db.batch([
      db.insert(calculations).values(row),
      db.insert(calculationHistory).values({ id: newId(), workspaceId: w.workspaceId, calculationId: id, revision: "A", version: 1, event: "create", status: "draft", title: row.title, inputs: row.inputs, results: row.results, engineVersion: row.engineVersion, actorId: w.engineer.id, at: Date.now() }),
    ]),
  );
  await approve(w, id);
  return id;
}

describe("a process killed while issuing", () => {
  it("never leaves an issued calculation without its signed PDF, nor a PDF without its issued revision", async () => {
    const w = await makeWorld();
    const outcomes: string[] = [];
    for (const [i, p] of POINTS.entries()) {
      const calcId = await approvedCalc(w, `C-${String(200 + i)}`);
      const version = await calcVersion(calcId);
      const run = await runAndKill(w, calcId, version, p);
      expect(run.steps, `${p.name}: the child reached ${p.step} (stderr: ${run.stderr.slice(-3000)})`).toContain(p.step);
      await assertInvariant();

      const db = await read();
      const c = (await db.query.calculations.findFirst({ where: eq(calculations.id, calcId) }))!;
      const rows = await db.select().from(reports).where(eq(reports.calculationId, calcId));
      outcomes.push(`${p.name}: ${c.status}, ${rows.length} report(s), last step ${run.steps.at(-1)}`);
      if (p.hold && p.step !== "committed") {
        // Killed before the batch: nothing of the issue was written.
        expect(c.status, p.name).toBe("approved");
        expect(c.version, p.name).toBe(version);
        expect(rows, p.name).toHaveLength(0);
      }
      if (p.step === "committed") {
        expect(c.status, p.name).toBe("issued");
        expect(rows, p.name).toHaveLength(1);
      }
      if (c.status === "approved") {
        // Nothing is stuck: the interrupted issue can be repeated and gives one signed report.
        const again = await issueAs(w, w.checker, calcId);
        expect(again.status, `${p.name}: issue again ${JSON.stringify(again.body)}`).toBe(201);
      }
      const [rep] = await db.select().from(reports).where(eq(reports.calculationId, calcId));
      expect(rep, p.name).toBeDefined();
      const d = await download(w, w.client, rep.id);
      expect(pdfsig(d.bytes), p.name).toContain("Signature is Valid.");
      await assertInvariant();
    }
    // One identity for the workspace even though several processes may have created one.
    const { signingIdentities } = await import("@/db/schema");
    const ids = await (await read()).select().from(signingIdentities).where(eq(signingIdentities.workspaceId, w.workspaceId));
    expect(ids).toHaveLength(1);
    console.info(`[reports-atomic] ${outcomes.join("; ")}`);
  }, 480_000);
});
