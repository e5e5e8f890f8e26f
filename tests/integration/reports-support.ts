/**
 * Shared steps of the report tests: take the world's draft calculation through check and
 * approval with the real workflow routes, issue it through the issue route, fetch a PDF through
 * the download route, and run Debian's poppler tools (pdfsig, pdftotext) on bytes.
 */
import { execFileSync, spawnSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import { expect } from "vitest";
import { read, write } from "@/db/write";
import { calculations, reports } from "@/db/schema";
import { createHash } from "node:crypto";
import { call, type TestUser, type World } from "./helpers";
import * as transitionsRoute from "@/app/api/w/[slug]/calculations/[calcId]/transitions/route";
import * as issueRoute from "@/app/api/w/[slug]/calculations/[calcId]/issue/route";
import * as pdfRoute from "@/app/api/w/[slug]/reports/[reportId]/pdf/route";

type Handler<P> = (req: Request, ctx: { params: Promise<P> }) => Promise<Response>;

/** The calculation's current version. */
export async function calcVersion(calcId: string): Promise<number> {
  const db = await read();
  const c = await db.query.calculations.findFirst({ where: eq(calculations.id, calcId), columns: { version: true } });
  if (!c) throw new Error(`no calculation ${calcId}`);
  return c.version;
}

/** One workflow transition through the route, asserting 200. */
export async function transitionAs(w: World, who: TestUser, calcId: string, body: Record<string, unknown>): Promise<void> {
  const r = await call(transitionsRoute.POST as Handler<{ slug: string; calcId: string }>, {
    method: "POST",
    params: { slug: w.slug, calcId },
    cookie: who.cookie,
    body: { version: await calcVersion(calcId), ...body },
  });
  expect(r.status, JSON.stringify(r.body)).toBe(200);
}

/** Engineer submits to the checker, the checker approves (the world's calculation is the engineer's draft). */
export async function approve(w: World, calcId = w.calcId): Promise<void> {
  await transitionAs(w, w.engineer, calcId, { action: "submit", checkerId: w.checker.id });
  await transitionAs(w, w.checker, calcId, { action: "approve" });
}

/** POST the issue route; returns status and body. */
export async function issueAs(w: World, who: TestUser, calcId = w.calcId, version?: number) {
  return call(issueRoute.POST as Handler<{ slug: string; calcId: string }>, {
    method: "POST",
    params: { slug: w.slug, calcId },
    cookie: who.cookie,
    body: { version: version ?? (await calcVersion(calcId)) },
  });
}

export interface IssuedReport {
  id: string;
  revision: string;
  code: string;
  sha256: string;
  size: number;
  filename: string;
  supersededAt: number | null;
  supersededByRevision: string | null;
}

/** Approve and issue, asserting 201. */
export async function approveAndIssue(w: World, calcId = w.calcId): Promise<IssuedReport> {
  await approve(w, calcId);
  const r = await issueAs(w, w.checker, calcId);
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  return r.body.report as IssuedReport;
}

/** GET the download route as `who`: the raw response and its bytes. */
export async function download(w: World, who: TestUser | null, reportId: string, slug = w.slug): Promise<{ status: number; headers: Headers; bytes: Buffer }> {
  const headers: Record<string, string> = {};
  if (who) headers.cookie = who.cookie;
  const res = await (pdfRoute.GET as Handler<{ slug: string; reportId: string }>)(new Request(`http://localhost:3999/api/w/${slug}/reports/${reportId}/pdf`, { headers }), {
    params: Promise.resolve({ slug, reportId }),
  });
  return { status: res.status, headers: res.headers, bytes: Buffer.from(await res.arrayBuffer()) };
}

function tool(name: string): string {
  const p = `/usr/bin/${name}`;
  if (!fs.existsSync(p)) {
    throw new Error(`${name} is missing (${p}). Install Debian's poppler-utils (apt-get install -y poppler-utils): the report tests need it to check the signature and the text.`);
  }
  return p;
}

function withTempFile<T>(bytes: Buffer, fn: (file: string) => T): T {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "lw-report-"));
  const file = path.join(dir, "report.pdf");
  fs.writeFileSync(file, bytes);
  try {
    return fn(file);
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

/** pdfsig's report on the bytes (it exits 0 for valid and invalid alike: read its text). */
export function pdfsig(bytes: Buffer): string {
  const bin = tool("pdfsig");
  return withTempFile(bytes, (file) => {
    const r = spawnSync(bin, [file], { encoding: "utf8" });
    return `${r.stdout}\n${r.stderr}`;
  });
}

/** The text with pdftotext's -layout (lines kept as printed: columns side by side). */
export function pdftotextLayout(bytes: Buffer): string {
  const bin = tool("pdftotext");
  return withTempFile(bytes, (file) => execFileSync(bin, ["-layout", "-enc", "UTF-8", file, "-"], { encoding: "utf8" }));
}

/** The text of the PDF as pdftotext extracts it (reading order, no layout). */
export function pdftotext(bytes: Buffer): string {
  const bin = tool("pdftotext");
  return withTempFile(bytes, (file) => execFileSync(bin, ["-enc", "UTF-8", file, "-"], { encoding: "utf8" }));
}

/**
 * The report's running text without the page furniture (the header and footer lines repeated
 * on every page), which pdftotext may place between the lines of a block.
 */
export function bodyText(text: string): string {
  const lines = text.split("\n").map((l) => l.trim());
  const footer = [/^Verification code LW-\S+ verify at \S+$/, /^Issue date \d{4}-\d{2}-\d{2}$/, /^Page \d+ of \d+$/, /^C-\d+ rev\. [A-Z]+ · /];
  const pages = lines.filter((l) => /^Page \d+ of \d+$/.test(l)).length;
  const seen = new Map<string, number>();
  for (const l of lines) seen.set(l, (seen.get(l) ?? 0) + 1);
  // The running header ("Firm · Project") is the line with a middle dot that appears on every page.
  const header = (l: string) => pages > 1 && l.includes(" · ") && (seen.get(l) ?? 0) >= pages;
  return lines.filter((l) => !footer.some((re) => re.test(l)) && !header(l)).join("\n");
}

/** Whitespace folded to single spaces (pdftotext breaks lines at table cells). */
export function fold(text: string): string {
  return text.replace(/\s+/g, " ");
}

/** Set a calculation's row fields directly (test set-up only). */
export async function patchCalc(calcId: string, set: Partial<typeof calculations.$inferInsert>): Promise<void> {
  await write((db) => db.update(calculations).set(set).where(eq(calculations.id, calcId)));
}

/**
 * The issuing invariant over the whole database: a calculation marked issued has exactly one
 * stored report for its revision, every stored report's bytes hash to its sha256, and a report of
 * a calculation's current revision means that revision is issued.
 */
export async function assertInvariant(): Promise<void> {
  const db = await read();
  const calcs = await db.select().from(calculations);
  const reps = await db.select().from(reports);
  for (const c of calcs) {
    const mine = reps.filter((r) => r.calculationId === c.id && r.revision === c.revision);
    if (c.status === "issued") expect(mine.length, `${c.number} is issued but has ${mine.length} reports for rev ${c.revision}`).toBe(1);
  }
  for (const r of reps) {
    expect(createHash("sha256").update(r.pdf).digest("hex"), `stored bytes of ${r.code}`).toBe(r.sha256);
    expect(Buffer.from(r.pdf).subarray(0, 5).toString("latin1")).toBe("%PDF-");
    const c = calcs.find((x) => x.id === r.calculationId);
    expect(c, "report of a missing calculation").toBeDefined();
    if (c && c.revision === r.revision) expect(c.status, `report ${r.code} exists but ${c.number} rev ${c.revision} is ${c.status}`).toBe("issued");
  }
}
