/**
 * Every registered calculation type, computed by the real engine from its default inputs and
 * printed through the report renderer: the PDF text must carry each formula with its values and
 * each result exactly as the model has them, pages must be numbered, and no word may leave the
 * text block. The whole set is printed twice in one process, because fontkit shares glyph
 * objects between documents: a glyph first met as a component of another one used to lose its
 * characters for every later report (the "×10⁻²³" of the noise formulas came out as "×10²").
 */
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { calcTypes } from "@/lib/calc/registry";
import { parseRawInputs } from "@/lib/calc/core/inputs";
import type { RawInputs } from "@/lib/calc/core/types";
import { buildReportModel } from "@/lib/reports/build-model";
import type { ReportModel } from "@/lib/reports/model";
import { renderReportPdf } from "@/lib/reports/render";
import { page as pageGeometry } from "@/pdf/theme";
import { pdfPages, pdftotext, requirePoppler, wordBoxes } from "./poppler";

const ISSUED = Date.UTC(2025, 2, 14, 10);
let dir: string;

beforeAll(() => {
  requirePoppler("pdftotext", "pdfinfo");
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "lw-engine-reports-"));
});
afterAll(() => {
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

function modelFor(typeId: string): ReportModel {
  const type = calcTypes.find((t) => t.id === typeId);
  if (!type) throw new Error(`no calculation type ${typeId}`);
  const parsed = parseRawInputs(type, type.defaults);
  if (!parsed.ok) throw new Error(`defaults of ${typeId} do not parse: ${parsed.errors[0]?.message}`);
  const output = type.compute(parsed.input);
  return buildReportModel({
    workspace: { name: "Harbour Analog Design Ltd" },
    project: { name: "Vibration monitor front end", clientName: "Kestrel Vale Instruments", jobNumber: "HAD-2291", description: "" },
    calculation: {
      number: "C-101",
      title: `Worked example: ${type.title}`,
      typeId,
      engineVersion: type.version,
      revision: "A",
      inputs: type.defaults as RawInputs as Record<string, unknown>,
      results: output as unknown as Record<string, unknown>,
      submittedAt: ISSUED - 2 * 86_400_000,
      approvedAt: ISSUED - 86_400_000,
      createdAt: ISSUED - 3 * 86_400_000,
    },
    type,
    people: { preparedBy: "Mira Okafor", checkedBy: "Jonas Lindqvist", approvedBy: "Priya Castellano" },
    history: [],
    priorReports: [],
    issuedAt: ISSUED,
    verification: { code: "LW-7K3Q-9XPA", url: "https://app.loopwright.example/verify?code=LW-7K3Q-9XPA" },
  });
}

/** Text with all whitespace removed (pdftotext breaks lines inside cells and long formulas). */
const bare = (s: string) => s.replace(/\s+/g, "");
/** As printed: "X_sub" loses its underscore (the subscript is its own run). */
const printed = (s: string) => bare(s.replace(/_/g, ""));

describe.each([1, 2])("every calculation type, round %i", (round) => {
  it.each(calcTypes.map((t) => t.id))("%s prints its formulas and results as computed, inside the page", async (typeId) => {
    const model = modelFor(typeId);
    const file = path.join(dir, `${typeId}-${round}.pdf`);
    fs.writeFileSync(file, await renderReportPdf(model));
    const text = bare(pdftotext(file));
    const missing: string[] = [];
    const want = (what: string, s: string) => {
      if (!text.includes(printed(s))) missing.push(`${what}: ${s}`);
    };
    for (const f of model.formulas) {
      const rhs = (s: string) => (s.includes(" = ") ? s.slice(s.indexOf(" = ") + 3) : s);
      want("formula", rhs(f.symbolic));
      want("formula with values", rhs(f.substituted));
      want("formula result", f.resultText);
    }
    for (const r of model.results) want("result", `${r.valueText} ${r.unitText}`);
    for (const r of model.inputs) want("input", r.value);
    for (const c of model.checks) want("check", c.title);
    expect(missing).toEqual([]);

    const n = pdfPages(file);
    expect(text).toContain(bare(`Page ${n} of ${n}`));
    for (const w of wordBoxes(file)) {
      expect(w.xMin, `"${w.text}" on page ${w.page}`).toBeGreaterThanOrEqual(pageGeometry.marginX - 0.5);
      expect(w.xMax, `"${w.text}" on page ${w.page}`).toBeLessThanOrEqual(pageGeometry.width - pageGeometry.marginX + 0.5);
    }
  });
});
