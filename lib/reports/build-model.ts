/**
 * Building the ReportModel of one calculation revision from what the database holds: the
 * calculation row (raw inputs and the stored results snapshot, exactly as approved), its
 * calculation type (field descriptions, for the inputs table), its history (sign-off dates), the
 * earlier issued reports (revision history), the names of the people, the project and the
 * workspace.
 *
 * Pure: no database, no clock, no randomness. Nothing is re-computed: formulas, results, checks,
 * plots, tables, components, assumptions and cautions come from the snapshot the checker
 * approved; only their printed text (formatQuantity, as the app shows them) is added.
 */
import { PACKS, type CalcOutput, type CalcType, type RawInputs } from "../calc/core/types";
import { describeInputs, parseRawInputs } from "../calc/core/inputs";
import { formatQuantity, UNIT_SEPARATOR } from "../calc/core/units";
import { REPORT_MODEL_FORMAT, STANDARD_STATEMENT, parseReportModel, type InputRow, type ReportFormula, type ReportModel, type ReportResult, type RevisionRow } from "./model";

/** A history entry of the calculation (calculation_history, with the actor's name). */
export interface SourceHistoryEntry {
  revision: string;
  version: number;
  /** "create", "save", "submit", "return", "approve", "reopen", "issue", "revise". */
  event: string;
  actorName: string;
  /** ms since the epoch. */
  at: number;
}

/** An earlier issued report of the same calculation. */
export interface SourcePriorReport {
  revision: string;
  /** ms since the epoch. */
  issuedAt: number;
  preparedByName: string;
}

/** Everything the builder needs. */
export interface ReportSource {
  workspace: { name: string };
  project: { name: string; clientName: string; jobNumber: string; description: string };
  calculation: {
    number: string;
    title: string;
    typeId: string;
    engineVersion: string;
    revision: string;
    inputs: Record<string, unknown>;
    results: Record<string, unknown> | null;
    submittedAt: number | null;
    approvedAt: number | null;
    createdAt: number;
  };
  type: CalcType;
  people: { preparedBy: string; checkedBy: string; approvedBy: string };
  history: SourceHistoryEntry[];
  priorReports: SourcePriorReport[];
  /** Reasons given when later revisions were started, by the new revision letter. */
  revisionReasons?: Record<string, string>;
  /** Issue time, ms since the epoch (the issue date is its UTC calendar date). */
  issuedAt: number;
  verification: { code: string; url: string };
}

/** Thrown when the stored calculation cannot be turned into a valid report. */
export class ReportBuildError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "ReportBuildError";
  }
}

/** "YYYY-MM-DD" (UTC) of a time in ms. */
export function isoDate(ms: number): string {
  return new Date(ms).toISOString().slice(0, 10);
}

function clip(text: string, max: number): string {
  return text.length <= max ? text : `${text.slice(0, max - 1)}…`;
}

/**
 * A formatted quantity split into number and unit, as the report's tables print them:
 * "4.7 kΩ" → ["4.7", "kΩ"], "0.541" → ["0.541", ""].
 */
export function splitQuantity(text: string): { value: string; unit: string } {
  const i = text.indexOf(UNIT_SEPARATOR);
  if (i <= 0) return { value: text, unit: "" };
  return { value: text.slice(0, i), unit: text.slice(i + UNIT_SEPARATOR.length) };
}

/** The results snapshot as a CalcOutput, or an error naming what is missing. */
function snapshotOutput(results: Record<string, unknown> | null): CalcOutput {
  if (!results) throw new ReportBuildError("The calculation has no stored results; it cannot be issued until its inputs compute.");
  const r = results as Partial<CalcOutput>;
  const lists = ["results", "formulas", "checks", "plots", "tables", "components", "assumptions", "cautions"] as const;
  for (const k of lists) {
    if (!Array.isArray(r[k])) throw new ReportBuildError(`The stored results have no "${k}" list; re-run and re-approve the calculation before issuing.`);
  }
  return r as CalcOutput;
}

/** The inputs table: every visible field, part parameters grouped under the part's name. */
export function inputRows(type: CalcType, raw: RawInputs): InputRow[] {
  const parsed = parseRawInputs(type, raw);
  if (!parsed.ok) {
    const first = parsed.errors[0];
    throw new ReportBuildError(`The stored inputs do not parse (${first.field}: ${first.message}); the calculation cannot be issued.`);
  }
  const fieldByKey = new Map(type.fields.map((f) => [f.key, f]));
  const partNames = new Map<string, string>();
  return describeInputs(type, parsed.input, raw).map((row) => {
    const dot = row.key.indexOf(".");
    const topKey = dot < 0 ? row.key : row.key.slice(0, dot);
    const field = fieldByKey.get(topKey);
    let group = field?.group;
    if (field?.kind === "part") {
      if (dot < 0) partNames.set(topKey, row.display);
      group = `${field.label}: ${partNames.get(topKey) ?? ""}`.replace(/: $/, "");
    }
    const { value, unit } = row.unit ? splitQuantity(row.display) : { value: row.display, unit: "" };
    return {
      group: group ? clip(group, 80) : undefined,
      symbol: clip(row.symbol, 40),
      description: clip(row.label || row.key, 200),
      value: clip(value || "—", 80),
      unit: clip(unit, 20),
      source: clip(row.source, 200),
    };
  });
}

/** Results with the printed number and unit (formatQuantity, as the app shows them). */
export function reportResults(output: CalcOutput): ReportResult[] {
  return output.results.map((r) => {
    const { value, unit } = splitQuantity(formatQuantity(r.value, r.unit));
    return { ...r, valueText: value || "0", unitText: unit };
  });
}

/** Formulas with their printed result ("3.13 V/V"). */
export function reportFormulas(output: CalcOutput): ReportFormula[] {
  return output.formulas.map((f) => ({ ...f, resultText: formatQuantity(f.value, f.unit) }));
}

/** The last entry of `events` in `revision`, or undefined. */
function lastEvent(history: SourceHistoryEntry[], revision: string, events: string[]): SourceHistoryEntry | undefined {
  return history.filter((h) => h.revision === revision && events.includes(h.event)).sort((a, b) => a.version - b.version || a.at - b.at).at(-1);
}

/** One row per revision: the earlier issues, then the one being issued now. */
export function revisionRows(src: ReportSource): RevisionRow[] {
  const current = src.calculation.revision;
  const prior = [...src.priorReports].filter((p) => p.revision !== current).sort((a, b) => a.issuedAt - b.issuedAt);
  const letters = [...prior.map((p) => p.revision), current];
  return letters.map((rev, i) => {
    const reason = src.revisionReasons?.[rev]?.trim();
    const description = i === 0 ? "First issue." : `Supersedes revision ${letters[i - 1]}.${reason ? ` ${reason}` : ""}`;
    const p = prior.find((x) => x.revision === rev);
    return {
      revision: rev,
      date: isoDate(p ? p.issuedAt : src.issuedAt),
      description: clip(description, 500),
      by: clip(p ? p.preparedByName : src.people.preparedBy, 120),
    };
  });
}

/**
 * The ReportModel of the calculation's current revision, issued at `src.issuedAt`.
 * @throws ReportBuildError when the stored data cannot make a valid report (the message says why).
 */
export function buildReportModel(src: ReportSource): ReportModel {
  const c = src.calculation;
  const type = src.type;
  const output = snapshotOutput(c.results);
  const rev = c.revision;
  const prepared = lastEvent(src.history, rev, ["submit"])?.at ?? c.submittedAt ?? c.createdAt;
  const approvedAt = lastEvent(src.history, rev, ["approve"])?.at ?? c.approvedAt;
  if (!approvedAt) throw new ReportBuildError("The calculation has no approval on record; it cannot be issued.");
  const pack = PACKS.find((p) => p.id === type.pack);
  const client = src.project.clientName.trim();
  const purpose = [
    type.summary,
    `This report records calculation ${c.number}, “${c.title}”, revision ${rev}, for the project ${src.project.name}${client ? ` of ${client}` : ""}, as it was checked and approved.`,
    src.project.description.trim() ? `Project: ${src.project.description.trim()}` : "",
  ]
    .filter(Boolean)
    .join("\n\n");
  const scope = [
    `Covers the inputs, formulas, results, checks${output.plots.length ? ", plots" : ""}${output.components.length ? " and component values" : ""} of the ${type.title} calculation, as computed by the Loopwright engine ${type.id}@${c.engineVersion} and approved on ${isoDate(approvedAt)}.`,
    "Anything not listed under Inputs, and the assumptions stated in section “Assumptions, cautions and limits of use”, is outside the scope of this calculation.",
  ].join("\n\n");

  const model: ReportModel = {
    format: REPORT_MODEL_FORMAT,
    workspace: { name: clip(src.workspace.name, 120) },
    project: { name: clip(src.project.name, 200), clientName: clip(src.project.clientName, 200), jobNumber: clip(src.project.jobNumber, 60) },
    calculation: {
      title: clip(c.title, 200),
      number: clip(c.number, 40),
      typeId: type.id,
      typeTitle: clip(type.title, 200),
      pack: type.pack,
      packTitle: pack?.title ?? type.pack,
      revision: rev,
      status: "issued",
    },
    issueDate: isoDate(src.issuedAt),
    purpose,
    scope,
    inputs: inputRows(type, c.inputs as RawInputs),
    formulas: reportFormulas(output),
    results: reportResults(output),
    checks: output.checks,
    plots: output.plots,
    tables: output.tables,
    components: output.components,
    assumptions: output.assumptions,
    cautions: output.cautions,
    statement: STANDARD_STATEMENT,
    revisions: revisionRows(src),
    signOff: {
      prepared: { name: clip(src.people.preparedBy, 120), date: isoDate(prepared) },
      checked: { name: clip(src.people.checkedBy, 120), date: isoDate(approvedAt) },
      approved: { name: clip(src.people.approvedBy, 120), date: isoDate(src.issuedAt) },
    },
    engine: { typeId: type.id, version: c.engineVersion },
    verification: src.verification,
  };
  const valid = parseReportModel(model);
  if (!valid.ok) {
    const issue = valid.error.issues[0];
    throw new ReportBuildError(`The report could not be built: ${issue.path.join(".") || "(model)"}: ${issue.message}.`);
  }
  return valid.model;
}
