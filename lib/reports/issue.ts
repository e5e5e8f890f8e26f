/**
 * Issuing a report: an approved calculation becomes "issued" together with its signed PDF.
 *
 * The order of work, and why it is atomic:
 *
 * 1. Read the calculation (scoped to the workspace) and check it is approved, at the version the
 *    issuer is looking at, and computed by the engine version now installed.
 * 2. Make sure the workspace has a signing identity. The first issue creates one (key generation
 *    happens outside the write queue); it is stored with `INSERT … ON CONFLICT DO NOTHING` on the
 *    workspace's primary key and then read back, so concurrent first issues (in one process or
 *    several) all sign with the one identity that landed.
 * 3. Build the ReportModel from the stored results snapshot (exactly what was approved), then
 *    render and sign the PDF: outside the write queue and outside any transaction.
 * 4. One atomic `db.batch` (one transaction): the calculation's UPDATE to "issued", guarded by
 *    `WHERE version = ? AND status = 'approved'`; the report row (PDF bytes, SHA-256, code,
 *    snapshot, names) inserted only if that UPDATE applied (`insertWhere`); the history row, the
 *    audit event and the supersede mark of earlier revisions inserted only if the report row
 *    landed. A stale or concurrent issue changes nothing and answers 409.
 * 5. After the commit: e-mail the clients the project is shared with (a failed mail is logged).
 *
 * A process killed anywhere before the batch commits leaves nothing but, possibly, the signing
 * identity; SQLite rolls back a batch interrupted half-way. So there is never an issued revision
 * without its stored signed PDF, nor a stored PDF without its issued revision.
 */
import { and, asc, eq, inArray, sql } from "drizzle-orm";
import { z } from "zod";
import {
  auditEvents,
  calculationHistory,
  calculations,
  memberships,
  projectAccess,
  reports,
  reviewComments,
  signingIdentities,
  users,
  type Calculation,
  type Workspace,
} from "@/db/schema";
import { read, write } from "@/db/write";
import { insertWhere } from "@/db/guarded";
import { AppError, forbidden, notFound } from "@/lib/errors";
import { newId } from "@/lib/ids";
import { appUrl, env } from "@/lib/env";
import { sendMail } from "@/lib/mail";
import type { WorkspaceContext } from "@/lib/auth/guard";
import { getProject } from "@/lib/projects";
import { getCalcType } from "@/lib/calc/registry";
import { buildReportModel, ReportBuildError, type ReportSource, type SourceHistoryEntry } from "./build-model";
import { generateVerificationCode, verifyUrlFor } from "./code";
import type { ReportModel } from "./model";
import { produceSignedReport } from "./produce";
import { createSigningIdentity, type SigningIdentity } from "./signing";
import { getReport, reportFilename, type ReportView } from "./queries";

export const issueSchema = z.object({
  version: z.number({ error: "version is required (the version of the calculation you are looking at)" }).int("version must be a whole number").min(1, "version must be 1 or more"),
});
export type IssueInput = z.output<typeof issueSchema>;

/** Points of the issue, in order, reported to `IssueOptions.onStep` (progress and tests). */
export type IssueStep = "checked" | "identity" | "built" | "signed" | "committed" | "notified";

export interface IssueOptions {
  /** Called after each step; the issue waits for a returned promise before it goes on. */
  onStep?: (step: IssueStep) => void | Promise<void>;
}

const REMOVED = "(removed user)";

/** The workspace's signing identity, created and stored on first use (one per workspace, ever). */
export async function ensureSigningIdentity(workspace: Pick<Workspace, "id" | "name">): Promise<SigningIdentity> {
  const db = await read();
  const existing = await db.query.signingIdentities.findFirst({ where: eq(signingIdentities.workspaceId, workspace.id) });
  if (existing) return existing;
  const name = workspace.name.trim().slice(0, 64) || "Loopwright workspace";
  const fresh = createSigningIdentity(name, env().REPORT_KEY_SECRET);
  await write((w) =>
    w
      .insert(signingIdentities)
      .values({ workspaceId: workspace.id, certificatePem: fresh.certificatePem, encryptedKey: fresh.encryptedKey, fingerprint: fresh.fingerprint, createdAt: Date.now() })
      .onConflictDoNothing(),
  );
  // Whichever concurrent first issue landed its identity, everyone signs with that one.
  const stored = await (await read()).query.signingIdentities.findFirst({ where: eq(signingIdentities.workspaceId, workspace.id) });
  if (!stored) throw new Error("signing identity was not stored");
  return stored;
}

function changedError(cur: Pick<Calculation, "version">): AppError {
  return new AppError("conflict", `This calculation changed since you opened it (now v${cur.version}). Reload and try again.`, { fields: { version: `is ${cur.version} now` } });
}

function assertIssuable(c: Calculation, version: number): void {
  if (c.version !== version) throw changedError(c);
  if (c.status === "issued") throw new AppError("conflict", `Revision ${c.revision} is already issued.`);
  if (c.status !== "approved") throw new AppError("conflict", "Only an approved calculation can be issued. Submit it for check and have it approved first.");
}

async function names(ids: Array<string | null>): Promise<Map<string, string>> {
  const wanted = [...new Set(ids.filter((x): x is string => !!x))];
  if (!wanted.length) return new Map();
  const db = await read();
  const rows = await db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, wanted));
  return new Map(rows.map((r) => [r.id, r.name]));
}

/** Everything the model builder needs, read from the database. */
async function loadSource(ctx: WorkspaceContext, c: Calculation, issuedAt: number, verification: { code: string; url: string }): Promise<ReportSource> {
  const type = getCalcType(c.typeId);
  if (!type) throw new AppError("conflict", `The calculation type "${c.typeId}" is no longer installed, so this calculation cannot be issued.`);
  if (type.version !== c.engineVersion) {
    throw new AppError(
      "conflict",
      `The ${type.title} engine was updated (${c.engineVersion} → ${type.version}) after this calculation was computed. Reopen it, save it to re-run it with the new engine, and have it checked and approved again before issuing.`,
    );
  }
  const project = await getProject(ctx, c.projectId);
  const db = await read();
  const hist = await db
    .select({ revision: calculationHistory.revision, version: calculationHistory.version, event: calculationHistory.event, at: calculationHistory.at, actorId: calculationHistory.actorId, actorName: users.name })
    .from(calculationHistory)
    .innerJoin(users, eq(users.id, calculationHistory.actorId))
    .where(and(eq(calculationHistory.calculationId, c.id), eq(calculationHistory.workspaceId, ctx.workspace.id)))
    .orderBy(asc(calculationHistory.version), asc(calculationHistory.at));
  const prior = await db
    .select({ revision: reports.revision, issuedAt: reports.issuedAt, preparedByName: reports.preparedByName })
    .from(reports)
    .where(and(eq(reports.calculationId, c.id), eq(reports.workspaceId, ctx.workspace.id)));
  // The reason given when a revision was started is the comment saved with the "revise" step.
  const revisionReasons: Record<string, string> = {};
  const revises = hist.filter((h) => h.event === "revise");
  if (revises.length) {
    const comments = await db
      .select({ at: reviewComments.at, authorId: reviewComments.authorId, body: reviewComments.body })
      .from(reviewComments)
      .where(and(eq(reviewComments.calculationId, c.id), eq(reviewComments.workspaceId, ctx.workspace.id)));
    for (const r of revises) {
      const m = comments.find((x) => x.at === r.at && x.authorId === r.actorId);
      if (m) revisionReasons[r.revision] = m.body;
    }
  }
  const n = await names([c.preparedBy, c.checkerId, c.approvedBy]);
  const name = (id: string | null) => (id ? (n.get(id) ?? REMOVED) : REMOVED);
  const history: SourceHistoryEntry[] = hist.map((h) => ({ revision: h.revision, version: h.version, event: h.event, actorName: h.actorName, at: h.at }));
  return {
    workspace: { name: ctx.workspace.name },
    project: { name: project.name, clientName: project.clientName, jobNumber: project.jobNumber, description: project.description },
    calculation: {
      number: c.number,
      title: c.title,
      typeId: c.typeId,
      engineVersion: c.engineVersion,
      revision: c.revision,
      inputs: c.inputs,
      results: c.results,
      submittedAt: c.submittedAt,
      approvedAt: c.approvedAt,
      createdAt: c.createdAt,
    },
    type,
    // Checked by: the reviewer who approved the check. Approved (for issue) by: the checker or
    // owner issuing it now. Three roles, possibly fewer people in a small firm.
    people: { preparedBy: name(c.preparedBy), checkedBy: name(c.approvedBy), approvedBy: ctx.user.name },
    history,
    priorReports: prior,
    revisionReasons,
    issuedAt,
    verification,
  };
}

/** Build the model of the calculation's current revision (no PDF, nothing stored). */
export async function buildModelFor(ctx: WorkspaceContext, c: Calculation, issuedAt: number, code: string): Promise<ReportModel> {
  const src = await loadSource(ctx, c, issuedAt, { code, url: verifyUrlFor(appUrl(), code) });
  try {
    return buildReportModel(src);
  } catch (err) {
    if (err instanceof ReportBuildError) throw new AppError("conflict", err.message);
    throw err;
  }
}

function isUniqueViolation(err: unknown): boolean {
  const text = err instanceof Error ? `${err.message} ${(err as { cause?: unknown }).cause ?? ""}` : String(err);
  return /UNIQUE constraint failed/i.test(text);
}

/**
 * Issue the approved calculation `calcId` at `input.version`: sign its report and mark it issued,
 * atomically (see the module comment). Returns the stored report.
 * @throws 404 for another workspace's calculation, 409 when it is not approved, changed, was
 *   issued concurrently, or its engine was updated since it was computed.
 */
export async function issueReport(ctx: WorkspaceContext, calcId: string, input: IssueInput, opts: IssueOptions = {}): Promise<ReportView> {
  const step = async (s: IssueStep) => {
    if (opts.onStep) await opts.onStep(s);
  };
  const db0 = await read();
  const c = await db0.query.calculations.findFirst({ where: and(eq(calculations.id, calcId), eq(calculations.workspaceId, ctx.workspace.id)) });
  if (!c) throw notFound("That calculation");
  assertIssuable(c, input.version);
  // Issuing is the approval for release: like the check, never by the one who prepared it.
  if (c.preparedBy === ctx.user.id) throw forbidden("You prepared this calculation, so someone else (a checker or owner) must issue it.");
  await step("checked");

  const identity = await ensureSigningIdentity(ctx.workspace);
  await step("identity");

  const issuedAt = Date.now();
  const code = generateVerificationCode();
  const model = await buildModelFor(ctx, c, issuedAt, code);
  await step("built");

  // Rendering and signing take a second or two: never inside the write queue.
  const signed = await produceSignedReport(model, identity, env().REPORT_KEY_SECRET, { signingTime: new Date(issuedAt) });
  await step("signed");

  const reportId = newId();
  const newVersion = input.version + 1;
  const stored: ReportModel = { ...model, signer: model.signer ?? { name: model.workspace.name, fingerprint: identity.fingerprint } };
  try {
    await write(async (db) => {
      const cur = await db.query.calculations.findFirst({ where: eq(calculations.id, calcId) });
      if (!cur) throw notFound("That calculation");
      assertIssuable(cur, input.version);
      const calcGuard = sql`SELECT 1 FROM calculations WHERE id = ${calcId} AND version = ${newVersion} AND status = 'issued' AND issued_at = ${issuedAt} AND updated_by = ${ctx.user.id}`;
      const reportGuard = sql`SELECT 1 FROM reports WHERE id = ${reportId}`;
      const [upd] = await db.batch([
        db
          .update(calculations)
          .set({ status: "issued", issuedAt, version: newVersion, updatedAt: issuedAt, updatedBy: ctx.user.id })
          .where(and(eq(calculations.id, calcId), eq(calculations.workspaceId, ctx.workspace.id), eq(calculations.version, input.version), eq(calculations.status, "approved"))),
        insertWhere(
          db,
          reports,
          {
            id: reportId,
            workspaceId: ctx.workspace.id,
            projectId: c.projectId,
            calculationId: calcId,
            revision: c.revision,
            code,
            sha256: signed.sha256,
            pdf: signed.pdf,
            snapshot: stored as unknown as Record<string, unknown>,
            preparedByName: model.signOff.prepared.name,
            checkedByName: model.signOff.checked.name,
            approvedByName: model.signOff.approved.name,
            issuedBy: ctx.user.id,
            issuedAt,
          },
          calcGuard,
        ),
        insertWhere(
          db,
          calculationHistory,
          {
            id: newId(),
            workspaceId: ctx.workspace.id,
            calculationId: calcId,
            revision: c.revision,
            version: newVersion,
            event: "issue",
            status: "issued",
            title: c.title,
            inputs: c.inputs,
            results: c.results,
            engineVersion: c.engineVersion,
            actorId: ctx.user.id,
            at: issuedAt,
          },
          reportGuard,
        ),
        insertWhere(
          db,
          auditEvents,
          {
            id: newId(),
            workspaceId: ctx.workspace.id,
            actorId: ctx.user.id,
            action: "report.issued",
            targetType: "calculation",
            targetId: calcId,
            data: { reportId, revision: c.revision, code, sha256: signed.sha256, bytes: signed.pdf.length },
            at: issuedAt,
          },
          reportGuard,
        ),
        // Earlier revisions are normally marked when the new revision is started ("revise"); this
        // catches any that were not.
        db.run(sql`UPDATE reports SET superseded_at = ${issuedAt}, superseded_by_revision = ${c.revision}
                   WHERE calculation_id = ${calcId} AND revision <> ${c.revision} AND superseded_at IS NULL AND EXISTS (${reportGuard})`),
      ]);
      if (upd.rowsAffected === 0) {
        const now = await db.query.calculations.findFirst({ where: eq(calculations.id, calcId) });
        throw now && now.version !== input.version ? changedError(now) : new AppError("conflict", "This calculation changed at the same moment. Reload and try again.");
      }
    });
  } catch (err) {
    // Same calculation issued by a concurrent request in the same millisecond: the unique keys
    // refused the whole batch, so nothing of this attempt was written.
    if (isUniqueViolation(err)) throw new AppError("conflict", "This calculation was issued at the same moment by someone else. Reload to see the issued report.");
    throw err;
  }
  await step("committed");

  await notifyClients(ctx, c, model, reportId);
  await step("notified");
  return getReport(ctx, reportId);
}

/** E-mail every client the project is shared with (after the commit; failures are logged only). */
async function notifyClients(ctx: WorkspaceContext, c: Calculation, model: ReportModel, reportId: string): Promise<void> {
  const db = await read();
  const clients = await db
    .select({ email: users.email, name: users.name })
    .from(projectAccess)
    .innerJoin(users, eq(users.id, projectAccess.userId))
    .innerJoin(memberships, and(eq(memberships.userId, projectAccess.userId), eq(memberships.workspaceId, ctx.workspace.id)))
    .where(and(eq(projectAccess.projectId, c.projectId), eq(projectAccess.workspaceId, ctx.workspace.id), eq(memberships.role, "client")));
  if (!clients.length) return;
  const base = `${appUrl()}/w/${ctx.workspace.slug}`;
  const m = model.calculation;
  const label = `${m.number} rev ${m.revision} – ${m.title}`;
  await Promise.all(
    clients.map((cl) =>
      sendMail({
        to: cl.email,
        subject: `Report issued: ${label}`,
        text: [
          `${ctx.workspace.name} issued the calculation report ${label} for the project ${model.project.name}.`,
          `See and download it here:\n\n${base}/projects/${c.projectId}`,
          `The PDF (“${reportFilename(m.number, m.revision, m.title)}”) directly:\n\n${appUrl()}/api/w/${ctx.workspace.slug}/reports/${reportId}/pdf`,
          `Its verification code is ${model.verification.code}; anyone can check the file at ${model.verification.url}`,
        ].join("\n\n"),
      }),
    ),
  );
}
