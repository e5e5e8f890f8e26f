"use client";
/**
 * The workflow bar of a calculation: its status and revision, who prepared, checks and approved
 * it, and the next actions the signed-in member may take (submit for check, return with a
 * comment, approve, reopen, start a new revision, and the reports module's Issue slot). An action
 * the member may not take is shown disabled with the reason, never silently missing where it
 * would be expected; the server refuses it anyway.
 */
import { useState } from "react";
import { useQuery } from "@tanstack/react-query";
import { nextRevisionLetter } from "./revision";
import { api, ApiError } from "@/lib/api-client";
import { Button, Notice, Select, TextArea, Tag, cx } from "../ui";
import { Dialog } from "./dialog";
import { STATUS_LABEL, dateTime } from "./format";
import { IssueSlot } from "./issue-slot";
import type { SheetCalculation, SheetPermissions } from "./types";

export type TransitionBody =
  | { action: "submit"; checkerId: string; comment?: string }
  | { action: "return"; comment: string }
  | { action: "approve"; comment?: string }
  | { action: "reopen"; comment?: string }
  | { action: "revise"; comment?: string };

interface TeamMember {
  userId: string;
  name: string;
  role: string;
}

/** The status as a tag: words only (the check colours are not for workflow states). */
export function StatusTag({ status }: { status: SheetCalculation["status"] }) {
  const tone = status === "draft" ? "muted" : status === "in_check" ? "copper" : "neutral";
  return (
    <span data-testid="calc-status">
      <Tag tone={tone}>{STATUS_LABEL[status]}</Tag>
    </span>
  );
}

export function WorkflowBar({
  slug,
  calc,
  me,
  perms,
  inputsValid,
  onTransition,
  onChanged,
}: {
  slug: string;
  calc: SheetCalculation;
  me: { id: string; name: string };
  perms: SheetPermissions;
  /** The current inputs compute (a submission needs valid inputs). */
  inputsValid: boolean;
  /** Run a transition (the sheet saves pending edits first and supplies the version). */
  onTransition: (body: TransitionBody) => Promise<void>;
  onChanged: (c: SheetCalculation) => void;
}) {
  const [dialog, setDialog] = useState<null | "submit" | "return" | "approve" | "reopen" | "revise">(null);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [comment, setComment] = useState("");
  const [checkerId, setCheckerId] = useState("");
  const [fieldError, setFieldError] = useState<string | null>(null);
  const isPreparer = calc.preparedBy.id === me.id;
  const writable = perms.writable;

  const team = useQuery({
    queryKey: ["team", slug, "reviewer"],
    queryFn: ({ signal }) => api<{ team: TeamMember[] }>(`/api/w/${slug}/team?role=reviewer`, { signal }).then((r) => r.team),
    enabled: dialog === "submit",
    staleTime: 60_000,
  });
  const checkers = (team.data ?? []).filter((m) => m.userId !== calc.preparedBy.id && m.userId !== me.id);

  const open = (d: NonNullable<typeof dialog>) => {
    setError(null);
    setFieldError(null);
    setComment("");
    setDialog(d);
  };

  const run = async (body: TransitionBody) => {
    setBusy(true);
    setError(null);
    try {
      await onTransition(body);
      setDialog(null);
    } catch (e) {
      const msg = e instanceof Error ? e.message : String(e);
      if (dialog) setFieldError(e instanceof ApiError ? (e.fields.comment ?? e.fields.checkerId ?? msg) : msg);
      else setError(msg);
    } finally {
      setBusy(false);
    }
  };

  // Reasons an action is not available to this member now.
  const readOnlyReason = !writable ? (perms.readOnlyMessage ?? "The workspace is read-only.") : null;
  const submitReason = readOnlyReason ?? (!perms.submit ? "Your role cannot submit calculations." : !inputsValid ? "Correct the fields marked in the inputs before submitting." : null);
  const reviewReason = readOnlyReason ?? (isPreparer ? "You prepared this calculation, so another checker must return or approve it." : !perms.review ? "Only a checker or the owner can return or approve a calculation." : null);
  const editReason = readOnlyReason ?? (!perms.edit ? "Your role cannot edit calculations." : null);

  const people = (
    <dl className="flex flex-wrap items-baseline gap-x-4 gap-y-0.5 text-[12.5px] text-ink-2">
      <div>
        <dt className="inline text-ink-3">Prepared by </dt>
        <dd className="inline text-ink">{calc.preparedBy.name}</dd>
      </div>
      {calc.checker && !(calc.approvedBy && calc.approvedAt) ? (
        <div>
          <dt className="inline text-ink-3">{calc.status === "in_check" ? "Checker " : "Last checker "}</dt>
          <dd className="inline text-ink">{calc.checker.name}</dd>
        </div>
      ) : null}
      {calc.approvedBy && calc.approvedAt ? (
        <div>
          <dt className="inline text-ink-3">Checked and approved by </dt>
          <dd className="inline text-ink">
            {calc.approvedBy.name} <span className="mono text-ink-3">{dateTime(calc.approvedAt)}</span>
          </dd>
        </div>
      ) : null}
      {calc.issuedAt ? (
        <div>
          <dt className="inline text-ink-3">Issued </dt>
          <dd className="inline mono text-ink">{dateTime(calc.issuedAt)}</dd>
        </div>
      ) : null}
    </dl>
  );

  const reasonNote = (text: string | null) => (text ? <p className="text-[12px] text-ink-3">{text}</p> : null);

  return (
    <div className="mb-5 rounded-lg border border-rule bg-sheet px-4 py-2.5" role="region" aria-label="Workflow">
      <div className="flex flex-wrap items-center gap-x-5 gap-y-2">
        <div className="flex items-center gap-2">
          <StatusTag status={calc.status} />
          <span className="text-[13px]">
            Revision <span className="mono font-semibold" data-testid="calc-revision">{calc.revision}</span>
          </span>
        </div>
        {people}
        <div className="ml-auto flex flex-wrap items-center gap-2">
          {calc.status === "draft" ? (
            <Button variant="primary" size="sm" disabled={!!submitReason || busy} title={submitReason ?? undefined} onClick={() => open("submit")}>
              Submit for check
            </Button>
          ) : null}
          {calc.status === "in_check" ? (
            <>
              <Button size="sm" disabled={!!reviewReason || busy} title={reviewReason ?? undefined} onClick={() => open("return")}>
                Return to draft
              </Button>
              <Button variant="primary" size="sm" disabled={!!reviewReason || busy} title={reviewReason ?? undefined} onClick={() => open("approve")}>
                Approve
              </Button>
            </>
          ) : null}
          {calc.status === "approved" ? (
            <Button size="sm" disabled={!!editReason || busy} title={editReason ?? undefined} onClick={() => open("reopen")}>
              Reopen as draft
            </Button>
          ) : null}
          {calc.status === "issued" ? (
            <Button size="sm" disabled={!!editReason || busy} title={editReason ?? undefined} onClick={() => open("revise")}>
              Start revision {nextRevisionLetter(calc.revision)}
            </Button>
          ) : null}
          <IssueSlot
            slug={slug}
            calculation={calc}
            canIssue={perms.issue && writable && !isPreparer}
            reason={isPreparer && perms.issue ? "You prepared this calculation, so another checker or the owner must issue it." : undefined}
            onChanged={onChanged}
          />
        </div>
      </div>
      <div className="mt-1 flex flex-col items-end">
        {calc.status === "draft" ? reasonNote(submitReason) : null}
        {calc.status === "in_check" ? reasonNote(reviewReason) : null}
        {calc.status === "approved" || calc.status === "issued" ? reasonNote(editReason) : null}
      </div>
      {error ? (
        <div className="mt-2">
          <Notice tone="error">{error}</Notice>
        </div>
      ) : null}

      <Dialog open={dialog === "submit"} onClose={() => setDialog(null)} title="Submit for check">
        <form
          className="space-y-3"
          onSubmit={(e) => {
            e.preventDefault();
            if (!checkerId) return setFieldError("Pick who checks it.");
            void run({ action: "submit", checkerId, comment: comment.trim() || undefined });
          }}
        >
          <p className="text-[13px] text-ink-2">Pending changes are saved first. The checker gets an e-mail with a link to this sheet; the sheet cannot be edited while it is in check.</p>
          <div className="flex flex-col gap-1">
            <label htmlFor="wf-checker" className="text-[13px] font-medium text-ink-2">
              Checker
            </label>
            <Select id="wf-checker" value={checkerId} onChange={(e) => setCheckerId(e.target.value)} aria-invalid={!!fieldError && !checkerId}>
              <option value="">{team.isLoading ? "Loading…" : checkers.length ? "Choose a checker" : "No one else can check it"}</option>
              {checkers.map((m) => (
                <option key={m.userId} value={m.userId}>
                  {m.name} ({m.role})
                </option>
              ))}
            </Select>
            {!team.isLoading && team.data && !checkers.length ? <p className="text-[12.5px] text-ink-3">Only a checker or the owner other than the preparer can check it. The owner can invite a checker on the Members page.</p> : null}
          </div>
          <div className="flex flex-col gap-1">
            <label htmlFor="wf-submit-comment" className="text-[13px] font-medium text-ink-2">
              Note to the checker (optional)
            </label>
            <TextArea id="wf-submit-comment" rows={3} value={comment} onChange={(e) => setComment(e.target.value)} />
          </div>
          <DialogFooter error={fieldError} busy={busy} busyLabel="Submitting…" label="Submit for check" variant="primary" onCancel={() => setDialog(null)} />
        </form>
      </Dialog>

      <Dialog open={dialog === "return"} onClose={() => setDialog(null)} title="Return to draft">
        <form
          className="space-y-3"
          onSubmit={(e) => {
            e.preventDefault();
            if (!comment.trim()) return setFieldError("Say what must change: a comment is required.");
            void run({ action: "return", comment: comment.trim() });
          }}
        >
          <div className="flex flex-col gap-1">
            <label htmlFor="wf-return-comment" className="text-[13px] font-medium text-ink-2">
              What must change (required)
            </label>
            <TextArea id="wf-return-comment" rows={4} value={comment} onChange={(e) => setComment(e.target.value)} aria-invalid={!!fieldError} />
          </div>
          <DialogFooter error={fieldError} busy={busy} busyLabel="Returning…" label="Return to draft" variant="primary" onCancel={() => setDialog(null)} />
        </form>
      </Dialog>

      <Dialog open={dialog === "approve"} onClose={() => setDialog(null)} title="Approve">
        <form
          className="space-y-3"
          onSubmit={(e) => {
            e.preventDefault();
            void run({ action: "approve", comment: comment.trim() || undefined });
          }}
        >
          <p className="text-[13px]">
            You approve revision <span className="mono font-semibold">{calc.revision}</span> of {calc.number} as checked, prepared by {calc.preparedBy.name}.
          </p>
          <div className="flex flex-col gap-1">
            <label htmlFor="wf-approve-comment" className="text-[13px] font-medium text-ink-2">
              Comment (optional)
            </label>
            <TextArea id="wf-approve-comment" rows={2} value={comment} onChange={(e) => setComment(e.target.value)} />
          </div>
          <DialogFooter error={fieldError} busy={busy} busyLabel="Approving…" label="Approve" variant="primary" onCancel={() => setDialog(null)} />
        </form>
      </Dialog>

      <Dialog open={dialog === "reopen" || dialog === "revise"} onClose={() => setDialog(null)} title={dialog === "revise" ? `Start revision ${nextRevisionLetter(calc.revision)}` : "Reopen as draft"}>
        <form
          className="space-y-3"
          onSubmit={(e) => {
            e.preventDefault();
            void run({ action: dialog === "revise" ? "revise" : "reopen", comment: comment.trim() || undefined });
          }}
        >
          <p className="text-[13px]">
            {dialog === "revise"
              ? `Revision ${calc.revision} stays issued and downloadable, marked superseded once ${nextRevisionLetter(calc.revision)} is issued. The new revision starts as a draft with the same inputs, prepared by you.`
              : "The approval is withdrawn and the checker is told. The calculation must be checked and approved again."}
          </p>
          <div className="flex flex-col gap-1">
            <label htmlFor="wf-reopen-comment" className="text-[13px] font-medium text-ink-2">
              Reason (optional)
            </label>
            <TextArea id="wf-reopen-comment" rows={2} value={comment} onChange={(e) => setComment(e.target.value)} />
          </div>
          {fieldError ? <Notice tone="error">{fieldError}</Notice> : null}
          <div className="flex justify-end gap-2">
            <Button type="button" variant="quiet" onClick={() => setDialog(null)}>
              Cancel
            </Button>
            <Button type="submit" variant="primary" disabled={busy}>
              {dialog === "revise" ? `Start revision ${nextRevisionLetter(calc.revision)}` : "Reopen as draft"}
            </Button>
          </div>
        </form>
      </Dialog>
      <span className={cx("sr-only")} aria-live="polite">
        {busy ? "Working…" : ""}
      </span>
    </div>
  );
}

/** The foot of a workflow dialog: the field error, Cancel, and the submit button. */
function DialogFooter({ error, busy, label, busyLabel, variant, onCancel }: { error: string | null | undefined; busy: boolean; label: string; busyLabel: string; variant: "primary" | "secondary" | "danger"; onCancel: () => void }) {
  return (
    <>
      {error ? <Notice tone="error">{error}</Notice> : null}
      <div className="flex justify-end gap-2">
        <Button type="button" variant="quiet" onClick={onCancel}>
          Cancel
        </Button>
        <Button type="submit" variant={variant} disabled={busy}>
          {busy ? busyLabel : label}
        </Button>
      </div>
    </>
  );
}
