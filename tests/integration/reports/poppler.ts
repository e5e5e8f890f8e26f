/**
 * Poppler's command-line tools (Debian package poppler-utils) as an outside judge of the PDFs:
 * pdfsig verifies signatures with NSS, pdftotext extracts text and word boxes, pdfinfo counts
 * pages. Missing tools fail the tests with a clear message (scripts/test.sh installs them).
 */
import { spawnSync } from "node:child_process";

/** Throws unless every tool runs. */
export function requirePoppler(...tools: string[]): void {
  for (const tool of tools) {
    const r = spawnSync(tool, ["-v"], { encoding: "utf8" });
    if (r.error) {
      throw new Error(`${tool} is not installed: the report tests need poppler-utils (apt-get install -y poppler-utils)`);
    }
  }
}

function run(tool: string, args: string[]): string {
  const r = spawnSync(tool, args, { encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });
  if (r.error) throw r.error;
  if (r.status !== 0 && tool !== "pdfsig") throw new Error(`${tool} ${args.join(" ")} failed: ${r.stderr}`);
  return r.stdout;
}

/** pdfsig's report (it exits 0 for valid and invalid signatures alike: read the text). */
export function pdfsig(file: string): string {
  return run("pdfsig", [file]);
}

/** Text of the whole file, or of one page (1-based). */
export function pdftotext(file: string, page?: number): string {
  const range = page ? ["-f", String(page), "-l", String(page)] : [];
  return run("pdftotext", [...range, "-enc", "UTF-8", file, "-"]);
}

/** Number of pages. */
export function pdfPages(file: string): number {
  const m = /^Pages:\s+(\d+)/m.exec(run("pdfinfo", [file]));
  if (!m) throw new Error("pdfinfo printed no page count");
  return Number(m[1]);
}

export interface WordBox {
  page: number;
  pageWidth: number;
  pageHeight: number;
  xMin: number;
  yMin: number;
  xMax: number;
  yMax: number;
  text: string;
}

/** Every word with its box (pt, origin top-left), from `pdftotext -bbox`. */
export function wordBoxes(file: string): WordBox[] {
  const html = run("pdftotext", ["-bbox", "-enc", "UTF-8", file, "-"]);
  const out: WordBox[] = [];
  let page = 0;
  let pageWidth = 0;
  let pageHeight = 0;
  const re = /<page width="([\d.]+)" height="([\d.]+)">|<word xMin="([\d.]+)" yMin="([\d.]+)" xMax="([\d.]+)" yMax="([\d.]+)">([^<]*)<\/word>/g;
  for (const m of html.matchAll(re)) {
    if (m[1]) {
      page++;
      pageWidth = Number(m[1]);
      pageHeight = Number(m[2]);
      continue;
    }
    out.push({ page, pageWidth, pageHeight, xMin: Number(m[3]), yMin: Number(m[4]), xMax: Number(m[5]), yMax: Number(m[6]), text: m[7] });
  }
  return out;
}

/** Whitespace collapsed to single spaces, for searching extracted text. */
export function squash(text: string): string {
  return text.replace(/\s+/g, " ").trim();
}
