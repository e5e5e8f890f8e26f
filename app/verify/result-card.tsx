/**
 * The answer of a verification, by code or by file: a plain word first ("Matches" / "Does not
 * match"), never colour alone, then what the issued report says about itself.
 */
import type { VerifyResult } from "@/lib/reports/verify";

const day = (ms: number) => new Date(ms).toISOString().slice(0, 10);

function Row({ label, children, mono }: { label: string; children: React.ReactNode; mono?: boolean }) {
  return (
    <div className="grid grid-cols-[150px_1fr] gap-3 border-b border-rule py-1.5 last:border-b-0">
      <dt className="text-[13px] text-ink-3">{label}</dt>
      <dd className={mono ? "mono break-all text-[13px]" : "text-[13.5px]"}>{children}</dd>
    </div>
  );
}

/** One verification result. */
export function ResultCard({ result }: { result: VerifyResult }) {
  const r = result.report;
  const fileMatch = result.method === "file" && result.match;
  const headline = result.method === "file" ? (result.match ? "Matches an issued report" : "Does not match any issued report") : result.match ? "Issued report found" : "No issued report with this code";
  const tone = result.match ? "border-pass/50 bg-pass-wash" : "border-fail/50 bg-fail-wash";
  return (
    <section aria-live="polite" data-testid="verify-result" className={`rounded-lg border ${tone} p-4`}>
      <p className="flex items-center gap-2 text-[16px] font-semibold">
        <span aria-hidden className={result.match ? "text-pass" : "text-fail"}>
          {result.match ? "✓" : "✗"}
        </span>
        {headline}
      </p>
      <p className="mt-1 text-[13.5px] text-ink-2">{result.message}</p>
      {r ? (
        <dl className="mt-3 rounded-md border border-rule bg-sheet px-3 py-1">
          <Row label="Report">
            <span className="mono">{r.calculationNumber}</span> revision <span className="mono font-semibold">{r.revision}</span> — {r.title}
          </Row>
          <Row label="Issued by">{r.workspace}</Row>
          <Row label="Project">{r.project}</Row>
          <Row label="Issue date">
            <span className="mono">{r.issueDate}</span>
          </Row>
          <Row label="Prepared by">{r.preparedBy}</Row>
          <Row label="Checked by">{r.checkedBy}</Row>
          <Row label="Approved by">{r.approvedBy}</Row>
          <Row label="Revision state">
            {r.superseded ? (
              <strong>
                Superseded
                {r.superseded.latestIssued
                  ? `: revision ${r.superseded.latestIssued.revision} was issued on ${day(r.superseded.latestIssued.issuedAt)} (${r.superseded.latestIssued.code})`
                  : `: revision ${r.superseded.byRevision ?? "(next)"} was started on ${day(r.superseded.at)}`}
              </strong>
            ) : (
              "Current revision"
            )}
          </Row>
          <Row label="Verification code" mono>
            {r.code}
          </Row>
          <Row label="Engine" mono>
            {r.engine}
          </Row>
          <Row label="SHA-256 of the file" mono>
            {r.sha256}
          </Row>
        </dl>
      ) : null}
      {result.sha256 && !fileMatch ? (
        <p className="mono mt-3 break-all text-[12px] text-ink-3">SHA-256 of the uploaded file: {result.sha256}</p>
      ) : null}
    </section>
  );
}
