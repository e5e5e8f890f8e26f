/**
 * The long Monte Carlo of a filter calculation, streamed: the request is validated and the
 * filter designed before anything is sent (so bad input is an ordinary 422 / 402 JSON error),
 * then the engine's chunked runner (lib/calc/filter/tolerance.ts `runMonteCarlo`) sends one
 * NDJSON line per chunk and one result line:
 *
 *   {"type":"progress","done":2000,"total":100000}
 *   …
 *   {"type":"result","trials":100000,"seed":1,"distribution":"uniform","rejected":0,
 *    "target":{"frequency":1000,"gain":1},"frequency":{…FigureStats},"gain":{…},"sections":[…],
 *    "plots":[HistogramPlot, HistogramPlot]}
 *
 * or, when the engine fails, {"type":"error","message":"…"}. The run stops as soon as the client
 * goes away: the request's signal and the stream's cancel both abort the engine between chunks.
 */
import { z } from "zod";
import type { WorkspaceContext } from "@/lib/auth/guard";
import { assertPackUnlocked } from "@/lib/billing/access";
import { parseRawInputs } from "@/lib/calc/core/inputs";
import type { RawInputs } from "@/lib/calc/core/types";
import { designFromInput, runMonteCarlo, type FilterDesign, type MonteCarloOptions, type MonteCarloResult } from "@/lib/calc/filter";
import { histogramPlot } from "@/lib/calc/filter/compute";
import type { BandpassInput, CascadeInput } from "@/lib/calc/filter/schema";
import { MAX_MONTE_CARLO_TRIALS } from "@/lib/calc/filter/tolerance";
import { fieldMap, requireCalcType } from "@/lib/calculations/compute";
import { AppError } from "@/lib/errors";

/** Body of POST /api/w/:slug/monte-carlo. `trials` overrides the calculation's own N. */
export const monteCarloBody = z.object({
  typeId: z.string({ error: "typeId is required" }).min(1, "typeId is required").max(100),
  inputs: z.record(z.string(), z.unknown(), { error: "inputs must be an object of field values" }),
  trials: z
    .number({ error: "trials must be a number" })
    .int("trials must be a whole number")
    .min(1, "trials must be at least 1")
    .max(MAX_MONTE_CARLO_TRIALS, `trials must be at most ${MAX_MONTE_CARLO_TRIALS.toLocaleString("en-GB")}`)
    .optional(),
});
export type MonteCarloBody = z.output<typeof monteCarloBody>;

const FILTER_KINDS = { "filter.lowpass": "lowpass", "filter.highpass": "highpass", "filter.bandpass": "bandpass" } as const;
type FilterKind = (typeof FILTER_KINDS)[keyof typeof FILTER_KINDS];

/** A validated run: the designed filter and the engine options. */
export interface MonteCarloJob {
  kind: FilterKind;
  design: FilterDesign;
  options: MonteCarloOptions;
  /** Target −3 dB (or centre) frequency, Hz, and target passband gain magnitude, V/V. */
  target: { frequency: number; gain: number };
}

/**
 * Validate a request: known filter type, pack unlocked (402), inputs that parse (422 naming the
 * fields, as POST /compute does), and design the filter.
 */
export function prepareMonteCarlo(ctx: WorkspaceContext, body: MonteCarloBody): MonteCarloJob {
  const type = requireCalcType(body.typeId);
  assertPackUnlocked(ctx.workspace, type.pack);
  const kind = (FILTER_KINDS as Record<string, FilterKind | undefined>)[type.id];
  if (!kind) throw new AppError("invalid_input", `${type.title} has no Monte Carlo analysis; it runs for the active filter types only.`, { fields: { typeId: "has no Monte Carlo analysis" } });
  const parsed = parseRawInputs(type, body.inputs as RawInputs);
  if (!parsed.ok) throw new AppError("invalid_input", parsed.errors.map((e) => e.message).slice(0, 3).join(" "), { fields: fieldMap(parsed.errors) });
  const input = parsed.input as CascadeInput | BandpassInput;
  const design = designFromInput(kind, input);
  return {
    kind,
    design,
    options: { trials: body.trials ?? input.mcTrials, seed: input.mcSeed, distribution: input.mcDistribution },
    target: { frequency: design.targetFrequency, gain: Math.abs(design.targetGain) },
  };
}

/** Trials per chunk: about a hundred progress lines for a long run, never tiny chunks. */
export function chunkSizeFor(trials: number): number {
  return Math.max(500, Math.ceil(trials / 100));
}


/** The result line: the engine's statistics and the two histograms the sheet draws. */
export function resultLine(job: MonteCarloJob, r: MonteCarloResult) {
  const bp = job.kind === "bandpass";
  const fLabel = bp ? "centre frequency" : "−3 dB frequency";
  return {
    type: "result" as const,
    trials: r.trials,
    seed: r.seed,
    distribution: r.distribution,
    sigmaPerTolerance: r.sigmaPerTolerance,
    rejected: r.rejected,
    target: job.target,
    frequency: r.frequency,
    gain: r.gain,
    sections: r.sections,
    plots: [
      histogramPlot("mc.frequency", `Monte Carlo: ${fLabel} (${r.trials.toLocaleString("en-GB")} trials)`, bp ? "Centre frequency" : "−3 dB frequency", "Hz", r.frequency, job.target.frequency),
      // No one-bin histogram for a gain no toleranced part sets (as in the filter compute).
      ...(r.gain.max - r.gain.min > 1e-9 * Math.max(Math.abs(r.gain.mean), 1e-30)
        ? [histogramPlot("mc.gain", `Monte Carlo: passband gain magnitude (${r.trials.toLocaleString("en-GB")} trials)`, bp ? "Centre gain" : "Passband gain", "V/V", r.gain, job.target.gain)]
        : []),
    ],
  };
}

/**
 * Run the job and stream NDJSON. Work stops when `signal` aborts (the client disconnected) or
 * the reader cancels the stream.
 */
export function monteCarloStream(job: MonteCarloJob, signal: AbortSignal): Response {
  const ac = new AbortController();
  const stop = () => ac.abort(new DOMException("The client went away.", "AbortError"));
  if (signal.aborted) stop();
  else signal.addEventListener("abort", stop, { once: true });
  const enc = new TextEncoder();
  const stream = new ReadableStream<Uint8Array>({
    async start(controller) {
      const send = (line: object) => {
        if (!ac.signal.aborted) controller.enqueue(enc.encode(`${JSON.stringify(line)}\n`));
      };
      try {
        const total = Math.max(1, Math.floor(job.options.trials));
        send({ type: "progress", done: 0, total });
        const r = await runMonteCarlo(job.design, job.options, {
          signal: ac.signal,
          chunkSize: chunkSizeFor(total),
          onProgress: (done, n) => send({ type: "progress", done, total: n }),
        });
        send(resultLine(job, r));
      } catch (err) {
        if (!ac.signal.aborted) {
          console.error("[loopwright] monte-carlo failed", err);
          send({ type: "error", message: "The Monte Carlo run could not be completed for these inputs. Nothing was saved; please report this with the inputs." });
        }
      } finally {
        signal.removeEventListener("abort", stop);
        try {
          controller.close();
        } catch {
          // already closed or cancelled by the reader
        }
      }
    },
    cancel() {
      stop();
    },
  });
  return new Response(stream, {
    headers: {
      "content-type": "application/x-ndjson; charset=utf-8",
      // no-transform: the server's gzip would otherwise hold the progress lines back until the end.
      "cache-control": "no-store, no-transform",
      "x-content-type-options": "nosniff",
      // Ask proxies not to buffer, so progress lines arrive as they are written.
      "x-accel-buffering": "no",
    },
  });
}
