/**
 * Exports of a calculation for engineers: the component list as CSV, the SPICE netlist of the
 * circuit, and the inputs and results as JSON. They describe the calculation as it is stored now
 * (its current revision): the raw inputs, and the results snapshot of its last compute.
 *
 * The CSV escapes text cells that would run as spreadsheet formulas with the parts library's
 * escaper (lib/parts/csv.ts `escapeCell`, one escaper for the whole app); numbers are written by
 * us, plain, in SI units, at full precision.
 */
import Papa from "papaparse";
import { z } from "zod";
import type { CalcOutput, Component, RawInputs } from "@/lib/calc/core/types";
import { parseRawInputs } from "@/lib/calc/core/inputs";
import { getCalcType } from "@/lib/calc/registry";
import { getCalculationRow } from "@/lib/calculations";
import { fieldMap } from "@/lib/calculations/compute";
import { escapeCell } from "@/lib/parts/csv";
import { AppError } from "@/lib/errors";
import type { WorkspaceContext } from "@/lib/auth/guard";
import type { Calculation } from "@/db/schema";
import { contentDisposition, reportFilename } from "./queries";

/** A file to download: its text, content type and name. */
export interface ExportFile {
  body: string;
  contentType: string;
  filename: string;
}

/** "C-014 rev B – Title (suffix).ext" from the report file name pattern. */
function exportFilename(c: Pick<Calculation, "number" | "revision" | "title">, suffix: string, ext: string): string {
  return reportFilename(c.number, c.revision, c.title).replace(/\.pdf$/, `${suffix ? ` (${suffix})` : ""}.${ext}`);
}

/** The export as a download response. */
export function exportResponse(file: ExportFile): Response {
  return new Response(file.body, {
    status: 200,
    headers: {
      "content-type": file.contentType,
      "content-disposition": contentDisposition(file.filename),
      "cache-control": "private, no-store",
      "x-content-type-options": "nosniff",
    },
  });
}

function storedOutput(c: Calculation): CalcOutput {
  if (!c.results) throw new AppError("invalid_input", "This calculation has no computed results: some inputs do not parse or are out of range. Correct them on the calculation sheet first.", { fields: { inputs: "contain errors" } });
  return c.results as unknown as CalcOutput;
}

const UNIT_OF_KIND: Record<Component["kind"], string> = { resistor: "Ω", capacitor: "F", opamp: "", reference: "", other: "" };

/** Plain number at full precision (15 significant digits), "" when absent. */
function plainNumber(v: number | undefined): string {
  if (v === undefined || !Number.isFinite(v)) return "";
  return String(Number(v.toPrecision(15)));
}

/** CSV header of the component list. */
export const COMPONENT_CSV_HEADER = ["ref", "kind", "value", "unit", "display", "series", "tolerance [%]", "role"] as const;

/**
 * The component list as CSV (UTF-8 with BOM, CRLF): one row per component, the value in SI units
 * (Ω, F), the tolerance in percent, text cells formula-escaped.
 */
export function componentsCsvText(components: ReadonlyArray<Component>): string {
  const rows = components.map((p) => [
    escapeCell(p.ref),
    p.kind,
    p.kind === "resistor" || p.kind === "capacitor" ? plainNumber(p.value) : "",
    UNIT_OF_KIND[p.kind],
    escapeCell(p.display),
    escapeCell(p.series ?? ""),
    p.tolerance !== undefined ? plainNumber(p.tolerance * 100) : "",
    escapeCell(p.role),
  ]);
  return `\ufeff${Papa.unparse({ fields: [...COMPONENT_CSV_HEADER], data: rows }, { newline: "\r\n" })}\r\n`;
}

/** The component list of a calculation as a CSV file. */
export async function exportComponents(ctx: WorkspaceContext, calcId: string): Promise<ExportFile> {
  const c = await getCalculationRow(ctx, calcId);
  const out = storedOutput(c);
  return { body: componentsCsvText(out.components), contentType: "text/csv; charset=utf-8", filename: exportFilename(c, "components", "csv") };
}

export const netlistQuerySchema = z.object({
  model: z.enum(["ideal", "single-pole"], { error: "model must be ideal or single-pole" }).default("single-pole"),
});

/** The calculation's inputs parsed to SI units, or 422 naming the fields that do not parse. */
function parsedInputs(c: Calculation) {
  const type = getCalcType(c.typeId);
  if (!type) throw new AppError("not_found", `The calculation type "${c.typeId}" is not installed.`);
  const parsed = parseRawInputs(type, c.inputs as RawInputs);
  return { type, parsed };
}

/**
 * The SPICE netlist of the circuit as designed, with an ideal or the part's single-pole op-amp
 * model. 404 for a calculation type without a netlist, 422 when the inputs do not parse.
 */
export async function exportNetlist(ctx: WorkspaceContext, calcId: string, model: "ideal" | "single-pole"): Promise<ExportFile> {
  const c = await getCalculationRow(ctx, calcId);
  const { type, parsed } = parsedInputs(c);
  if (!type.netlist) throw new AppError("not_found", `The ${type.title} calculation has no SPICE netlist: there is no single circuit to simulate for it.`);
  if (!parsed.ok) throw new AppError("invalid_input", "Some inputs do not parse or are out of range, so there is no circuit to write. Correct the highlighted fields first.", { fields: fieldMap(parsed.errors) });
  const text = type.netlist(parsed.input, model);
  return { body: text, contentType: "text/plain; charset=utf-8", filename: exportFilename(c, model === "ideal" ? "ideal op-amp" : "single-pole op-amp", "cir") };
}

/** The JSON export: raw inputs, parsed SI inputs, results snapshot and engine version. */
export interface CalculationExport {
  format: "loopwright.calculation";
  formatVersion: 1;
  exportedAt: string;
  calculation: { id: string; number: string; title: string; typeId: string; revision: string; status: Calculation["status"]; version: number };
  engine: { typeId: string; version: string; installedVersion: string | null };
  /** As typed on the sheet. */
  rawInputs: Record<string, unknown>;
  /** Parsed and validated, SI base units; null when they do not parse (see inputErrors). */
  inputs: Record<string, unknown> | null;
  inputErrors: Record<string, string>;
  /** The results snapshot of the last successful compute (CalcOutput), or null. */
  results: CalcOutput | null;
}

/** The calculation's inputs and results as one JSON document. */
export async function exportJson(ctx: WorkspaceContext, calcId: string): Promise<{ data: CalculationExport; filename: string }> {
  const c = await getCalculationRow(ctx, calcId);
  const { type, parsed } = parsedInputs(c);
  const data: CalculationExport = {
    format: "loopwright.calculation",
    formatVersion: 1,
    exportedAt: new Date().toISOString(),
    calculation: { id: c.id, number: c.number, title: c.title, typeId: c.typeId, revision: c.revision, status: c.status, version: c.version },
    engine: { typeId: c.typeId, version: c.engineVersion, installedVersion: type.version },
    rawInputs: c.inputs,
    inputs: parsed.ok ? (parsed.input as Record<string, unknown>) : null,
    inputErrors: parsed.ok ? {} : fieldMap(parsed.errors),
    results: (c.results as unknown as CalcOutput | null) ?? null,
  };
  return { data, filename: exportFilename(c, "", "json") };
}
