import { createHash } from "node:crypto";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { createElement, type ReactElement } from "react";
import { renderToBuffer, type DocumentProps } from "@react-pdf/renderer";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { produceSignedReport } from "@/lib/reports/produce";
import { layoutReport, renderReportPdf } from "@/lib/reports/render";
import { sampleReportModel } from "@/lib/reports/sample";
import { createSigningIdentity, formatFingerprint, type SigningIdentity } from "@/lib/reports/signing";
import type { ReportModel } from "@/lib/reports/model";
import { page as pageGeometry } from "@/pdf/theme";
import { TABULAR_FEATURES, TEXT_FEATURES } from "@/pdf/fonts";
import { ReportPagesDocument } from "@/pdf/ReportDocument";
import { pdfPages, pdfsig, pdftotext, requirePoppler, squash, wordBoxes } from "./poppler";

const SECRET = "integration-test-server-secret-42";
const SIGNING_TIME = new Date("2025-03-14T09:30:00Z");

let dir: string;
let identity: SigningIdentity;
let signedFile: string;
let signed: { pdf: Buffer; sha256: string };
const model = sampleReportModel();

beforeAll(async () => {
  requirePoppler("pdfsig", "pdftotext", "pdfinfo");
  dir = fs.mkdtempSync(path.join(os.tmpdir(), "lw-report-"));
  identity = createSigningIdentity(model.workspace.name, SECRET, { now: new Date("2025-01-02T08:00:00Z") });
  signed = await produceSignedReport(model, identity, SECRET, { signingTime: SIGNING_TIME });
  signedFile = path.join(dir, "report.pdf");
  fs.writeFileSync(signedFile, signed.pdf);
});

afterAll(() => {
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
});

describe("signed report", () => {
  it("verifies in poppler's pdfsig, covering the whole document", () => {
    const out = pdfsig(signedFile);
    expect(out).toContain("Signature Validation: Signature is Valid.");
    expect(out).toContain("Total document signed");
    expect(out).toContain(`Signer Certificate Common Name: ${model.workspace.name}`);
    expect(out).toContain("Signing Hash Algorithm: SHA-256");
    expect(out).toContain("Signing Time: Mar 14 2025 09:30:00");
  });

  it("reports the SHA-256 of exactly the bytes it returns", () => {
    expect(signed.sha256).toBe(createHash("sha256").update(fs.readFileSync(signedFile)).digest("hex"));
  });

  it("stops verifying when one byte in the signed range changes", () => {
    const bytes = Buffer.from(signed.pdf);
    const m = /\/ByteRange\s*\[\s*(\d+)\s+(\d+)\s+(\d+)\s+(\d+)\s*\]/.exec(bytes.toString("latin1"));
    if (!m) throw new Error("no /ByteRange in the signed PDF");
    const [start1, len1, start2, len2] = m.slice(1).map(Number);
    expect(start1).toBe(0);
    expect(start2 + len2).toBe(bytes.length);
    for (const at of [Math.floor(len1 / 2), start2 + Math.floor(len2 / 3)]) {
      const copy = Buffer.from(bytes);
      copy[at] ^= 0x01;
      const file = path.join(dir, `tampered-${at}.pdf`);
      fs.writeFileSync(file, copy);
      const out = pdfsig(file);
      expect(out).not.toContain("Signature is Valid.");
    }
  });

  it("prints the signer's certificate fingerprint", () => {
    const text = squash(pdftotext(signedFile));
    // pdftotext may break the long fingerprint over lines; compare without spaces.
    expect(text.replace(/\s/g, "")).toContain(formatFingerprint(identity.fingerprint));
  });

  it("is reproducible: same model and signing time give the same bytes", async () => {
    const again = await produceSignedReport(model, identity, SECRET, { signingTime: SIGNING_TIME });
    expect(again.sha256).toBe(signed.sha256);
  });

  it("refuses a model that names another signing certificate", async () => {
    const other: ReportModel = { ...model, signer: { name: model.workspace.name, fingerprint: "0".repeat(64) } };
    await expect(produceSignedReport(other, identity, SECRET)).rejects.toThrow(/different signing certificate/);
  });
});

describe("report text", () => {
  const text = () => squash(pdftotext(signedFile));
  /** What pdftotext prints for a string with "_" subscripts: the subscript joins its base. */
  const printed = (s: string) => squash(s.replace(/_/g, ""));

  it("carries the cover facts", () => {
    const t = text();
    for (const s of [model.calculation.title, model.project.name, model.project.clientName, model.project.jobNumber, model.calculation.number, model.issueDate, "Issued", model.verification.code, "filter.lowpass@1.3.0"]) {
      expect(t).toContain(s);
    }
  });

  it("carries every input with its value, unit and source", () => {
    const t = text();
    for (const r of model.inputs) {
      expect(t).toContain(printed(r.description));
      expect(t).toContain(r.value);
      if (r.unit) expect(t).toContain(r.unit);
    }
    expect(t).toContain("part library: LW-OA320");
    expect(t).toContain("override: lot test QA-118");
  });

  it("prints every formula symbolic, substituted and with its result, as in the model", () => {
    const t = text();
    for (const f of model.formulas) {
      const rhs = (s: string) => printed(s.slice(s.indexOf(" = ") + 3));
      expect(t).toContain(rhs(f.symbolic));
      expect(t).toContain(rhs(f.substituted));
      expect(t).toContain(f.resultText);
    }
    // One worked line in full, as an engineer would check it by hand.
    expect(t).toContain("1 / (2π · 1.47 kΩ · √(12 nF · 10 nF))");
  });

  it("prints every result as formatted, and every check with its word", () => {
    const t = text();
    for (const r of model.results) expect(t).toContain(`${r.valueText} ${r.unitText}`.trim());
    for (const c of model.checks) expect(t).toContain(printed(c.title));
    expect(t).toMatch(/PASS/);
    expect(t).toMatch(/WARNING/);
    expect(t).toMatch(/FAIL/);
  });

  it("keeps the symbols Ω µ √ °C ± − π intact", () => {
    const t = text();
    for (const sym of ["kΩ", "µV/°C", "nV/√Hz", "°C", "±1", "−40", "2π"]) expect(t).toContain(sym);
  });

  it("numbers every page 'Page X of Y' with the true page count", () => {
    const n = pdfPages(signedFile);
    expect(n).toBeGreaterThanOrEqual(5);
    for (let p = 1; p <= n; p++) {
      const pageText = squash(pdftotext(signedFile, p));
      expect(pageText).toContain(`Page ${p} of ${n}`);
      expect(pageText).toContain(model.verification.code);
    }
  });

  it("has the statement, the sign-off and the revision history", () => {
    const t = text();
    expect(t).toContain(squash(model.statement));
    for (const p of [model.signOff.prepared, model.signOff.checked, model.signOff.approved]) expect(t).toContain(p.name);
    for (const r of model.revisions) expect(t).toContain(squash(r.description));
  });
});

describe("rendering", () => {
  it("is deterministic: the same model renders to the same bytes", async () => {
    const a = await renderReportPdf(model);
    const b = await renderReportPdf(model);
    expect(a.equals(b)).toBe(true);
    // No clock in the file: its only dates are the creation and modification date, both the issue date.
    expect(a.toString("latin1").match(/D:\d{8,14}/g)).toEqual(["D:20250314000000", "D:20250314000000"]);
  });

  it("leaves the shared OpenType feature sets as they were (fontkit writes into what it is given)", async () => {
    await renderReportPdf(model);
    expect(Object.isFrozen(TEXT_FEATURES)).toBe(true);
    expect(Object.entries(TEXT_FEATURES).filter(([, on]) => on)).toEqual([["kern", true]]);
    expect(Object.entries(TABULAR_FEATURES).filter(([, on]) => on)).toEqual([["kern", true], ["tnum", true]]);
  });

  it("places the blocks exactly where react-pdf itself lays out the same pages", async () => {
    // renderReportPdf lays each block out once and moves it into its page; react-pdf's own
    // renderToBuffer of the same pages lays everything out afresh. Same words, same boxes.
    const { blocks, pages } = await layoutReport(model);
    const own = await renderToBuffer(createElement(ReportPagesDocument, { model, blocks, pages }) as ReactElement<DocumentProps>);
    const ownFile = path.join(dir, "own.pdf");
    const fastFile = path.join(dir, "fast.pdf");
    fs.writeFileSync(ownFile, own);
    fs.writeFileSync(fastFile, await renderReportPdf(model));
    expect(pdfPages(fastFile)).toBe(pdfPages(ownFile));
    const a = wordBoxes(fastFile);
    const b = wordBoxes(ownFile);
    expect(a.length).toBe(b.length);
    a.forEach((w, i) => {
      expect(w.text).toBe(b[i].text);
      expect(w.page).toBe(b[i].page);
      expect(Math.abs(w.xMin - b[i].xMin), `"${w.text}" x`).toBeLessThan(0.05);
      expect(Math.abs(w.yMin - b[i].yMin), `"${w.text}" y on page ${w.page}`).toBeLessThan(0.05);
    });
  });

  it("refuses an invalid model with the field named", async () => {
    await expect(renderReportPdf({ ...model, issueDate: "2025-13-01" })).rejects.toThrow(/issueDate/);
  });
});

describe("a long report", () => {
  // Many inputs (the table runs over pages), long paragraphs, long names and labels everywhere,
  // cautions, not yet issued.
  const long = (s: string, n: number) => `${s} ${"and more words to make it long ".repeat(20)}`.slice(0, n);
  const longModel: ReportModel = sampleReportModel({
    workspace: { name: long("Ørsted-Lund Elektronik ApS, consulting engineers for instrumentation", 120) },
    project: { name: long("Vibration monitor front end", 200), clientName: long("Kestrel Vale Instruments", 200), jobNumber: "HAD-2291-0042-REV-CONTROL-SHEET" },
    formulas: model.formulas.map((f) => ({ ...f, label: long(f.label, 200), reference: f.reference ? long(f.reference, 300) : undefined })),
    checks: model.checks.map((c) => ({ ...c, title: long(c.title, 200), message: long(c.message, 1200) })),
    components: model.components.map((c) => ({ ...c, role: long(c.role, 200) })),
    results: model.results.map((r) => ({ ...r, label: long(r.label, 200), group: r.group ? long(r.group, 80) : undefined })),
    plots: model.plots.map((p) => ({ ...p, title: long(p.title, 200), ...(p.kind === "line" ? { series: p.series.map((s) => ({ ...s, name: long(s.name, 80) })) } : {}) })),
    revisions: model.revisions.map((r) => ({ ...r, description: long(r.description, 500), by: long(r.by, 120) })),
    calculation: { ...model.calculation, title: `${model.calculation.title}, with an intentionally long title that must wrap inside the cover block without running into the QR code`, status: "approved" },
    purpose: Array.from({ length: 30 }, (_, i) => `Sentence ${i + 1} of a long purpose statement that explains in detail what the calculation is for.`).join(" "),
    inputs: Array.from({ length: 5 }, (_, k) => model.inputs.map((r) => ({ ...r, group: `${r.group} (set ${k + 1})` }))).flat(),
    cautions: [
      "The output stage dissipates up to 2.4 W at 60 °C ambient: check the heatsink against the makers' thermal data.",
      "Mains-derived supplies: keep creepage and clearance to the local codes; fuse the primary.",
    ],
  });
  let file: string;
  let pages: Awaited<ReturnType<typeof layoutReport>>["pages"];
  let blocks: Awaited<ReturnType<typeof layoutReport>>["blocks"];

  beforeAll(async () => {
    file = path.join(dir, "long.pdf");
    fs.writeFileSync(file, await renderReportPdf(longModel));
    ({ pages, blocks } = await layoutReport(longModel));
  });

  it("has as many pages as the page breaker planned", () => {
    expect(pdfPages(file)).toBe(pages.length);
    expect(squash(pdftotext(file, pages.length))).toContain(`Page ${pages.length} of ${pages.length}`);
  });

  it("repeats the inputs header row on every page the table continues onto", () => {
    const continued = pages.map((p, i) => ({ p, i })).filter(({ p }) => p[0].kind === "header" && blocks[p[0].index].table === "inputs");
    expect(continued.length).toBeGreaterThanOrEqual(2);
    const words = wordBoxes(file);
    for (const { i } of continued) {
      // The five column labels on one line at the top of the text block of that page.
      const top = words.filter((w) => w.page === i + 1 && w.yMin >= pageGeometry.marginTop - 1 && w.yMax <= pageGeometry.marginTop + 16);
      const labels = ["Symbol", "Description", "Value", "Unit", "Source"].map((l) => top.find((w) => w.text === l));
      expect(labels.every(Boolean), `header labels on page ${i + 1}`).toBe(true);
      const ys = labels.map((w) => w?.yMin ?? 0);
      expect(Math.max(...ys) - Math.min(...ys)).toBeLessThan(0.5);
    }
  });

  it("never ends a page with a heading, a table header or a group row", () => {
    for (const p of pages.slice(0, -1)) {
      const last = p[p.length - 1];
      expect(last.kind).toBe("block");
      expect(blocks[last.index].keepWithNext ?? false).toBe(false);
    }
  });

  it("keeps every word inside the page's text block", () => {
    const words = wordBoxes(file);
    expect(words.length).toBeGreaterThan(500);
    const left = pageGeometry.marginX - 0.5;
    const right = pageGeometry.width - pageGeometry.marginX + 0.5;
    for (const w of words) {
      expect(w.xMin, `"${w.text}" on page ${w.page}`).toBeGreaterThanOrEqual(left);
      expect(w.xMax, `"${w.text}" on page ${w.page}`).toBeLessThanOrEqual(right);
      expect(w.yMin).toBeGreaterThanOrEqual(0);
      expect(w.yMax, `"${w.text}" on page ${w.page}`).toBeLessThanOrEqual(w.pageHeight - 20);
    }
  });

  it("marks a report that is not issued", () => {
    expect(squash(pdftotext(file, 1))).toContain("Not issued: this is a copy of the approved calculation for review.");
  });

  it("prints the cautions", () => {
    const t = squash(pdftotext(file));
    expect(t).toContain("keep creepage and clearance to the local codes");
  });
});
