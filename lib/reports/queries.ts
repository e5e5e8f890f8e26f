/**
 * Reading issued reports: lists per project and per calculation, one report, its PDF bytes.
 *
 * Every query is scoped by the context's workspace. A client sees only reports of projects
 * shared with them; everything in `reports` is an issued revision (drafts, calculations and
 * attachments never appear here). Anything else answers 404, as if it did not exist.
 */
import { and, asc, desc, eq, sql } from "drizzle-orm";
import { z } from "zod";
import { calculations, reports, users } from "@/db/schema";
import { read } from "@/db/write";
import { AppError, notFound } from "@/lib/errors";
import type { WorkspaceContext } from "@/lib/auth/guard";
import { clientProjectScoped } from "@/lib/auth/permissions";
import { getProject } from "@/lib/projects";

/** One issued report, as lists and the report page show it (no PDF bytes, no snapshot). */
export interface ReportView {
  id: string;
  projectId: string;
  calculationId: string;
  /** Calculation number and title as printed in the report. */
  number: string;
  title: string;
  revision: string;
  code: string;
  sha256: string;
  /** PDF size, bytes. */
  size: number;
  preparedByName: string;
  checkedByName: string;
  approvedByName: string;
  issuedByName: string;
  /** ms since the epoch. */
  issuedAt: number;
  supersededAt: number | null;
  supersededByRevision: string | null;
  /** Engine as printed, "type@version". */
  engine: string;
  filename: string;
  /** Path of the download route. */
  downloadPath: string;
}

/** "C-014 rev B – Sensor front end.pdf": characters file systems refuse are replaced. */
export function reportFilename(number: string, revision: string, title: string): string {
  const clean = (s: string) =>
    s
      .replace(/[\u0000-\u001f\u007f]/g, "")
      .replace(/[\\/:*?"<>|]+/g, "-")
      .replace(/\s+/g, " ")
      .trim();
  const t = clean(title).slice(0, 120).replace(/[. ]+$/, "");
  return `${clean(number)} rev ${clean(revision)}${t ? ` – ${t}` : ""}.pdf`;
}

/**
 * Content-Disposition for a download: an ASCII fallback `filename` and the exact UTF-8 name in
 * `filename*` (RFC 6266 / RFC 8187), so browsers keep the en dash and accents.
 */
export function contentDisposition(filename: string, kind: "attachment" | "inline" = "attachment"): string {
  const ascii = filename
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .replace(/[\u2013\u2014]/g, "-")
    .replace(/[^\x20-\x7e]/g, "_")
    .replace(/["\\]/g, "_");
  const encoded = encodeURIComponent(filename).replace(/['()*]/g, (ch) => `%${ch.charCodeAt(0).toString(16).toUpperCase()}`);
  return `${kind}; filename="${ascii}"; filename*=UTF-8''${encoded}`;
}

const viewColumns = {
  id: reports.id,
  projectId: reports.projectId,
  calculationId: reports.calculationId,
  number: sql<string>`json_extract(${reports.snapshot}, '$.calculation.number')`,
  title: sql<string>`json_extract(${reports.snapshot}, '$.calculation.title')`,
  engineType: sql<string>`json_extract(${reports.snapshot}, '$.engine.typeId')`,
  engineVersion: sql<string>`json_extract(${reports.snapshot}, '$.engine.version')`,
  revision: reports.revision,
  code: reports.code,
  sha256: reports.sha256,
  size: sql<number>`length(${reports.pdf})`,
  preparedByName: reports.preparedByName,
  checkedByName: reports.checkedByName,
  approvedByName: reports.approvedByName,
  issuedByName: users.name,
  issuedAt: reports.issuedAt,
  supersededAt: reports.supersededAt,
  supersededByRevision: reports.supersededByRevision,
};

type Row = { [K in keyof typeof viewColumns]: unknown };

function toView(slug: string, r: Row): ReportView {
  const number = String(r.number ?? "");
  const title = String(r.title ?? "");
  const revision = String(r.revision);
  return {
    id: String(r.id),
    projectId: String(r.projectId),
    calculationId: String(r.calculationId),
    number,
    title,
    revision,
    code: String(r.code),
    sha256: String(r.sha256),
    size: Number(r.size),
    preparedByName: String(r.preparedByName),
    checkedByName: String(r.checkedByName),
    approvedByName: String(r.approvedByName),
    issuedByName: r.issuedByName == null ? "(removed user)" : String(r.issuedByName),
    issuedAt: Number(r.issuedAt),
    supersededAt: r.supersededAt == null ? null : Number(r.supersededAt),
    supersededByRevision: r.supersededByRevision == null ? null : String(r.supersededByRevision),
    engine: `${String(r.engineType ?? "")}@${String(r.engineVersion ?? "")}`,
    filename: reportFilename(number, revision, title),
    downloadPath: `/api/w/${slug}/reports/${String(r.id)}/pdf`,
  };
}

async function select(ctx: WorkspaceContext, where: ReturnType<typeof and>) {
  const db = await read();
  const rows = await db
    .select(viewColumns)
    .from(reports)
    .leftJoin(users, eq(users.id, reports.issuedBy))
    .where(and(eq(reports.workspaceId, ctx.workspace.id), where))
    .orderBy(asc(sql`json_extract(${reports.snapshot}, '$.calculation.number')`), desc(reports.issuedAt));
  return rows.map((r) => toView(ctx.workspace.slug, r));
}

/** Issued reports of a project (every revision, superseded ones marked), by number then newest. */
export async function listProjectReports(ctx: WorkspaceContext, projectId: string): Promise<ReportView[]> {
  await getProject(ctx, projectId);
  return select(ctx, eq(reports.projectId, projectId));
}

/**
 * Every issued revision of a calculation, newest first. A client gets 404 for a calculation of a
 * project not shared with them, and for one that has no issued report (they never learn of
 * unissued calculations).
 */
export async function listCalculationReports(ctx: WorkspaceContext, calcId: string): Promise<ReportView[]> {
  const db = await read();
  const c = await db.query.calculations.findFirst({ where: and(eq(calculations.id, calcId), eq(calculations.workspaceId, ctx.workspace.id)), columns: { id: true, projectId: true } });
  if (!c) throw notFound("That calculation");
  await getProject(ctx, c.projectId);
  const list = (await select(ctx, eq(reports.calculationId, calcId))).sort((a, b) => b.issuedAt - a.issuedAt);
  if (clientProjectScoped(ctx.role) && list.length === 0) throw notFound("That calculation");
  return list;
}

/** One report the member may see, or 404. */
export async function getReport(ctx: WorkspaceContext, reportId: string): Promise<ReportView> {
  const [r] = await select(ctx, eq(reports.id, reportId));
  if (!r) throw notFound("That report");
  await getProject(ctx, r.projectId).catch((err) => {
    throw err instanceof AppError && err.code === "not_found" ? notFound("That report") : err;
  });
  return r;
}

/** The stored PDF bytes of a report the member may see, with its download name. */
export async function getReportPdf(ctx: WorkspaceContext, reportId: string): Promise<{ pdf: Buffer; filename: string; sha256: string }> {
  const view = await getReport(ctx, reportId);
  const db = await read();
  const row = await db.query.reports.findFirst({ where: and(eq(reports.id, reportId), eq(reports.workspaceId, ctx.workspace.id)), columns: { pdf: true, sha256: true } });
  if (!row) throw notFound("That report");
  return { pdf: Buffer.from(row.pdf), filename: view.filename, sha256: row.sha256 };
}

/** The stored PDF as a download response: the bytes exactly as stored. */
export function pdfResponse(file: { pdf: Buffer; filename: string; sha256: string }, kind: "attachment" | "inline" = "attachment"): Response {
  return new Response(new Uint8Array(file.pdf), {
    status: 200,
    headers: {
      "content-type": "application/pdf",
      "content-length": String(file.pdf.length),
      "content-disposition": contentDisposition(file.filename, kind),
      "cache-control": "private, no-store",
      "x-content-type-options": "nosniff",
      etag: `"${file.sha256}"`,
    },
  });
}

/** Query of the report list route: one of projectId or calculationId. */
export const reportListQuerySchema = z
  .object({
    projectId: z.string().min(1, "projectId must not be empty").max(64, "projectId is too long").optional(),
    calculationId: z.string().min(1, "calculationId must not be empty").max(64, "calculationId is too long").optional(),
  })
  .refine((q) => (q.projectId ? 1 : 0) + (q.calculationId ? 1 : 0) === 1, { message: "give exactly one of projectId or calculationId", path: ["projectId"] });

/** The list for the report list route. */
export async function listReports(ctx: WorkspaceContext, q: z.output<typeof reportListQuerySchema>): Promise<ReportView[]> {
  return q.projectId ? listProjectReports(ctx, q.projectId) : listCalculationReports(ctx, q.calculationId as string);
}
