/**
 * POST /api/w/:slug/monte-carlo through the route handler: NDJSON progress lines arrive before
 * the result, the result is the engine's own answer for the same seed (the route must not alter
 * or re-seed it), bad input and locked packs answer before any streaming, and an aborted request
 * stops the engine early instead of finishing 100,000 trials for nobody.
 */
import { beforeAll, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import { makeWorld, setupDb } from "./helpers";
import { getCalcType } from "@/lib/calc/registry";
import { parseRawInputs } from "@/lib/calc/core/inputs";
import type { RawInputs } from "@/lib/calc/core/types";
import { designFromInput, monteCarlo } from "@/lib/calc/filter";
import type { BandpassInput, CascadeInput } from "@/lib/calc/filter/schema";
import { write } from "@/db/write";
import { workspaces } from "@/db/schema";

/** Every runMonteCarlo call the route makes, with its progress and how it ended. */
const runs: Array<{ progress: number[]; total: number; outcome?: "resolved" | "rejected" }> = [];

vi.mock("@/lib/calc/filter/tolerance", async (importOriginal) => {
  const real = await importOriginal<typeof import("@/lib/calc/filter/tolerance")>();
  return {
    ...real,
    runMonteCarlo: async (...args: Parameters<typeof real.runMonteCarlo>) => {
      const [design, opts, control = {}] = args;
      const rec: (typeof runs)[number] = { progress: [], total: opts.trials };
      runs.push(rec);
      try {
        const r = await real.runMonteCarlo(design, opts, { ...control, onProgress: (d, t) => (rec.progress.push(d), control.onProgress?.(d, t)) });
        rec.outcome = "resolved";
        return r;
      } catch (e) {
        rec.outcome = "rejected";
        throw e;
      }
    },
  };
});

const { POST } = await import("@/app/api/w/[slug]/monte-carlo/route");

beforeAll(setupDb);

type Line = { type: string; done?: number; total?: number; [k: string]: unknown };

function request(cookie: string, body: unknown, signal?: AbortSignal): Request {
  return new Request("http://localhost:3999/api/w/x/monte-carlo", { method: "POST", headers: { cookie, "content-type": "application/json" }, body: JSON.stringify(body), signal });
}

/** Read NDJSON lines as they arrive; `onLine` may return true to stop reading (and cancel). */
async function readLines(res: Response, onLine?: (l: Line) => boolean | void): Promise<Line[]> {
  const reader = res.body!.getReader();
  const dec = new TextDecoder();
  const lines: Line[] = [];
  let buf = "";
  for (;;) {
    let chunk: ReadableStreamReadResult<Uint8Array>;
    try {
      chunk = await reader.read();
    } catch {
      break; // the stream errored because the request was aborted
    }
    if (chunk.done) break;
    buf += dec.decode(chunk.value, { stream: true });
    let i: number;
    while ((i = buf.indexOf("\n")) >= 0) {
      const text = buf.slice(0, i);
      buf = buf.slice(i + 1);
      if (!text.trim()) continue;
      const l = JSON.parse(text) as Line;
      lines.push(l);
      if (onLine?.(l)) {
        await reader.cancel();
        return lines;
      }
    }
  }
  return lines;
}

function parsedInput(typeId: string, raw: RawInputs) {
  const type = getCalcType(typeId)!;
  const p = parseRawInputs(type, raw);
  if (!p.ok) throw new Error(JSON.stringify(p.errors));
  return p.input as CascadeInput & BandpassInput;
}

describe("streaming Monte Carlo", () => {
  it("streams progress lines, then the same result as a direct engine call with the same seed", async () => {
    const w = await makeWorld();
    const raw: RawInputs = { ...getCalcType("filter.lowpass")!.defaults, mcSeed: 20251202, mcDistribution: "normal", order: 5 };
    const trials = 12_000;
    const res = await POST(request(w.engineer.cookie, { typeId: "filter.lowpass", inputs: raw, trials }), { params: Promise.resolve({ slug: w.slug }) });
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/application\/x-ndjson/);
    // The app server's gzip holds a body back until it ends unless told not to transform it.
    expect(res.headers.get("cache-control")).toContain("no-transform");
    const lines = await readLines(res);
    const progress = lines.filter((l) => l.type === "progress");
    const result = lines.at(-1)!;
    expect(result.type).toBe("result");
    // Progress first: increasing counts of the same total, ending at the total, before the result.
    expect(progress.length).toBeGreaterThanOrEqual(3);
    expect(progress.every((p) => p.total === trials)).toBe(true);
    for (let i = 1; i < progress.length; i++) expect(progress[i].done!).toBeGreaterThan(progress[i - 1].done!);
    expect(progress.at(-1)!.done).toBe(trials);
    expect(lines.indexOf(result)).toBe(lines.length - 1);

    // The direct, synchronous engine call with the same design, seed and distribution must give
    // identical statistics (same PRNG stream, same order of trials): exact equality is right.
    const input = parsedInput("filter.lowpass", raw);
    const direct = monteCarlo(designFromInput("lowpass", input), { trials, seed: 20251202, distribution: "normal" });
    expect(result.trials).toBe(trials);
    expect(result.seed).toBe(20251202);
    expect(result.frequency).toEqual(direct.frequency);
    expect(result.gain).toEqual(direct.gain);
    expect(result.sections).toEqual(direct.sections);
    expect(result.rejected).toBe(direct.rejected);
    const plots = result.plots as Array<{ kind: string; counts: number[]; edges: number[] }>;
    // The default low-pass is unity-gain Sallen-Key: its gain sets no toleranced part, so only
    // the frequency histogram is drawn (a gain histogram appears when the gain spreads).
    const gainSpreads = direct.gain.max - direct.gain.min > 1e-9 * Math.abs(direct.gain.mean);
    expect(plots.map((p) => p.kind)).toEqual(gainSpreads ? ["histogram", "histogram"] : ["histogram"]);
    expect(plots[0].counts).toEqual(direct.frequency.histogram.counts);
    // Every accepted trial is counted once in the histogram.
    expect(plots[0].counts.reduce((a, b) => a + b, 0)).toBe(trials - direct.rejected);
  });

  it("uses the calculation's own N when no trials are given, and runs band-pass designs too", async () => {
    const w = await makeWorld();
    const raw: RawInputs = { ...getCalcType("filter.bandpass")!.defaults, mcTrials: 1500, mcSeed: 7 };
    const res = await POST(request(w.checker.cookie, { typeId: "filter.bandpass", inputs: raw }), { params: Promise.resolve({ slug: w.slug }) });
    expect(res.status).toBe(200);
    const lines = await readLines(res);
    const result = lines.at(-1)!;
    expect(result.type).toBe("result");
    expect(result.trials).toBe(1500);
    const direct = monteCarlo(designFromInput("bandpass", parsedInput("filter.bandpass", raw)), { trials: 1500, seed: 7, distribution: raw.mcDistribution as "uniform" | "normal" });
    expect(result.frequency).toEqual(direct.frequency);
  });

  it("stops the engine early when the request is aborted", async () => {
    const w = await makeWorld();
    runs.length = 0;
    const ac = new AbortController();
    const trials = 100_000;
    const raw: RawInputs = { ...getCalcType("filter.lowpass")!.defaults, order: 8, response: "chebyshev", rippleDb: 0.5 };
    const res = await POST(request(w.engineer.cookie, { typeId: "filter.lowpass", inputs: raw, trials }, ac.signal), { params: Promise.resolve({ slug: w.slug }) });
    expect(res.status).toBe(200);
    const lines = await readLines(res, (l) => {
      if (l.type === "progress" && (l.done ?? 0) > 0) {
        ac.abort();
        return false; // keep reading: the route must end the stream itself
      }
    });
    expect(lines.some((l) => l.type === "result")).toBe(false);
    // Let the engine reach its next yield, then look at what it did.
    await new Promise((r) => setTimeout(r, 100));
    expect(runs).toHaveLength(1);
    expect(runs[0].outcome).toBe("rejected");
    const last = runs[0].progress.at(-1) ?? 0;
    expect(last).toBeLessThan(trials / 4); // stopped within a few chunks of 1,000, far from 100,000
  });

  it("stops the engine when the reader cancels the stream", async () => {
    const w = await makeWorld();
    runs.length = 0;
    const res = await POST(request(w.engineer.cookie, { typeId: "filter.lowpass", inputs: getCalcType("filter.lowpass")!.defaults, trials: 100_000 }), { params: Promise.resolve({ slug: w.slug }) });
    await readLines(res, (l) => l.type === "progress" && (l.done ?? 0) > 0);
    await new Promise((r) => setTimeout(r, 100));
    expect(runs[0].outcome).toBe("rejected");
    expect(runs[0].progress.at(-1)!).toBeLessThan(25_000);
  });

  it("answers 422 naming the field, before streaming, for inputs that do not parse", async () => {
    const w = await makeWorld();
    const raw: RawInputs = { ...getCalcType("filter.lowpass")!.defaults, cutoff: "1 kV" };
    const res = await POST(request(w.engineer.cookie, { typeId: "filter.lowpass", inputs: raw }), { params: Promise.resolve({ slug: w.slug }) });
    expect(res.status).toBe(422);
    const body = (await res.json()) as { error: { fields: Record<string, string> } };
    expect(body.error.fields.cutoff).toMatch(/wrong unit/);
    const tooMany = await POST(request(w.engineer.cookie, { typeId: "filter.lowpass", inputs: getCalcType("filter.lowpass")!.defaults, trials: 100_001 }), { params: Promise.resolve({ slug: w.slug }) });
    expect(tooMany.status).toBe(422);
    const notFilter = await POST(request(w.engineer.cookie, { typeId: "amplifier.gain-stage", inputs: getCalcType("amplifier.gain-stage")!.defaults }), { params: Promise.resolve({ slug: w.slug }) });
    expect(notFilter.status).toBe(422);
    expect(((await notFilter.json()) as { error: { fields: Record<string, string> } }).error.fields.typeId).toMatch(/no Monte Carlo/);
  });

  it("answers 402 when the filter pack is not subscribed", async () => {
    const w = await makeWorld({ status: "active" });
    await write((db) => db.update(workspaces).set({ packs: ["amplifier"] }).where(eq(workspaces.id, w.workspaceId)));
    const res = await POST(request(w.owner.cookie, { typeId: "filter.lowpass", inputs: getCalcType("filter.lowpass")!.defaults, trials: 100 }), { params: Promise.resolve({ slug: w.slug }) });
    expect(res.status).toBe(402);
    expect(((await res.json()) as { error: { code: string } }).error.code).toBe("pack_locked");
  });
});
