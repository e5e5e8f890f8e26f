/**
 * The check-and-approve workflow:
 *
 *   draft ──submit──▶ in check ──approve──▶ approved ──issue (lib/reports)──▶ issued
 *     ▲                  │                     │                               │
 *     └─────return───────┘                     │                               │
 *     └─────reopen─────────────────────────────┘                               │
 *     └─────revise (new revision letter; the issued one is superseded)─────────┘
 *
 * Rules enforced here, on the server: only drafts change; the preparer never checks, returns or
 * approves their own calculation; a return needs a comment; a submission names a checker (a
 * checker or owner other than the preparer) and valid inputs. Every transition is one atomic
 * batch guarded by the version it was based on, writes history and the audit log, and e-mails
 * the person who must act next.
 */
import { and, eq, sql } from "drizzle-orm";
import { z } from "zod";
import { auditEvents, calculationHistory, calculations, memberships, reviewComments, users, type Calculation } from "@/db/schema";
import { read, write } from "@/db/write";
import { insertWhere } from "@/db/guarded";
import { AppError, forbidden, notFound } from "@/lib/errors";
import { newId } from "@/lib/ids";
import { appUrl } from "@/lib/env";
import { sendMail } from "@/lib/mail";
import { requireAction, type WorkspaceContext } from "@/lib/auth/guard";
import type { Action } from "@/lib/auth/permissions";
import { getCalculation, getCalculationRow, type CalculationView } from "./index";

const version = z.number({ error: "version is required (the version you are looking at)" }).int().min(1);
const comment = z.string({ error: "comment must be text" }).trim().max(5000, "comment must be at most 5000 characters");

export const transitionSchema = z.discriminatedUnion(
  "action",
  [
    z.object({ action: z.literal("submit"), version, checkerId: z.string({ error: "checkerId is required: pick who checks it" }).min(1, "checkerId is required: pick who checks it").max(64), comment: comment.optional() }),
    z.object({ action: z.literal("return"), version, comment: comment.min(1, "comment is required: say what must change") }),
    z.object({ action: z.literal("approve"), version, comment: comment.optional() }),
    z.object({ action: z.literal("reopen"), version, comment: comment.optional() }),
    z.object({ action: z.literal("revise"), version, comment: comment.optional() }),
  ],
  { error: "action must be one of submit, return, approve, reopen, revise" },
);
export type TransitionInput = z.output<typeof transitionSchema>;

const REQUIRED_ACTION: Record<TransitionInput["action"], Action> = {
  submit: "calc.submit",
  return: "calc.review",
  approve: "calc.review",
  reopen: "calc.edit",
  revise: "calc.edit",
};

const FROM: Record<TransitionInput["action"], Calculation["status"]> = {
  submit: "draft",
  return: "in_check",
  approve: "in_check",
  reopen: "approved",
  revise: "issued",
};

const WRONG_STATE: Record<TransitionInput["action"], string> = {
  submit: "Only a draft can be submitted for check.",
  return: "Only a calculation in check can be returned.",
  approve: "Only a calculation in check can be approved.",
  reopen: "Only an approved calculation can be reopened.",
  revise: "Only an issued calculation can start a new revision.",
};

/** A → B → … → Z → AA → AB … */
export function nextRevision(rev: string): string {
  const letters = rev.toUpperCase().split("");
  let i = letters.length - 1;
  while (i >= 0) {
    if (letters[i] !== "Z") {
      letters[i] = String.fromCharCode(letters[i].charCodeAt(0) + 1);
      return letters.join("");
    }
    letters[i] = "A";
    i--;
  }
  return "A" + letters.join("");
}

interface Mail {
  to: string;
  subject: string;
  text: string;
}

/** Apply one transition. Returns the calculation as it is afterwards. */
export async function transition(ctx: WorkspaceContext, calcId: string, input: TransitionInput): Promise<CalculationView> {
  requireAction(ctx, REQUIRED_ACTION[input.action]);
  const c = await getCalculationRow(ctx, calcId);
  const now = Date.now();
  const newVersion = input.version + 1;
  const link = `${appUrl()}/w/${ctx.workspace.slug}/projects/${c.projectId}/calculations/${c.id}`;
  const label = `${c.number} “${c.title}”`;
  const mails: Mail[] = [];

  await write(async (db) => {
    const cur = await db.query.calculations.findFirst({ where: eq(calculations.id, calcId) });
    if (!cur) throw notFound("That calculation");
    if (cur.version !== input.version) throw new AppError("conflict", `This calculation changed since you opened it (now v${cur.version}). Reload and try again.`, { fields: { version: `is ${cur.version} now` } });
    if (cur.status !== FROM[input.action]) throw new AppError("conflict", WRONG_STATE[input.action]);
    const userById = async (id: string | null) => (id ? db.query.users.findFirst({ where: eq(users.id, id) }) : undefined);
    const preparer = await userById(cur.preparedBy);

    let set: Partial<Calculation> = {};
    let event: string = input.action;
    let revision = cur.revision;
    let commentKind: "return" | "comment" | null = input.comment ? "comment" : null;
    const extra: Array<ReturnType<typeof db.run>> = [];

    switch (input.action) {
      case "submit": {
        if (!cur.results) throw new AppError("invalid_input", "Some inputs do not parse or are out of range. Correct the highlighted fields before submitting.", { fields: { inputs: "contain errors" } });
        if (input.checkerId === cur.preparedBy) throw new AppError("invalid_input", "You prepared this calculation, so someone else must check it.", { fields: { checkerId: "must not be the preparer" } });
        const m = await db.query.memberships.findFirst({ where: and(eq(memberships.workspaceId, ctx.workspace.id), eq(memberships.userId, input.checkerId)) });
        if (!m || (m.role !== "checker" && m.role !== "owner")) throw new AppError("invalid_input", "The chosen checker is not a checker or owner of this workspace.", { fields: { checkerId: "must be a checker or owner of this workspace" } });
        set = { status: "in_check", checkerId: input.checkerId, submittedAt: now };
        const checker = await userById(input.checkerId);
        if (checker) mails.push({ to: checker.email, subject: `Please check ${label}`, text: `${ctx.user.name} submitted ${label} (revision ${cur.revision}) for your check.\n\nOpen it here:\n\n${link}` });
        break;
      }
      case "return": {
        if (ctx.user.id === cur.preparedBy) throw forbidden("You prepared this calculation; another checker must review it.");
        set = { status: "draft", approvedBy: null, approvedAt: null };
        commentKind = "return";
        if (preparer) mails.push({ to: preparer.email, subject: `${label} was returned with comments`, text: `${ctx.user.name} returned ${label} to draft:\n\n${input.comment}\n\nOpen it here:\n\n${link}` });
        break;
      }
      case "approve": {
        if (ctx.user.id === cur.preparedBy) throw forbidden("You prepared this calculation, so you cannot approve it. Another checker must approve it.");
        set = { status: "approved", approvedBy: ctx.user.id, approvedAt: now };
        if (preparer) mails.push({ to: preparer.email, subject: `${label} is approved`, text: `${ctx.user.name} approved ${label} (revision ${cur.revision}). It can now be issued to the client.\n\n${link}` });
        break;
      }
      case "reopen": {
        set = { status: "draft", approvedBy: null, approvedAt: null };
        const checker = await userById(cur.checkerId);
        if (checker && checker.id !== ctx.user.id) mails.push({ to: checker.email, subject: `${label} was reopened`, text: `${ctx.user.name} reopened ${label} for editing; your approval of revision ${cur.revision} no longer stands.\n\n${link}` });
        break;
      }
      case "revise": {
        revision = nextRevision(cur.revision);
        event = "revise";
        set = { status: "draft", revision, preparedBy: ctx.user.id, approvedBy: null, approvedAt: null, submittedAt: null, issuedAt: null };
        // The issued revision is superseded from now on; it stays readable and downloadable.
        extra.push(
          db.run(sql`UPDATE reports SET superseded_at = ${now}, superseded_by_revision = ${revision}
                     WHERE calculation_id = ${calcId} AND revision = ${cur.revision} AND superseded_at IS NULL
                     AND EXISTS (SELECT 1 FROM calculations WHERE id = ${calcId} AND version = ${newVersion} AND updated_at = ${now} AND updated_by = ${ctx.user.id})`),
        );
        break;
      }
    }

    const guard = sql`SELECT 1 FROM calculations WHERE id = ${calcId} AND version = ${newVersion} AND updated_at = ${now} AND updated_by = ${ctx.user.id}`;
    const after = { ...cur, ...set };
    const [upd] = await db.batch([
      db
        .update(calculations)
        .set({ ...set, version: newVersion, updatedAt: now, updatedBy: ctx.user.id })
        .where(and(eq(calculations.id, calcId), eq(calculations.version, input.version), eq(calculations.status, cur.status))),
      insertWhere(db, calculationHistory, {
        id: newId(),
        workspaceId: ctx.workspace.id,
        calculationId: calcId,
        revision,
        version: newVersion,
        event,
        status: after.status,
        title: cur.title,
        inputs: cur.inputs,
        results: cur.results,
        engineVersion: cur.engineVersion,
        actorId: ctx.user.id,
        at: now,
      }, guard),
      ...(commentKind && input.comment
        ? [insertWhere(db, reviewComments, { id: newId(), workspaceId: ctx.workspace.id, calculationId: calcId, revision: cur.revision, authorId: ctx.user.id, kind: commentKind, body: input.comment, at: now }, guard)]
        : []),
      insertWhere(db, auditEvents, {
        id: newId(),
        workspaceId: ctx.workspace.id,
        actorId: ctx.user.id,
        action: `calculation.${event === "revise" ? "revised" : input.action === "submit" ? "submitted" : input.action === "return" ? "returned" : input.action === "approve" ? "approved" : "reopened"}`,
        targetType: "calculation",
        targetId: calcId,
        data: { from: cur.status, to: after.status, revision, checkerId: after.checkerId ?? null },
        at: now,
      }, guard),
      ...extra,
    ]);
    if (upd.rowsAffected === 0) throw new AppError("conflict", "This calculation changed at the same moment. Reload and try again.");
  });

  // Mail after the change is committed, outside the write queue; a failed mail is logged only.
  await Promise.all(mails.map((m) => sendMail(m)));
  return getCalculation(ctx, calcId);
}

export const commentSchema = z.object({ body: comment.min(1, "body must not be empty") });

/** Review comments of a calculation, oldest first, with author names. */
export async function listComments(ctx: WorkspaceContext, calcId: string) {
  await getCalculationRow(ctx, calcId);
  const db = await read();
  return db
    .select({ id: reviewComments.id, revision: reviewComments.revision, kind: reviewComments.kind, body: reviewComments.body, at: reviewComments.at, author: users.name, authorId: users.id })
    .from(reviewComments)
    .innerJoin(users, eq(users.id, reviewComments.authorId))
    .where(and(eq(reviewComments.calculationId, calcId), eq(reviewComments.workspaceId, ctx.workspace.id)))
    .orderBy(reviewComments.at);
}

/** Add a plain comment (any staff member, any status: comments never change the calculation). */
export async function addComment(ctx: WorkspaceContext, calcId: string, body: string) {
  const c = await getCalculationRow(ctx, calcId);
  const id = newId();
  await write((db) => db.insert(reviewComments).values({ id, workspaceId: ctx.workspace.id, calculationId: calcId, revision: c.revision, authorId: ctx.user.id, kind: "comment", body, at: Date.now() }));
  return id;
}
