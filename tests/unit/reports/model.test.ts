import { describe, expect, it } from "vitest";
import { parseReportModel, reportModelSchema, STANDARD_STATEMENT, type ReportModel } from "@/lib/reports/model";
import { sampleReportModel } from "@/lib/reports/sample";

/** The first issue of a failed parse as "path: message". */
function firstIssue(data: unknown): string {
  const r = parseReportModel(data);
  if (r.ok) return "ok";
  const i = r.error.issues[0];
  return `${i.path.join(".")}: ${i.message}`;
}

describe("ReportModel schema", () => {
  it("accepts the sample report and survives a JSON round trip unchanged", () => {
    const model = sampleReportModel();
    expect(parseReportModel(model).ok).toBe(true);
    const stored = JSON.parse(JSON.stringify(model)) as unknown;
    const back = reportModelSchema.parse(stored);
    expect(back).toEqual(model);
  });

  it("carries the standard statement about engineering judgement", () => {
    expect(STANDARD_STATEMENT).toMatch(/supports, and does not replace, engineering judgement/);
    expect(STANDARD_STATEMENT).toMatch(/makers' current data/);
    expect(STANDARD_STATEMENT).toMatch(/local codes/);
    expect(STANDARD_STATEMENT).toMatch(/test/);
  });

  it("names the field and the rule when something is wrong", () => {
    const m = sampleReportModel();
    expect(firstIssue({ ...m, issueDate: "2025-02-30" })).toBe("issueDate: date must be a real calendar date");
    expect(firstIssue({ ...m, issueDate: "14/03/2025" })).toBe("issueDate: date must be written YYYY-MM-DD");
    expect(firstIssue({ ...m, verification: { ...m.verification, code: "LW-7K3Q-9XPU" } })).toBe("verification.code: verification code must look like LW-7K3Q-9XPA");
    expect(firstIssue({ ...m, verification: { ...m.verification, url: "/verify" } })).toBe("verification.url: verify URL must be an absolute URL");
    expect(firstIssue({ ...m, engine: { ...m.engine, version: "1.3" } })).toBe("engine.version: engine version must be semver, e.g. 1.2.0");
    expect(firstIssue({ ...m, revisions: [] })).toBe("revisions: the revision history needs at least the current revision");
    expect(firstIssue({ ...m, calculation: { ...m.calculation, status: "done" } })).toMatch(/^calculation\.status: status must be draft, in_check, approved or issued/);
  });

  it("refuses numbers that are not finite", () => {
    const m = sampleReportModel();
    for (const bad of [Number.NaN, Number.POSITIVE_INFINITY]) {
      const results = m.results.map((r, i) => (i === 0 ? { ...r, value: bad } : r));
      expect(firstIssue({ ...m, results })).toMatch(/^results\.0\.value: result value must be (a number|finite)$/);
    }
  });

  it("checks plot data shapes", () => {
    const m = sampleReportModel();
    const line = m.plots[0];
    if (line.kind !== "line") throw new Error("sample's first plot is the magnitude plot");
    const badSeries = { ...line, series: [{ ...line.series[0], y: line.series[0].y.slice(1) }] };
    expect(firstIssue({ ...m, plots: [badSeries] })).toBe("plots.0.series.0: series x and y must have the same length");
    const logNeg = { ...line, series: [{ name: "s", x: [0, 10], y: [1, 2] }] };
    expect(firstIssue({ ...m, plots: [logNeg] })).toBe("plots.0: a log x axis needs positive x values");
    const hist = m.plots[2];
    if (hist.kind !== "histogram") throw new Error("sample's third plot is the histogram");
    expect(firstIssue({ ...m, plots: [{ ...hist, edges: hist.edges.slice(1) }] })).toBe("plots.0: histogram edges must have one more entry than counts");
  });

  it("refuses overlong text that could not be printed on a page", () => {
    const m: ReportModel = sampleReportModel();
    expect(firstIssue({ ...m, calculation: { ...m.calculation, title: "x".repeat(201) } })).toBe("calculation.title: calculation title must be at most 200 characters");
    const t = { ...m.tables[0], rows: [{ section: "y".repeat(301) }] };
    expect(firstIssue({ ...m, tables: [t] })).toBe("tables.0.rows.0.section: table cell must be at most 300 characters");
  });
});
