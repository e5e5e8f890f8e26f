/**
 * A small builder for CalcOutput that keeps the engine's promise: no NaN or infinity escapes a
 * compute. Results are guarded (a non-finite value is stored as 0 and becomes a failing check),
 * formulas go through one FormulaSheet, and plot points that are not finite are dropped.
 */
import type { CalcOutput, Check, Component, Plot, ResultTable, ResultValue } from "./types";
import { FormulaSheet, type FormulaSpec, type FormulaVar } from "./formula";

/** Builder of one compute's output. */
export class OutputBuilder {
  /** The formula sheet every scalar formula of this compute goes through. */
  readonly sheet: FormulaSheet;
  readonly results: ResultValue[] = [];
  readonly checks: Check[] = [];
  readonly plots: Plot[] = [];
  readonly tables: ResultTable[] = [];
  readonly components: Component[] = [];
  readonly assumptions: string[] = [];
  readonly cautions: string[] = [];
  private readonly badResults: string[] = [];

  /** @param vars variables (inputs, constants) available to every formula */
  constructor(vars: Record<string, FormulaVar> = {}) {
    this.sheet = new FormulaSheet(vars);
  }

  /**
   * Add a result. A non-finite value is stored as 0 and reported by a failing check.
   * @param value SI base units (or the dimensionless unit named by `unit`)
   */
  result(key: string, label: string, symbol: string, value: number, unit: string, group?: string): void {
    const finite = Number.isFinite(value);
    if (!finite) this.badResults.push(`${label} (${symbol})`);
    this.results.push({ key, label, symbol, value: finite ? value : 0, unit, ...(group ? { group } : {}) });
  }

  /**
   * Evaluate a formula on the sheet and add its value as a result (same key, label, symbol).
   * @returns the value (SI; a fraction when spec.scale is set), possibly non-finite
   */
  formula(spec: FormulaSpec, vars: Record<string, FormulaVar> = {}, group?: string): number {
    const v = this.sheet.eval(spec, vars);
    const rec = this.sheet.records[this.sheet.records.length - 1];
    this.results.push({ key: rec.key, label: rec.label, symbol: rec.symbol, value: rec.value, unit: rec.unit, ...(group ? { group } : {}) });
    return v;
  }

  /** Add checks (null entries are skipped, so guards can be passed directly). */
  check(...checks: Array<Check | null | undefined>): void {
    for (const c of checks) if (c) this.checks.push(c);
  }

  /** Finish: add the failing checks for non-finite values and drop non-finite plot points. */
  build(): CalcOutput {
    const checks = [...this.checks, ...this.sheet.nonFiniteChecks()];
    const seen = new Set(this.sheet.nonFinite.map((f) => f.label));
    const bad = this.badResults.filter((r) => ![...seen].some((s) => r.startsWith(s)));
    if (bad.length > 0) {
      checks.push({
        id: "results.finite",
        severity: "fail",
        title: "Results that cannot be computed",
        message: `${bad.join(", ")} ${bad.length === 1 ? "has" : "have"} no finite value for these inputs; the specification cannot be met as entered.`,
        margin: -1,
      });
    }
    return {
      results: this.results,
      formulas: this.sheet.records,
      checks: checks.map((c) => (c.margin !== undefined && !Number.isFinite(c.margin) ? { ...c, margin: -1 } : c)),
      plots: this.plots.map(cleanPlot),
      tables: this.tables,
      components: this.components.map((c) => (Number.isFinite(c.value) ? c : { ...c, value: 0 })),
      assumptions: this.assumptions,
      cautions: this.cautions,
    };
  }
}

function cleanPlot(p: Plot): Plot {
  if (p.kind === "line") {
    return {
      ...p,
      series: p.series.map((s) => {
        if (s.x.length === s.y.length && s.x.every(Number.isFinite) && s.y.every(Number.isFinite)) return s;
        const x: number[] = [];
        const y: number[] = [];
        for (let i = 0; i < s.x.length; i++) {
          if (Number.isFinite(s.x[i]) && Number.isFinite(s.y[i])) {
            x.push(s.x[i]);
            y.push(s.y[i]);
          }
        }
        return { ...s, x, y };
      }),
    };
  }
  if (p.kind === "levels") {
    return {
      ...p,
      levels: p.levels.filter((l) => Number.isFinite(l.value)),
      ...(p.bands ? { bands: p.bands.filter((b) => Number.isFinite(b.from) && Number.isFinite(b.to)) } : {}),
    };
  }
  return {
    ...p,
    edges: p.edges.map((e) => (Number.isFinite(e) ? e : 0)),
    counts: p.counts.map((c) => (Number.isFinite(c) ? c : 0)),
    ...(p.markers ? { markers: p.markers.filter((m) => Number.isFinite(m.value)) } : {}),
  };
}

/** Logarithmically spaced points from `start` to `stop` inclusive (both > 0). */
export function logspace(start: number, stop: number, points: number): number[] {
  const a = Math.log10(start);
  const b = Math.log10(stop);
  const out: number[] = new Array(points);
  for (let i = 0; i < points; i++) out[i] = 10 ** (a + ((b - a) * i) / (points - 1));
  return out;
}

/** Linearly spaced points from `start` to `stop` inclusive. */
export function linspace(start: number, stop: number, points: number): number[] {
  const out: number[] = new Array(points);
  for (let i = 0; i < points; i++) out[i] = start + ((stop - start) * i) / (points - 1);
  return out;
}
