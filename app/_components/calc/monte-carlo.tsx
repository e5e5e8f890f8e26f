"use client";
/**
 * A long Monte Carlo run of a filter (up to 100,000 trials) through the streaming route
 * POST /api/w/:slug/monte-carlo: a progress bar fed by its NDJSON progress lines, a Cancel button
 * that aborts the request (the server stops as soon as it notices), and the histograms and
 * statistics when it completes. The run uses the sheet's inputs as they are now (seed and
 * distribution included); it is not saved with the calculation.
 */
import { useEffect, useRef, useState } from "react";
import type { HistogramPlot } from "@/lib/calc/core/types";
import { formatQuantity } from "@/lib/calc/core/units";
import { Button, Notice } from "../ui";
import { count } from "./format";
import { SinglePlot } from "./plot";

interface FigureStats {
  unit: string;
  nominal: number;
  mean: number;
  std: number;
  min: number;
  max: number;
  percentiles: Array<{ p: number; value: number }>;
}

interface ResultLine {
  type: "result";
  trials: number;
  seed: number;
  distribution: string;
  rejected: number;
  target: { frequency: number; gain: number };
  frequency: FigureStats;
  gain: FigureStats;
  plots: HistogramPlot[];
}

type Line = { type: "progress"; done: number; total: number } | ResultLine | { type: "error"; message: string };

type State =
  | { kind: "idle" }
  | { kind: "running"; done: number; total: number; started: number }
  | { kind: "done"; result: ResultLine; ms: number }
  | { kind: "cancelled"; done: number; total: number }
  | { kind: "error"; message: string };

const MAX = 100_000;

export function MonteCarloRun({ slug, typeId, getInputs, disabled, disabledReason }: { slug: string; typeId: string; getInputs: () => Record<string, unknown>; disabled?: boolean; disabledReason?: string }) {
  const [trials, setTrials] = useState("100000");
  const [state, setState] = useState<State>({ kind: "idle" });
  const abort = useRef<AbortController | null>(null);
  useEffect(() => () => abort.current?.abort(), []);

  const n = Number(trials.replace(/[\s,_]/g, ""));
  const trialsProblem = !Number.isInteger(n) || n < 1 || n > MAX ? `Enter a whole number from 1 to ${count(MAX)}.` : null;

  const start = async () => {
    if (trialsProblem) return;
    const ac = new AbortController();
    abort.current = ac;
    const started = performance.now();
    setState({ kind: "running", done: 0, total: n, started });
    let last = { done: 0, total: n };
    try {
      const res = await fetch(`/api/w/${slug}/monte-carlo`, {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ typeId, inputs: getInputs(), trials: n }),
        signal: ac.signal,
        credentials: "same-origin",
      });
      if (!res.ok || !res.body) {
        const body = (await res.json().catch(() => null)) as { error?: { message?: string } } | null;
        setState({ kind: "error", message: body?.error?.message ?? `The server answered ${res.status}.` });
        return;
      }
      const reader = res.body.getReader();
      const dec = new TextDecoder();
      let buf = "";
      for (;;) {
        const { done, value } = await reader.read();
        if (done) break;
        buf += dec.decode(value, { stream: true });
        let i: number;
        while ((i = buf.indexOf("\n")) >= 0) {
          const text = buf.slice(0, i).trim();
          buf = buf.slice(i + 1);
          if (!text) continue;
          const line = JSON.parse(text) as Line;
          if (line.type === "progress") {
            last = { done: line.done, total: line.total };
            setState({ kind: "running", done: line.done, total: line.total, started });
          } else if (line.type === "result") {
            setState({ kind: "done", result: line, ms: performance.now() - started });
          } else {
            setState({ kind: "error", message: line.message });
          }
        }
      }
      setState((s) => (s.kind === "running" ? { kind: "error", message: "The run ended before its result arrived. Try again." } : s));
    } catch (e) {
      if (ac.signal.aborted) setState({ kind: "cancelled", ...last });
      else setState({ kind: "error", message: e instanceof Error ? e.message : String(e) });
    } finally {
      if (abort.current === ac) abort.current = null;
    }
  };

  const running = state.kind === "running";
  const pct = running ? (state.total ? state.done / state.total : 0) : 0;

  return (
    <section aria-labelledby="mc-title" className="rounded border border-rule-strong/70 bg-white/50 p-3">
      <h4 id="mc-title" className="text-[13px] font-semibold">
        Larger Monte Carlo run
      </h4>
      <p className="mb-2 text-[12.5px] text-ink-2">Runs the tolerance analysis again with many more trials, using the seed and distribution above. The result is shown here and is not saved with the calculation.</p>
      <div className="flex flex-wrap items-end gap-2">
        <div className="flex flex-col gap-0.5">
          <label htmlFor="mc-trials" className="text-[12.5px] text-ink-2">
            Trials N
          </label>
          <input
            id="mc-trials"
            className="h-8 w-32 rounded border border-rule-strong bg-white/85 px-2 text-right mono text-[13px] focus:border-copper focus:outline-none"
            value={trials}
            onChange={(e) => setTrials(e.target.value)}
            disabled={running}
            aria-invalid={!!trialsProblem}
            inputMode="numeric"
          />
        </div>
        {running ? (
          <Button size="sm" variant="danger" onClick={() => abort.current?.abort()}>
            Cancel
          </Button>
        ) : (
          <Button size="sm" variant="primary" disabled={!!trialsProblem || disabled} onClick={() => void start()} title={disabled ? disabledReason : undefined}>
            Run Monte Carlo
          </Button>
        )}
        {trialsProblem ? <span className="text-[12px] text-fail">{trialsProblem}</span> : null}
        {disabled && disabledReason ? <span className="text-[12px] text-ink-3">{disabledReason}</span> : null}
      </div>
      {running ? (
        <div className="mt-3" aria-live="polite">
          <div role="progressbar" aria-label="Monte Carlo progress" aria-valuemin={0} aria-valuemax={state.total} aria-valuenow={state.done} className="h-2 w-full overflow-hidden rounded-full bg-rule">
            <div className="h-full rounded-full bg-ink-2 transition-[width] duration-150" style={{ width: `${(pct * 100).toFixed(1)}%` }} />
          </div>
          <p className="mt-1 mono text-[12px] text-ink-2">
            {count(state.done)} of {count(state.total)} trials ({(pct * 100).toFixed(0)} %)
          </p>
        </div>
      ) : null}
      {state.kind === "cancelled" ? (
        <p className="mt-2 text-[12.5px] text-ink-2" role="status">
          Cancelled after {count(state.done)} of {count(state.total)} trials; nothing was kept.
        </p>
      ) : null}
      {state.kind === "error" ? (
        <div className="mt-2">
          <Notice tone="error">{state.message}</Notice>
        </div>
      ) : null}
      {state.kind === "done" ? <McResult r={state.result} ms={state.ms} /> : null}
    </section>
  );
}

function McResult({ r, ms }: { r: ResultLine; ms: number }) {
  const rows: Array<{ label: string; s: FigureStats; target: number; unit: string }> = [
    { label: "−3 dB / centre frequency", s: r.frequency, target: r.target.frequency, unit: "Hz" },
    { label: "Passband gain magnitude", s: r.gain, target: r.target.gain, unit: "V/V" },
  ];
  const q = (v: number, unit: string) => formatQuantity(v, unit, { digits: 5 });
  const dev = (v: number, t: number) => (t ? `${v / t - 1 >= 0 ? "+" : "−"}${formatQuantity(Math.abs(v / t - 1) * 100, "%", { digits: 3 })}` : "");
  return (
    <div className="mt-3" data-testid="mc-result">
      <p className="mb-2 text-[12.5px] text-ink-2" role="status">
        {count(r.trials)} trials, seed <span className="mono">{r.seed}</span>, {r.distribution}
        {r.rejected ? `, ${count(r.rejected)} rejected (unstable)` : ""}; {(ms / 1000).toFixed(1)} s.
      </p>
      <div className="overflow-x-auto">
        <table className="table-dense" aria-label="Monte Carlo statistics">
          <thead>
            <tr>
              <th>Figure</th>
              <th className="num">Target</th>
              <th className="num">Mean</th>
              <th className="num">σ</th>
              <th className="num">0.135 %</th>
              <th className="num">99.865 %</th>
              <th className="num">Spread</th>
            </tr>
          </thead>
          <tbody>
            {rows.map(({ label, s, target, unit }) => (
              <tr key={label}>
                <td>{label}</td>
                <td className="num mono">{q(target, unit)}</td>
                <td className="num mono">{q(s.mean, unit)}</td>
                <td className="num mono">{q(s.std, unit)}</td>
                <td className="num mono">{q(s.percentiles[0].value, unit)}</td>
                <td className="num mono">{q(s.percentiles[4].value, unit)}</td>
                <td className="num mono text-ink-2">
                  {dev(s.percentiles[0].value, target)} … {dev(s.percentiles[4].value, target)}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <div className="mt-3 grid gap-4 @4xl:grid-cols-2">
        {r.plots.map((p) => (
          <SinglePlot key={p.id} plot={p} />
        ))}
      </div>
    </div>
  );
}
