/**
 * Check states: the only place the pass / warning / fail colours are used, always with the word
 * and an icon so colour is never the only signal.
 */
import type { Severity } from "@/lib/calc/core/types";
import { cx } from "../ui";

const WORD: Record<Severity, string> = { pass: "Pass", warning: "Warning", fail: "Fail" };
const TONE: Record<Severity, string> = {
  pass: "text-pass border-pass/35 bg-pass-wash",
  warning: "text-warn border-warn/40 bg-warn-wash",
  fail: "text-fail border-fail/40 bg-fail-wash",
};

/** A small icon per state: tick, exclamation mark, cross. */
export function SeverityIcon({ severity, className }: { severity: Severity; className?: string }) {
  return (
    <svg viewBox="0 0 12 12" width="12" height="12" aria-hidden="true" className={cx("shrink-0", className)} focusable="false">
      {severity === "pass" ? (
        <path d="M2.5 6.3 5 8.6 9.6 3.4" fill="none" stroke="currentColor" strokeWidth="1.7" strokeLinecap="round" strokeLinejoin="round" />
      ) : severity === "warning" ? (
        <>
          <path d="M6 2.2v5" stroke="currentColor" strokeWidth="1.7" strokeLinecap="round" />
          <circle cx="6" cy="9.6" r="1" fill="currentColor" />
        </>
      ) : (
        <path d="M3 3l6 6M9 3 3 9" stroke="currentColor" strokeWidth="1.7" strokeLinecap="round" />
      )}
    </svg>
  );
}

/** "✓ Pass" / "! Warning" / "✕ Fail" badge. */
export function SeverityBadge({ severity, className }: { severity: Severity; className?: string }) {
  return (
    <span className={cx("inline-flex items-center gap-1 rounded border px-1.5 py-px text-[12px] font-semibold", TONE[severity], className)}>
      <SeverityIcon severity={severity} />
      {WORD[severity]}
    </span>
  );
}

/** "12 pass · 1 warning" with each count in its state's colour and icon. */
export function CheckCounts({ summary, className }: { summary: { pass: number; warning: number; fail: number } | null | undefined; className?: string }) {
  if (!summary) return <span className={cx("text-ink-3", className)}>—</span>;
  const items: Array<[Severity, number, string]> = [
    ["fail", summary.fail, "fail"],
    ["warning", summary.warning, summary.warning === 1 ? "warning" : "warnings"],
    ["pass", summary.pass, "pass"],
  ];
  const shown = items.filter(([, n]) => n > 0);
  if (!shown.length) return <span className={cx("text-ink-3", className)}>no checks</span>;
  return (
    <span className={cx("inline-flex flex-wrap items-center gap-x-1.5", className)}>
      {shown.map(([sev, n, word], i) => (
        <span key={sev} className="inline-flex items-center gap-1">
          {i > 0 ? <span className="text-ink-3">· </span> : null}
          <span className={cx("inline-flex items-center gap-0.5 font-medium", sev === "pass" ? "text-pass" : sev === "warning" ? "text-warn" : "text-fail")}>
            <SeverityIcon severity={sev} />
            <span className="mono">{n}</span>
          </span>{" "}
          <span className="text-ink-2">{word}</span>
        </span>
      ))}
    </span>
  );
}
