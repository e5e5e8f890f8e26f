"use client";
/**
 * The right-hand side of the calculation pad: what follows from the inputs and why. Checks first
 * (fail, then warning, then pass, each with its sentence), the cautions, then the results group
 * by group, each with the plots that explain it beside the numbers and the working below (the
 * formula, the formula with the values put in, the result), then the tables, the component list
 * and the assumptions.
 */
import { Fragment, useMemo, useState, type ReactNode } from "react";
import type { CalcOutput, Check, Component, FormulaRecord, Plot, ResultTable, ResultValue, Severity } from "@/lib/calc/core/types";
import { formatQuantity } from "@/lib/calc/core/units";
import { cx } from "../ui";
import { SeverityBadge } from "./severity";
import { splitQuantity } from "./format";
import { SheetPlot, groupPlots, type SheetPlotItem } from "./plot";

const ORDER: Severity[] = ["fail", "warning", "pass"];
const HEADING: Record<Severity, string> = { fail: "Failed", warning: "Warnings", pass: "Passed" };

function SectionTitle({ children, aside, id }: { children: ReactNode; aside?: ReactNode; id?: string }) {
  return (
    <div className="mb-2 flex items-baseline justify-between gap-3 border-b-2 border-ink/80 pb-1">
      <h2 id={id} className="text-[15px] font-semibold tracking-[-0.005em]">
        {children}
      </h2>
      {aside}
    </div>
  );
}

/** The checks, grouped by severity, fail first. */
export function ChecksList({ checks }: { checks: Check[] }) {
  return (
    <section aria-labelledby="checks-title" className="mb-7">
      <SectionTitle id="checks-title">Checks</SectionTitle>
      {checks.length === 0 ? <p className="text-ink-3">This calculation has no checks.</p> : null}
      {ORDER.map((sev) => {
        const list = checks.filter((c) => c.severity === sev);
        if (!list.length) return null;
        return (
          <div key={sev} className="mb-3" data-severity={sev}>
            <h3 className="mb-1 text-[11.5px] font-semibold uppercase tracking-[0.08em] text-ink-2">
              {HEADING[sev]} <span className="mono font-normal text-ink-3">({list.length})</span>
            </h3>
            <ul className="divide-y divide-rule border-y border-rule">
              {list.map((c) => (
                <li key={c.id} className="grid grid-cols-[5.5rem_minmax(0,1fr)_auto] items-baseline gap-x-3 py-1.5" data-check={c.id}>
                  <span>
                    <SeverityBadge severity={c.severity} />
                  </span>
                  <div className="min-w-0">
                    <span className="font-medium">{c.title}.</span> <span className={cx(sev === "pass" ? "text-ink-2" : "text-ink")}>{c.message}</span>
                  </div>
                  <span className="num mono text-[12px] text-ink-3" title="Margin to the limit (positive passes)">
                    {marginText(c.margin)}
                  </span>
                </li>
              ))}
            </ul>
          </div>
        );
      })}
    </section>
  );
}

/** Which result group a plot explains: frequency plots go with the response, swing with the output, histograms with the tolerances. */
function groupForPlot(item: SheetPlotItem, groups: string[]): string | null {
  const plot: Plot = item.kind === "bode" ? item.magnitude : item.plot;
  const pick = (re: RegExp) => groups.find((g) => re.test(g)) ?? null;
  if (plot.kind === "line") return pick(/response|frequency|bandwidth|dynamic/i);
  if (plot.kind === "levels") return pick(/output|swing|headroom|rail/i);
  if (plot.kind === "histogram") return pick(/tolerance|monte carlo|spread/i);
  return null;
}

function rhs(text: string, symbol: string): string {
  const prefix = `${symbol} = `;
  return text.startsWith(prefix) ? text.slice(prefix.length) : text;
}

/**
 * One formula as worked on the pad, the way it is written by hand: the symbol, the formula, the
 * formula with the values put in, and the result, on one line that wraps at the equals signs.
 */
function Working({ f }: { f: FormulaRecord }) {
  const value = formatQuantity(f.value, f.unit);
  const sym = rhs(f.symbolic, f.symbol);
  const sub = rhs(f.substituted, f.symbol);
  const steps = [sym, ...(sub !== sym ? [sub] : [])];
  return (
    <div className="grid gap-x-4 py-1 text-[13px] @2xl:grid-cols-[13rem_minmax(0,1fr)]" data-formula={f.key}>
      <div className="text-[12px] leading-5 text-ink-2">{f.label}</div>
      <div className="min-w-0">
        <p className="mono leading-5">
          <span className="font-medium">{f.symbol}</span>
          {steps.map((t, i) => (
            <span key={i} className={i === 1 ? "text-ink-2" : undefined}>
              {" "}
              <span className="text-ink-3">=</span> {t}
            </span>
          ))}{" "}
          <span className="whitespace-nowrap">
            <span className="text-ink-3">=</span> <span className="font-semibold">{value}</span>
          </span>
        </p>
        {f.reference ? <p className="text-[11.5px] leading-4 text-ink-3">{f.reference}</p> : null}
      </div>
    </div>
  );
}

function ResultRows({ rows }: { rows: ResultValue[] }) {
  return (
    <table className="table-dense" aria-label="Results">
      <thead>
        <tr>
          <th>Quantity</th>
          <th>Symbol</th>
          <th className="num">Value</th>
          <th>Unit</th>
        </tr>
      </thead>
      <tbody>
        {rows.map((r) => {
          const { num, unit } = splitQuantity(formatQuantity(r.value, r.unit));
          return (
            <tr key={r.key} data-result={r.key}>
              <td className="text-ink">{r.label}</td>
              <td className="mono whitespace-nowrap text-ink-2">{r.symbol}</td>
              <td className="num mono font-medium">{num}</td>
              <td className="mono whitespace-nowrap text-ink-2">{unit}</td>
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}

/** A free-form engine table (e.g. the filter's sections), cells as the engine formatted them. */
export function EngineTable({ table }: { table: ResultTable }) {
  return (
    <div className="mb-6">
      <h3 className="mb-1 text-[13.5px] font-semibold">{table.title}</h3>
      <div className="overflow-x-auto">
        <table className="table-dense" aria-label={table.title}>
          <thead>
            <tr>
              {table.columns.map((c) => (
                <th key={c.key} className={c.align === "right" ? "num" : undefined}>
                  {c.label}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {table.rows.map((row, i) => (
              <tr key={i}>
                {table.columns.map((c) => (
                  <td key={c.key} className={c.align === "right" ? "num mono" : "whitespace-nowrap"}>
                    {row[c.key] ?? ""}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}

function ComponentList({ components }: { components: Component[] }) {
  return (
    <table className="table-dense" aria-label="Component list">
      <thead>
        <tr>
          <th>Ref.</th>
          <th className="num">Value</th>
          <th>Series</th>
          <th className="num">Tolerance</th>
          <th>Role</th>
        </tr>
      </thead>
      <tbody>
        {components.map((c) => (
          <tr key={c.ref}>
            <td className="mono font-medium">{c.ref}</td>
            {c.kind === "opamp" || c.kind === "reference" || c.kind === "other" ? <td className="text-ink">{c.display}</td> : <td className="num mono">{c.display}</td>}
            <td className="mono text-ink-2">{c.series ?? ""}</td>
            <td className="num mono text-ink-2">{typeof c.tolerance === "number" ? `±${formatQuantity(c.tolerance, "%", { scale: "percent", digits: 3 })}` : ""}</td>
            <td className="text-ink-2">{c.role}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/** Cautions stand out: a heavy rule and the word, never a check colour. */
export function Cautions({ cautions }: { cautions: string[] }) {
  if (!cautions.length) return null;
  return (
    <section aria-label="Cautions" className="mb-7 rounded-md border-2 border-ink/85 bg-white/80 px-4 py-3">
      <h2 className="mb-1 flex items-center gap-2 text-[14px] font-semibold">
        <svg viewBox="0 0 16 16" width="15" height="15" aria-hidden="true">
          <path d="M8 1.8 15 14H1z" fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinejoin="round" />
          <path d="M8 6v4" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" />
          <circle cx="8" cy="12" r=".9" fill="currentColor" />
        </svg>
        Cautions
      </h2>
      <ul className="list-disc space-y-1 pl-5 text-[13.5px]">
        {cautions.map((c, i) => (
          <li key={i}>{c}</li>
        ))}
      </ul>
      <p className="mt-2 text-[12px] text-ink-2">This calculation supports, and does not replace, engineering judgement, the makers&apos; data, local codes and test.</p>
    </section>
  );
}

/**
 * The whole results pad.
 * @param extras content to put at the end of a result group (e.g. the long Monte Carlo run under "Tolerance analysis")
 */
export function ResultsPad({ output, extras, className }: { output: CalcOutput; extras?: Record<string, ReactNode>; className?: string }) {
  const [showWorking, setShowWorking] = useState(true);
  const groups = useMemo(() => {
    const names: string[] = [];
    for (const r of output.results) {
      const g = r.group ?? "Results";
      if (!names.includes(g)) names.push(g);
    }
    return names;
  }, [output.results]);
  const plotItems = useMemo(() => groupPlots(output.plots), [output.plots]);
  const placed = useMemo(() => {
    const map = new Map<string, SheetPlotItem[]>();
    const loose: SheetPlotItem[] = [];
    for (const item of plotItems) {
      const g = groupForPlot(item, groups);
      if (g) map.set(g, [...(map.get(g) ?? []), item]);
      else loose.push(item);
    }
    return { map, loose };
  }, [plotItems, groups]);
  const formulasByKey = useMemo(() => new Map(output.formulas.map((f) => [f.key, f])), [output.formulas]);
  const resultKeys = useMemo(() => new Set(output.results.map((r) => r.key)), [output.results]);
  const looseFormulas = output.formulas.filter((f) => !resultKeys.has(f.key));

  return (
    <div className={cx("@container min-w-0", className)}>
      <Cautions cautions={output.cautions} />
      <ChecksList checks={output.checks} />

      <section aria-labelledby="results-title" className="mb-7">
        <SectionTitle
          id="results-title"
          aside={
            <label className="flex items-center gap-1.5 text-[12.5px] font-normal text-ink-2">
              <input type="checkbox" className="accent-copper" checked={showWorking} onChange={(e) => setShowWorking(e.target.checked)} />
              Show working
            </label>
          }
        >
          Results
        </SectionTitle>
        {groups.map((g) => {
          const rows = output.results.filter((r) => (r.group ?? "Results") === g);
          const plots = placed.map.get(g) ?? [];
          const working = rows.map((r) => formulasByKey.get(r.key)).filter((f): f is FormulaRecord => !!f);
          return (
            <section key={g} aria-label={g} className="mb-6" data-group={g}>
              <h3 className="mb-1 text-[13.5px] font-semibold">{g}</h3>
              <div className={cx("grid gap-x-6 gap-y-4", plots.length ? "@5xl:grid-cols-[minmax(0,1fr)_minmax(0,1.1fr)]" : "")}>
                <div className="min-w-0">
                  <ResultRows rows={rows} />
                </div>
                {plots.length ? (
                  <div className="flex min-w-0 flex-col gap-5">
                    {plots.map((item) => (
                      <SheetPlot key={item.key} item={item} />
                    ))}
                  </div>
                ) : null}
              </div>
              {showWorking && working.length ? (
                <div className="mt-3 divide-y divide-dashed divide-rule rounded border border-dashed border-rule-strong/70 bg-white/40 px-3 py-1" aria-label={`Working: ${g}`}>
                  {working.map((f) => (
                    <Working key={f.key} f={f} />
                  ))}
                </div>
              ) : null}
              {extras?.[g] ? <div className="mt-4">{extras[g]}</div> : null}
            </section>
          );
        })}
        {showWorking && looseFormulas.length ? (
          <section aria-label="Further working" className="mb-6">
            <h3 className="mb-1 text-[13.5px] font-semibold">Further working</h3>
            <div className="divide-y divide-dashed divide-rule rounded border border-dashed border-rule-strong/70 bg-white/40 px-3 py-1">
              {looseFormulas.map((f) => (
                <Working key={f.key} f={f} />
              ))}
            </div>
          </section>
        ) : null}
        {placed.loose.length ? (
          <section aria-label="Plots" className="mb-6 grid gap-5 @4xl:grid-cols-2">
            {placed.loose.map((item) => (
              <SheetPlot key={item.key} item={item} />
            ))}
          </section>
        ) : null}
        {Object.entries(extras ?? {})
          .filter(([g]) => !groups.includes(g))
          .map(([g, node]) => (
            <Fragment key={g}>{node}</Fragment>
          ))}
      </section>

      {output.tables.length ? (
        <section aria-label="Tables" className="mb-7">
          <SectionTitle>Tables</SectionTitle>
          {output.tables.map((t) => (
            <EngineTable key={t.id} table={t} />
          ))}
        </section>
      ) : null}

      {output.components.length ? (
        <section aria-labelledby="components-title" className="mb-7">
          <SectionTitle id="components-title">Component list</SectionTitle>
          <ComponentList components={output.components} />
        </section>
      ) : null}

      {output.assumptions.length ? (
        <section aria-labelledby="assumptions-title" className="mb-4">
          <SectionTitle id="assumptions-title">Assumptions</SectionTitle>
          <ol className="list-decimal space-y-1 pl-5 text-[13px] text-ink-2">
            {output.assumptions.map((a, i) => (
              <li key={i}>{a}</li>
            ))}
          </ol>
        </section>
      ) : null}
    </div>
  );
}

/** A check's margin as a percentage; margins beyond ±999 % only say how far beyond. */
export function marginText(margin: number | undefined): string {
  if (typeof margin !== "number" || !Number.isFinite(margin)) return "";
  const sign = margin >= 0 ? "+" : "−";
  const pct = Math.abs(margin) * 100;
  return pct > 999 ? `${margin >= 0 ? ">" : "<"}${sign}999 %` : `${sign}${formatQuantity(pct, "%", { digits: 3 })}`;
}
