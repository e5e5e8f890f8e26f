/**
 * ReportModel: the complete data of one calculation report, as printed. Pure data (no
 * functions), stored as JSON beside the signed PDF (`reports.snapshot`), so the report can be
 * re-rendered, diffed or exported without re-computing anything.
 *
 * Everything numeric that is printed is carried both as the engine's number (SI base units) and
 * as the formatted text that was printed, so the PDF shows exactly what was computed and the
 * snapshot records exactly what was shown.
 */
import { z } from "zod";
import type {
  Check,
  Component,
  FormulaRecord,
  HistogramPlot,
  LevelsPlot,
  LinePlot,
  PackId,
  Plot,
  ResultTable,
  ResultValue,
  Severity,
} from "../calc/core/types";
import { CODE_PATTERN } from "./code";

/** Version of the ReportModel layout; bump when a field changes meaning. */
export const REPORT_MODEL_FORMAT = 1;

/** The sentence every report carries (DESIGN.md "Cautions"). */
export const STANDARD_STATEMENT =
  "This calculation supports, and does not replace, engineering judgement. Confirm every part parameter against the makers' current data, follow the local codes and standards that apply to the installation, and verify the built circuit by test before it is relied on.";

// --- small field helpers ----------------------------------------------------------------------

const text = (field: string, max: number) =>
  z.string({ error: `${field} must be text` }).max(max, { message: `${field} must be at most ${max} characters` });
const required = (field: string, max: number) => text(field, max).trim().min(1, { message: `${field} is required` });
const finite = (field: string) =>
  z.number({ error: `${field} must be a number` }).refine(Number.isFinite, { message: `${field} must be finite` });
const finiteArray = (field: string) => z.array(finite(field), { error: `${field} must be a list of numbers` });

/** A calendar date, "YYYY-MM-DD" (ISO 8601). */
export const isoDateSchema = z
  .string({ error: "date must be text" })
  .regex(/^\d{4}-\d{2}-\d{2}$/, { message: "date must be written YYYY-MM-DD" })
  .refine((s) => {
    const d = new Date(`${s}T00:00:00Z`);
    return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s;
  }, { message: "date must be a real calendar date" });

const severitySchema = z.enum(["pass", "warning", "fail"], { error: "severity must be pass, warning or fail" });
const packSchema = z.enum(["amplifier", "filter", "reference"], { error: "pack must be amplifier, filter or reference" });
const statusSchema = z.enum(["draft", "in_check", "approved", "issued"], {
  error: "status must be draft, in_check, approved or issued",
});

// --- engine contract mirrors (lib/calc/core/types.ts) ---------------------------------------

const resultValueSchema = z.object({
  key: required("result key", 80),
  label: required("result label", 200),
  symbol: text("result symbol", 40),
  value: finite("result value"),
  unit: text("result unit", 20),
  group: text("result group", 80).optional(),
});

/** A result as printed: the engine's ResultValue plus the formatted value and unit. */
export const reportResultSchema = resultValueSchema.extend({
  /** Formatted number, e.g. "4.70" or "−0.35". */
  valueText: required("result valueText", 40),
  /** Formatted unit with prefix, e.g. "kΩ", "µV/°C"; "" for dimensionless. */
  unitText: text("result unitText", 20),
});

const formulaRecordSchema = z.object({
  key: required("formula key", 80),
  label: required("formula label", 200),
  symbol: text("formula symbol", 40),
  expression: text("formula expression", 2000),
  symbolic: required("formula symbolic", 1000),
  substituted: required("formula substituted", 2000),
  value: finite("formula value"),
  unit: text("formula unit", 20),
  reference: text("formula reference", 300).optional(),
});

/** A formula as printed: the engine's FormulaRecord plus the formatted result ("3.13 V/V"). */
export const reportFormulaSchema = formulaRecordSchema.extend({
  resultText: required("formula resultText", 80),
});

const checkSchema = z.object({
  id: required("check id", 80),
  severity: severitySchema,
  title: required("check title", 200),
  message: required("check message", 2000),
  margin: finite("check margin").optional(),
});

const axisSchema = z.object({
  label: text("axis label", 80),
  unit: text("axis unit", 20),
  scale: z.enum(["linear", "log"], { error: "axis scale must be linear or log" }),
});

const linePlotSchema = z
  .object({
    kind: z.literal("line"),
    id: required("plot id", 80),
    title: required("plot title", 200),
    x: axisSchema,
    y: axisSchema,
    series: z
      .array(
        z
          .object({
            name: text("series name", 80),
            role: z.enum(["ideal", "real", "limit", "other"]).optional(),
            x: finiteArray("series x"),
            y: finiteArray("series y"),
          })
          .refine((s) => s.x.length === s.y.length, { message: "series x and y must have the same length" }),
      )
      .min(1, { message: "a line plot needs at least one series" }),
  })
  .refine((p) => p.x.scale !== "log" || p.series.every((s) => s.x.every((v) => v > 0)), {
    message: "a log x axis needs positive x values",
  })
  .refine((p) => p.y.scale !== "log" || p.series.every((s) => s.y.every((v) => v > 0)), {
    message: "a log y axis needs positive y values",
  });

const histogramPlotSchema = z
  .object({
    kind: z.literal("histogram"),
    id: required("plot id", 80),
    title: required("plot title", 200),
    x: axisSchema,
    edges: finiteArray("histogram edges"),
    counts: z.array(z.number().int().nonnegative(), { error: "histogram counts must be whole numbers, 0 or more" }),
    markers: z.array(z.object({ label: text("marker label", 60), value: finite("marker value") })).optional(),
  })
  .refine((h) => h.counts.length >= 1 && h.edges.length === h.counts.length + 1, {
    message: "histogram edges must have one more entry than counts",
  })
  .refine((h) => h.edges.every((e, i) => i === 0 || e > h.edges[i - 1]), { message: "histogram edges must increase" });

const levelsPlotSchema = z.object({
  kind: z.literal("levels"),
  id: required("plot id", 80),
  title: required("plot title", 200),
  unit: text("levels unit", 20),
  levels: z
    .array(
      z.object({
        label: text("level label", 60),
        value: finite("level value"),
        role: z.enum(["rail", "limit", "signal", "bias"]),
      }),
    )
    .min(1, { message: "a levels plot needs at least one level" }),
  bands: z
    .array(
      z.object({
        label: text("band label", 60),
        from: finite("band from"),
        to: finite("band to"),
        role: z.enum(["allowed", "required"]),
      }),
    )
    .optional(),
});

const plotSchema = z.union([linePlotSchema, histogramPlotSchema, levelsPlotSchema]);

const resultTableSchema = z.object({
  id: required("table id", 80),
  title: required("table title", 200),
  columns: z
    .array(z.object({ key: required("column key", 40), label: text("column label", 60), align: z.enum(["left", "right"]).optional() }))
    .min(1, { message: "a table needs at least one column" }),
  rows: z.array(z.record(z.string(), text("table cell", 300))),
});

const componentSchema = z.object({
  ref: required("component ref", 20),
  kind: z.enum(["resistor", "capacitor", "opamp", "reference", "other"]),
  value: finite("component value"),
  display: text("component display", 80),
  series: text("component series", 10).optional(),
  tolerance: finite("component tolerance").optional(),
  role: text("component role", 200),
});

// --- report-only parts ------------------------------------------------------------------------

/** One row of the inputs table. */
export const inputRowSchema = z.object({
  /** Group heading (FieldSpec.group), e.g. "Specification", "Op-amp: LW-OA320". */
  group: text("input group", 80).optional(),
  symbol: text("input symbol", 40),
  description: required("input description", 200),
  /** Formatted value, e.g. "4.7", "Butterworth", "yes". */
  value: required("input value", 80),
  /** Formatted unit, e.g. "kΩ"; "" when none. */
  unit: text("input unit", 20),
  /** Where the value came from: "entered", "part library: LW-OA320", "override: <note>". */
  source: text("input source", 200),
});

const personDateSchema = z.object({ name: required("sign-off name", 120), date: isoDateSchema });

/** One row of the revision history table. */
export const revisionRowSchema = z.object({
  revision: required("revision", 10),
  date: isoDateSchema,
  description: required("revision description", 500),
  by: required("revision by", 120),
});

/** The complete data of one report. */
export const reportModelSchema = z.object({
  format: z.literal(REPORT_MODEL_FORMAT),
  workspace: z.object({ name: required("workspace name", 120) }),
  project: z.object({
    name: required("project name", 200),
    clientName: text("client name", 200),
    jobNumber: text("job number", 60),
  }),
  calculation: z.object({
    title: required("calculation title", 200),
    /** Firm's calculation number within the project, e.g. "C-014". */
    number: required("calculation number", 40),
    /** Calculation type id, e.g. "filter.lowpass". */
    typeId: required("calculation type id", 80),
    typeTitle: required("calculation type title", 200),
    pack: packSchema,
    packTitle: required("pack title", 80),
    revision: required("revision", 10),
    status: statusSchema,
  }),
  issueDate: isoDateSchema,
  purpose: text("purpose", 8000),
  scope: text("scope", 8000),
  inputs: z.array(inputRowSchema),
  formulas: z.array(reportFormulaSchema),
  results: z.array(reportResultSchema),
  checks: z.array(checkSchema),
  plots: z.array(plotSchema),
  tables: z.array(resultTableSchema),
  components: z.array(componentSchema),
  assumptions: z.array(text("assumption", 1000)),
  cautions: z.array(text("caution", 1000)),
  statement: required("statement", 2000),
  revisions: z.array(revisionRowSchema).min(1, { message: "the revision history needs at least the current revision" }),
  signOff: z.object({ prepared: personDateSchema, checked: personDateSchema, approved: personDateSchema }),
  engine: z.object({
    typeId: required("engine type id", 80),
    version: z.string().regex(/^\d+\.\d+\.\d+([-+][0-9A-Za-z.-]+)?$/, { message: "engine version must be semver, e.g. 1.2.0" }),
  }),
  verification: z.object({
    code: z.string().regex(CODE_PATTERN, { message: "verification code must look like LW-7K3Q-9XPA" }),
    url: z.url({ message: "verify URL must be an absolute URL" }),
  }),
  /** The signing certificate, printed so a reader can compare it with the verify page. */
  signer: z.object({ name: required("signer name", 120), fingerprint: z.string().regex(/^[0-9a-f]{64}$/, { message: "fingerprint must be 64 hex digits" }) }).optional(),
});

export type ReportModel = z.infer<typeof reportModelSchema>;
export type ReportResult = z.infer<typeof reportResultSchema>;
export type ReportFormula = z.infer<typeof reportFormulaSchema>;
export type InputRow = z.infer<typeof inputRowSchema>;
export type RevisionRow = z.infer<typeof revisionRowSchema>;

/**
 * Validates unknown data (e.g. a stored snapshot) as a ReportModel.
 * @returns the model, or the zod error with field paths and messages.
 */
export function parseReportModel(data: unknown): { ok: true; model: ReportModel } | { ok: false; error: z.ZodError } {
  const r = reportModelSchema.safeParse(data);
  return r.success ? { ok: true, model: r.data } : { ok: false, error: r.error };
}

// --- compile-time agreement with the engine contract -----------------------------------------
// If lib/calc/core/types.ts changes shape, these lines stop compiling.
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
const agree = <T extends true>(t: T): T => t;
agree<Same<z.infer<typeof resultValueSchema>, ResultValue>>(true);
agree<Same<z.infer<typeof formulaRecordSchema>, FormulaRecord>>(true);
agree<Same<z.infer<typeof checkSchema>, Check>>(true);
agree<Same<z.infer<typeof componentSchema>, Component>>(true);
agree<Same<z.infer<typeof resultTableSchema>, ResultTable>>(true);
agree<Same<z.infer<typeof linePlotSchema>, LinePlot>>(true);
agree<Same<z.infer<typeof histogramPlotSchema>, HistogramPlot>>(true);
agree<Same<z.infer<typeof levelsPlotSchema>, LevelsPlot>>(true);
agree<Same<z.infer<typeof plotSchema>, Plot>>(true);
agree<Same<z.infer<typeof severitySchema>, Severity>>(true);
agree<Same<z.infer<typeof packSchema>, PackId>>(true);
