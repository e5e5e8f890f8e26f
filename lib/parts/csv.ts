/**
 * The parts library as CSV: template, export, and parsing + validation of an upload.
 *
 * Format (one file per kind, UTF-8, comma-separated; semicolon and tab are also read):
 * - Header row: `name`, then (references) `topology`, then each parameter key with its unit in
 *   brackets (`gbw [Hz]`, `slewRate [V/s]`, `accuracy [%]`, `tempco [ppm/°C]`), then `notes`.
 *   Keys are matched without regard to case; column order is free; `notes` may be left out.
 * - A cell is a plain number in the column's unit ("1e6" in `gbw [Hz]`), or a value with an
 *   engineering prefix and/or unit, parsed like the form ("10M", "10 MHz", "0.5 V/µs"). The unit
 *   in brackets may carry a prefix (`gbw [MHz]`): plain numbers are then read in that unit.
 * - Text cells (name, topology, notes) that start with = + - @, a tab or a carriage return would
 *   run as a formula in a spreadsheet: they are refused. A leading apostrophe before such a
 *   character (the export's escape) is removed, with a note.
 * - Export writes plain numbers in the header's unit at full precision (SI, or % / ppm for the
 *   scaled fields) and escapes text cells that start like a formula with a single quote, as the
 *   usual CSV-injection guidance recommends (common practice, no source); numbers are written
 *   by us and are never formulas. An export imports back to the same values.
 *
 * Pure: no database. lib/parts/import.ts adds the library's names and the atomic import.
 */
import Papa from "papaparse";
import { createHash } from "node:crypto";
import { parseQuantity } from "@/lib/calc/core/units";
import { DEMO_OPAMPS, DEMO_REFERENCES } from "@/lib/calc/core/demo-parts";
import { AppError } from "@/lib/errors";
import { FORMULA_START, MAX_NOTES, editText, nameKey, paramFields, validatePart, type ParamField, type PartKind } from "./fields";

/** Largest CSV file accepted, bytes. */
export const CSV_MAX_BYTES = 2 * 1024 * 1024;
/** Most data rows in one import. */
export const CSV_MAX_ROWS = 20_000;
/** Rows of each sort returned in a preview (all are validated and counted). */
export const PREVIEW_MAX_INVALID = 500;
export const PREVIEW_MAX_VALID = 200;

/** One column of the CSV format. */
export interface CsvColumn {
  key: string;
  /** Header as written by the template and export, e.g. "gbw [Hz]". */
  header: string;
  label: string;
  /** The field's unit (for quantity columns). */
  unit?: string;
  type: "text" | "quantity" | "topology";
  required: boolean;
}

/** The columns of a kind, in template order. */
export function csvColumns(kind: PartKind): CsvColumn[] {
  const cols: CsvColumn[] = [{ key: "name", header: "name", label: "Name", type: "text", required: true }];
  if (kind === "reference") cols.push({ key: "topology", header: "topology", label: "Topology (shunt, series, adjustable)", type: "topology", required: true });
  for (const f of paramFields(kind)) cols.push({ key: f.key, header: `${f.key} [${f.unit}]`, label: f.label, unit: f.unit, type: "quantity", required: true });
  cols.push({ key: "notes", header: "notes", label: "Notes", type: "text", required: false });
  return cols;
}

/** A text cell made safe for spreadsheets: a leading = + - @ TAB or CR gets a single quote. */
export function escapeCell(text: string): string {
  return FORMULA_START.test(text) ? `'${text}` : text;
}

function exportNumber(field: ParamField, v: number | string | undefined): string {
  if (typeof v !== "number") return "";
  const scaled = field.scale === "percent" ? v * 100 : field.scale === "ppm" ? v * 1e6 : v;
  return String(Number(scaled.toPrecision(15)));
}

function unparse(kind: PartKind, rows: string[][]): string {
  return `\ufeff${Papa.unparse({ fields: csvColumns(kind).map((c) => c.header), data: rows }, { newline: "\r\n" })}\r\n`;
}

/** A part as CSV cells in column order (numbers plain, text escaped). */
function partCells(kind: PartKind, p: { name: string; values: Record<string, number | string>; notes: string }): string[] {
  return csvColumns(kind).map((c) => {
    if (c.key === "name") return escapeCell(p.name);
    if (c.key === "notes") return escapeCell(p.notes);
    if (c.key === "topology") return escapeCell(String(p.values.topology ?? ""));
    const f = paramFields(kind).find((x) => x.key === c.key) as ParamField;
    return exportNumber(f, p.values[c.key]);
  });
}

/** The library of one kind as CSV (UTF-8 with BOM, CRLF line ends). */
export function exportCsv(kind: PartKind, list: ReadonlyArray<{ name: string; values: Record<string, number | string>; notes: string }>): string {
  return unparse(kind, list.map((p) => partCells(kind, p)));
}

/** The template: the header row and one example row showing engineering notation. */
export function templateCsv(kind: PartKind): string {
  const demo = kind === "opamp" ? DEMO_OPAMPS[2] : DEMO_REFERENCES[0];
  const values = demo as unknown as Record<string, number | string>;
  const cells = csvColumns(kind).map((c) => {
    if (c.key === "name") return kind === "opamp" ? "LW-OA900 example op-amp (replace this row)" : "LW-SR900 example reference (replace this row)";
    if (c.key === "notes") return "Values: plain numbers in the unit of the column, or with prefix and unit (10M, 8 V/µs, 12 nV/√Hz)";
    if (c.key === "topology") return String(values.topology);
    const f = paramFields(kind).find((x) => x.key === c.key) as ParamField;
    return editText(f, values[c.key]);
  });
  return unparse(kind, [cells]);
}

// ---------------------------------------------------------------------------------------------
// Parsing an upload

/** One data row as validated. `row` is the spreadsheet row number (the header is row 1). */
export interface ImportRow {
  row: number;
  name: string;
  /** The cells as written, by column key. */
  cells: Record<string, string>;
  ok: boolean;
  /** Column key → what is wrong (names the field and the rule). */
  errors: Record<string, string>;
  /** Changes made to the row, e.g. an apostrophe escape removed. */
  notes: string[];
}

/** A valid row, ready to insert. */
export interface ValidPart {
  row: number;
  name: string;
  params: Record<string, number | string>;
  notes: string;
}

/** What a preview shows (nothing is written). */
export interface ImportPreview {
  kind: PartKind;
  columns: Array<Pick<CsvColumn, "key" | "header" | "label" | "unit">>;
  /** Data rows in the file (empty lines not counted). */
  total: number;
  valid: number;
  invalid: number;
  /** Invalid rows first in number (up to PREVIEW_MAX_INVALID), and the first valid ones. */
  rows: ImportRow[];
  /** True when `rows` does not show every row. */
  truncated: boolean;
  /** Notes about the file as a whole (ignored columns, delimiter). */
  fileNotes: string[];
  /** SHA-256 of exactly what a confirm would import; the confirm must send it back. */
  previewHash: string;
}

/** A parsed and validated file. */
export interface ValidatedFile {
  preview: ImportPreview;
  validParts: ValidPart[];
}

const NUMBER_ONLY = /^[+\-\u2212]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+\-]?\d+)?$/;

/** Decode uploaded bytes as UTF-8 text (BOM removed); 422 for binary or other encodings. */
export function decodeCsv(bytes: Uint8Array): string {
  if (bytes.byteLength > CSV_MAX_BYTES) throw tooLarge(bytes.byteLength);
  if (bytes.includes(0)) throw new AppError("invalid_input", "The file is not a text CSV file (it contains binary data).", { fields: { file: "is not a CSV text file" } });
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw new AppError("invalid_input", 'The file is not UTF-8 text. Save it from the spreadsheet as "CSV UTF-8" and upload it again.', { fields: { file: "is not UTF-8 text" } });
  }
  return text.replace(/^\ufeff/, "");
}

function tooLarge(bytes: number): AppError {
  return new AppError("payload_too_large", `The file is ${(bytes / 1024 / 1024).toFixed(2)} MB; a parts CSV may be at most ${CSV_MAX_BYTES / 1024 / 1024} MB. Split it into smaller files.`, {
    fields: { file: `must be at most ${CSV_MAX_BYTES / 1024 / 1024} MB` },
  });
}

interface HeaderMap {
  /** Column index → column and the unit written in the header (if any). */
  byIndex: Map<number, { col: CsvColumn; unit?: string }>;
  notes: string[];
}

function parseHeader(kind: PartKind, header: string[]): HeaderMap {
  const cols = csvColumns(kind);
  const byIndex: HeaderMap["byIndex"] = new Map();
  const seen = new Map<string, number>();
  const notes: string[] = [];
  const problems: string[] = [];
  header.forEach((raw, i) => {
    const h = raw.replace(/^\ufeff/, "").trim();
    if (h === "") return;
    const m = /^([A-Za-z][A-Za-z0-9_]*)\s*(?:\[(.*)\])?$/.exec(h);
    const col = m ? cols.find((c) => c.key.toLowerCase() === m[1].toLowerCase()) : undefined;
    if (!m || !col) {
      notes.push(`Column ${i + 1} "${h}" is not ${kind === "opamp" ? "an op-amp" : "a reference"} parameter and was ignored.`);
      return;
    }
    if (seen.has(col.key)) {
      problems.push(`column "${col.key}" appears twice (columns ${(seen.get(col.key) as number) + 1} and ${i + 1})`);
      return;
    }
    seen.set(col.key, i);
    const unit = m[2]?.trim() || undefined;
    if (unit && col.type === "quantity") {
      const f = paramFields(kind).find((x) => x.key === col.key) as ParamField;
      const probe = parseQuantity(`1 ${unit}`, { unit: f.unit, scale: f.scale });
      if (!probe.ok) problems.push(`column "${h}": "${unit}" is not a unit of ${col.key} (its unit is ${f.unit})`);
    }
    byIndex.set(i, { col, unit });
  });
  const missing = cols.filter((c) => c.required && !seen.has(c.key)).map((c) => c.header);
  if (missing.length) problems.unshift(`missing column${missing.length === 1 ? "" : "s"}: ${missing.join(", ")}`);
  if (problems.length) {
    throw new AppError("invalid_input", `The header row of the file is not usable: ${problems.join("; ")}. Download the template for the expected columns.`, {
      fields: { file: problems[0] },
    });
  }
  return { byIndex, notes };
}

/** A text cell: apostrophe escape removed (with a note), formula starts refused. */
function textCell(key: string, raw: string, notes: string[], errors: Record<string, string>): string {
  if (/^'[=+\-@\t\r]/.test(raw)) {
    notes.push(`${key}: the leading apostrophe (a spreadsheet's text marker) was removed`);
    return raw.slice(1);
  }
  if (FORMULA_START.test(raw) || FORMULA_START.test(raw.trim())) {
    const ch = FORMULA_START.test(raw) ? raw[0] : raw.trim()[0];
    errors[key] = `${key} starts with ${JSON.stringify(ch)}: text starting with = + - @, a tab or a carriage return would run as a spreadsheet formula. Remove it, or write it as '${ch === "\t" || ch === "\r" ? "" : ch}… to keep it as text`;
  }
  return raw;
}

/**
 * Parse and validate an uploaded CSV of one kind. Every row is checked: numbers (SI or
 * engineering notation), required fields, the kind's ranges, formula-like text, names repeated
 * in the file and names already in the library (`library`: nameKey → stored name).
 * File-level problems (size, row count, unusable header) throw AppError (413 / 422).
 */
export function validateCsv(kind: PartKind, text: string, library: ReadonlyMap<string, string>): ValidatedFile {
  if (Buffer.byteLength(text, "utf8") > CSV_MAX_BYTES) throw tooLarge(Buffer.byteLength(text, "utf8"));
  const parsed = Papa.parse<string[]>(text.replace(/^\ufeff/, ""), { header: false, skipEmptyLines: false, delimitersToGuess: [",", ";", "\t"] });
  const data = parsed.data;
  const headerIndex = data.findIndex((r) => r.some((c) => c.trim() !== ""));
  if (headerIndex < 0) throw new AppError("invalid_input", "The file is empty: it needs a header row and at least one data row. Download the template.", { fields: { file: "is empty" } });
  const header = parseHeader(kind, data[headerIndex]);
  const fileNotes = [...header.notes];
  const delimiter = parsed.meta.delimiter;
  if (delimiter && delimiter !== ",") fileNotes.push(`Read as ${delimiter === "\t" ? "tab" : `"${delimiter}"`}-separated values.`);
  const quoteErrors = new Map<number, string>();
  for (const e of parsed.errors) if (e.type === "Quotes" && e.row !== undefined) quoteErrors.set(e.row, e.message);

  const dataRows: Array<{ index: number; cells: string[] }> = [];
  for (let i = headerIndex + 1; i < data.length; i++) if (data[i].some((c) => c.trim() !== "")) dataRows.push({ index: i, cells: data[i] });
  if (dataRows.length === 0) throw new AppError("invalid_input", "The file has a header row but no data rows.", { fields: { file: "has no data rows" } });
  if (dataRows.length > CSV_MAX_ROWS) {
    throw new AppError("payload_too_large", `The file has ${dataRows.length.toLocaleString("en")} data rows; at most ${CSV_MAX_ROWS.toLocaleString("en")} can be imported at once. Split it into smaller files.`, {
      fields: { file: `must have at most ${CSV_MAX_ROWS} rows` },
    });
  }
  const width = data[headerIndex].length;
  const rows: ImportRow[] = [];
  const candidates: Array<{ row: ImportRow; part?: ValidPart }> = [];
  for (const { index, cells } of dataRows) {
    const rowNo = index + 1;
    const errors: Record<string, string> = {};
    const notes: string[] = [];
    const byKey: Record<string, string> = {};
    const values: Record<string, unknown> = {};
    let name = "";
    let partNotes = "";
    for (const [i, { col, unit }] of header.byIndex) {
      const raw = cells[i] ?? "";
      byKey[col.key] = raw;
      if (col.type === "quantity") {
        let t = raw.trim();
        if (/^'[=+\-@]/.test(t)) {
          notes.push(`${col.key}: the leading apostrophe (a spreadsheet's text marker) was removed`);
          t = t.slice(1);
        }
        values[col.key] = unit && NUMBER_ONLY.test(t) ? `${t} ${unit}` : t;
      } else {
        const v = textCell(col.key, raw, notes, errors);
        if (col.key === "name") name = v;
        else if (col.key === "notes") partNotes = v;
        else values.topology = v;
      }
    }
    if (cells.length > width && cells.slice(width).some((c) => c.trim() !== "")) errors.row = `the row has ${cells.length} cells but the header has ${width}: a cell may contain an unquoted delimiter`;
    if (quoteErrors.has(index)) errors.row = `the row's quotes are malformed (${quoteErrors.get(index)})`;
    if (partNotes.length > MAX_NOTES) errors.notes = `notes must be at most ${MAX_NOTES} characters`;
    const v = validatePart(kind, { name, values });
    if (!v.ok) for (const [k, m] of Object.entries(v.fields)) if (!(k in errors)) errors[k] = m;
    const row: ImportRow = { row: rowNo, name: name.trim(), cells: byKey, ok: false, errors, notes };
    candidates.push({ row, part: v.ok && Object.keys(errors).length === 0 ? { row: rowNo, name: v.name, params: v.params, notes: partNotes.trim() } : undefined });
    rows.push(row);
  }

  // Names: unique within the file and against the library.
  const byName = new Map<string, number[]>();
  for (const c of candidates) {
    const k = nameKey(c.row.name);
    if (k === "") continue;
    const list = byName.get(k) ?? [];
    list.push(c.row.row);
    byName.set(k, list);
  }
  for (const c of candidates) {
    const k = nameKey(c.row.name);
    if (k === "" || c.row.errors.name) continue;
    const same = byName.get(k) as number[];
    if (same.length > 1) {
      c.row.errors.name = `name "${c.row.name}" appears ${same.length} times in this file (rows ${same.join(", ")}); names must be unique, so none of these rows is imported`;
    } else if (library.has(k)) {
      c.row.errors.name = `name "${c.row.name}" is already in the library${library.get(k) !== c.row.name ? ` as "${library.get(k)}"` : ""}; rename the row or edit that part`;
    }
  }
  const validParts: ValidPart[] = [];
  for (const c of candidates) {
    c.row.ok = Object.keys(c.row.errors).length === 0 && c.part !== undefined;
    if (c.row.ok && c.part) validParts.push(c.part);
  }

  const invalidRows = rows.filter((r) => !r.ok);
  const shown = [...invalidRows.slice(0, PREVIEW_MAX_INVALID), ...rows.filter((r) => r.ok).slice(0, PREVIEW_MAX_VALID)].sort((a, b) => a.row - b.row);
  const preview: ImportPreview = {
    kind,
    columns: csvColumns(kind).map(({ key, header: h, label, unit }) => ({ key, header: h, label, unit })),
    total: rows.length,
    valid: validParts.length,
    invalid: invalidRows.length,
    rows: shown,
    truncated: shown.length < rows.length,
    fileNotes,
    previewHash: importHash(kind, validParts),
  };
  return { preview, validParts };
}

/** SHA-256 (hex) of what an import would write: kind and each valid row's number, name, values, notes. */
export function importHash(kind: PartKind, list: ReadonlyArray<ValidPart>): string {
  const h = createHash("sha256");
  h.update(`loopwright-parts-import-v1\n${kind}\n`);
  for (const p of list) h.update(`${JSON.stringify([p.row, p.name, p.params, p.notes])}\n`);
  return h.digest("hex");
}
